// Test kit for API tests: an app on the real test database (DATABASE_URL from
// scripts/test-run.ts), factories that make their own programs and people (so test files
// can run in parallel without touching each other), and the fake mail server's inbox.
import crypto from "node:crypto";
import type { Express } from "express";
import request from "supertest";
import { loadConfig, type Config } from "../../server/config";
import { createDb, type Db } from "../../server/db/knex";
import { createMailer } from "../../server/mail/mailer";
import { startMailSender } from "../../server/mail/outbox";
import { buildApp } from "../../server/app";
import { hashPassword } from "../../server/auth/passwords";
import { createSession } from "../../server/repositories/sessions";
import { signSessionToken } from "../../server/auth/tokens";
import { insertCatalogue } from "../../server/repositories/applications";
import { ensureDefaultRubric } from "../../server/repositories/rubrics";
import { DEFAULT_CATALOGUE } from "../../shared/catalogue";
import { createStorage } from "../../server/storage";
import { createJobQueue, type JobQueue } from "../../server/jobs/queue";
import type { Storage } from "../../server/storage/types";
import { originalKey, processedKey } from "../../server/storage/keys";
import { forgetClipOriginal, insertClip, markClipFailed, markClipReady, nextClipPosition } from "../../server/repositories/clips";
import type { Role } from "../../shared/roles";

/** The built-in eFAST application's finding keys, in catalogue order (shared/catalogue.ts): a review reads each. */
export const EFAST_FINDING_KEYS = DEFAULT_CATALOGUE.find((a) => a.code === "efast")!.findings.map((f) => f.key);

/** The body of POST /api/exams for a clinical eFAST draft performed an hour ago. */
export const efastExamBody = () => ({
  applicationCode: "efast",
  performedAt: new Date(Date.now() - 3600_000).toISOString(),
  setting: "clinical",
  transducer: "curvilinear",
  preset: "Abdomen",
  indication: "Blunt trauma",
  findings: [{ key: "free_fluid_ruq", read: "negative" }],
});

export const TEST_PASSWORD = "correct-horse-battery-7";

export interface TestKit {
  app: Express;
  routes: ReturnType<typeof buildApp>["routes"];
  db: Db;
  config: Config;
  storage: Storage;
  /** The real job queue, started on first use. */
  queue: () => Promise<JobQueue>;
  close: () => Promise<void>;
}

export interface KitOptions {
  /** Wraps the kit's storage, e.g. to make `put` fail like a full disk. */
  wrapStorage?: (storage: Storage) => Storage;
}

/** An app wired to the test database; `env` overrides settings for this kit only. */
export function makeKit(env: Record<string, string> = {}, opts: KitOptions = {}): TestKit {
  if (!process.env.DATABASE_URL) throw new Error("DATABASE_URL is not set: run the tests through `npm test`");
  const config = loadConfig({ ...process.env, NODE_ENV: "test", ...env });
  const db = createDb(config.databaseUrl, 4);
  // Each kit delivers the outbox like a worker would (any kit may send any file's mail).
  const mailer = createMailer(config.smtp);
  const sender = startMailSender(db, mailer, { ...config.mailOutbox, pollMs: Math.min(config.mailOutbox.pollMs, 500) }, () => {});
  const storage = opts.wrapStorage ? opts.wrapStorage(createStorage(config)) : createStorage(config);
  let started: Promise<JobQueue> | undefined;
  const queue = () => (started ??= createJobQueue(config, { supervise: false, log: () => {} }));
  const jobs = { enqueueClip: async (job: { clipId: string; version: number }) => (await queue()).enqueueClip(job) };
  const { app, routes } = buildApp({ db, config, storage, jobs, log: () => {} });
  return {
    app,
    routes,
    db,
    config,
    storage,
    queue,
    close: async () => {
      await sender.stop();
      mailer.close();
      if (started) await (await started).stop();
      await db.destroy();
    },
  };
}

const uid = () => crypto.randomBytes(5).toString("hex");

export async function makeProgram(db: Db, name = `Test Program ${uid()}`) {
  const [p] = await db("programs")
    .insert({ name, slug: `test-${uid()}` })
    .returning(["id", "name"]);
  await insertCatalogue(db, p.id, DEFAULT_CATALOGUE.slice(0, 3));
  await db.transaction((trx) => ensureDefaultRubric(trx, p.id));
  return p as { id: string; name: string };
}

export interface TestMember {
  id: string;
  email: string;
  name: string;
  password: string;
  programId: string;
  roles: Role[];
}

/** A member with a known password; pass `userId` to add an existing person to another program. */
export async function makeMember(db: Db, programId: string, roles: Role[], opts: { userId?: string; email?: string } = {}): Promise<TestMember> {
  let user: { id: string; email: string; name: string };
  if (opts.userId) {
    user = await db("users").where("id", opts.userId).first("id", "email", "name");
  } else {
    const email = opts.email ?? `person-${uid()}@test.example`;
    [user] = await db("users")
      .insert({ email, name: `Person ${uid()}`, password_hash: await hashPassword(TEST_PASSWORD, 4) })
      .returning(["id", "email", "name"]);
  }
  await db("memberships").insert({ user_id: user.id, program_id: programId, roles });
  return { ...user, password: TEST_PASSWORD, programId, roles };
}

/** A valid session token for a member, without going through the rate-limited login. */
export async function tokenFor(kit: TestKit, m: { id: string; programId: string }): Promise<string> {
  const sid = await createSession(kit.db, { userId: m.id, programId: m.programId, ttlSeconds: 600 });
  return signSessionToken(kit.config.jwtSecret, { sub: m.id, sid, pid: m.programId }, 600);
}

/** A request as a member, with their Bearer token (and the body, when given). */
export async function callAs(kit: TestKit, m: { id: string; programId: string }, method: "get" | "post" | "put", path: string, body?: object) {
  const agent = request(kit.app);
  const req = (method === "get" ? agent.get(path) : method === "post" ? agent.post(path) : agent.put(path)).set(
    "Authorization",
    `Bearer ${await tokenFor(kit, m)}`,
  );
  return body ? req.send(body) : req;
}

export async function login(kit: TestKit, email: string, password = TEST_PASSWORD) {
  return request(kit.app).post("/api/auth/login").send({ email, password });
}

export interface Mail {
  subject: string;
  text: string;
  to: { address: string }[];
}

/** Waits for the fake mail server to receive a message for `address`. */
export async function waitForMail(address: string, subjectPart: string, timeoutMs = 8000): Promise<Mail> {
  const url = process.env.MAILDEV_URL;
  if (!url) throw new Error("MAILDEV_URL is not set: run the tests through `npm test`");
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const all = (await (await fetch(`${url}/email`)).json()) as Mail[];
    const hit = all.find((m) => m.to.some((t) => t.address === address) && m.subject.includes(subjectPart));
    if (hit) return hit;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`no mail "${subjectPart}" for ${address} within ${timeoutMs} ms`);
}

/** All messages the fake server holds for `address`. */
export async function mailsFor(address: string): Promise<Mail[]> {
  const all = (await (await fetch(`${process.env.MAILDEV_URL}/email`)).json()) as Mail[];
  return all.filter((m) => m.to.some((t) => t.address === address));
}

/** The token in the first Soundings link of an e-mail. */
export const linkToken = (mail: Mail) => {
  const m = mail.text.match(/[?&]token=([A-Za-z0-9_-]+)/);
  if (!m) throw new Error(`no token link in: ${mail.text}`);
  return m[1];
};

/** A draft exam row for a sonographer (no clips). */
export async function makeExam(db: Db, programId: string, sonographerId: string, opts: { application?: string; status?: "draft" | "submitted" } = {}) {
  const app = await db("applications")
    .where({ program_id: programId, code: opts.application ?? "efast", status: "published" })
    .first("id");
  const submitted = opts.status === "submitted";
  const [exam] = await db("exams")
    .insert({
      program_id: programId,
      sonographer_id: sonographerId,
      application_id: app.id,
      code: `EX-${crypto.randomBytes(3).toString("hex").toUpperCase()}`,
      performed_at: new Date(Date.now() - 3600_000),
      setting: "clinical",
      transducer: "curvilinear",
      status: submitted ? "submitted" : "draft",
      submitted_at: submitted ? new Date() : null,
      attested_at: submitted ? new Date() : null,
    })
    .returning("*");
  return exam as { id: string; code: string; program_id: string };
}

/** A clip row; a "ready" one gets a small stored poster and video so media routes answer. */
export async function makeClip(kit: TestKit, exam: { id: string; program_id: string }, state: "queued" | "ready" | "failed" = "queued") {
  // Through the clip repository's own insert and transitions, with keys from storage/keys.ts;
  // no original is kept (its key is forgotten), and a ready clip's outputs are 10 bytes each.
  const id = crypto.randomUUID();
  await insertClip(kit.db, {
    id,
    examId: exam.id,
    programId: exam.program_id,
    view: null,
    kind: "video",
    originalName: "clip.mp4",
    originalKey: originalKey(exam.program_id, id),
    sha256: crypto.randomBytes(32).toString("hex"),
    sizeBytes: 10,
    mime: "video/mp4",
    position: await nextClipPosition(kit.db, exam.id),
  });
  await forgetClipOriginal(kit.db, id);
  if (state === "failed") await markClipFailed(kit.db, id, 1, "test failure");
  if (state === "ready") {
    const fs = await import("node:fs");
    const os = await import("node:os");
    const path = await import("node:path");
    const tmp = path.join(os.tmpdir(), `soundings-fake-${id}`);
    fs.writeFileSync(tmp, Buffer.from("0123456789"));
    const outputs = { output_key: processedKey(exam.program_id, id, 1, "video.mp4"), poster_key: processedKey(exam.program_id, id, 1, "poster.jpg") };
    for (const key of Object.values(outputs)) await kit.storage.put(key, tmp, "application/octet-stream");
    fs.rmSync(tmp);
    await markClipReady(kit.db, id, 1, outputs);
  }
  return { id };
}
