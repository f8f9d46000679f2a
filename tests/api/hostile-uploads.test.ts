// Hostile uploads through the real API and the real worker: a generated corpus (see
// tests/fixtures/hostile-corpus.ts) of broken, disguised and oversized files and hostile names.
// Every file must be refused at upload with a clear JSON error, or end failed with a clear
// reason, or (a valid file after all) end ready; the server stays up; no file or row is left over.
import fs from "node:fs";
import fsp from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeExam, makeKit, makeMember, makeProgram, tokenFor, type TestKit } from "./helpers";
import { CONTROL_CHARACTER_NAMES, makeHostileCorpus, type CorpusFile } from "../fixtures/hostile-corpus";
import { startMediaWorker, type MediaWorker } from "../../server/jobs/worker";
import { describeFailure } from "../../server/jobs/process-clip";

/** What the job writes on a clip when the error was not a MediaError: a bug, not the file's fault. */
const SERVER_PROBLEM = describeFailure(new Error("x"));

let kit: TestKit;
let workers: MediaWorker[] = [];
let root: string;
let storageDir: string;
let uploadDir: string;
let corpusDir: string;
let corpus: CorpusFile[];

beforeAll(async () => {
  root = await fsp.mkdtemp(path.join(os.tmpdir(), "soundings-hostile-"));
  storageDir = path.join(root, "storage");
  uploadDir = path.join(root, "uploads");
  corpusDir = path.join(root, "corpus");
  await fsp.mkdir(corpusDir);
  // Own storage, temp folder and queue schema, so the leftovers check sees only this file's work
  // and no other test file's worker takes these jobs; no retries, so a failure is final at once.
  kit = makeKit({
    STORAGE_DIR: storageDir,
    UPLOAD_TMP_DIR: uploadDir,
    JOB_SCHEMA: "pgboss_hostile",
    JOB_RETRY_LIMIT: "0",
    MAX_CLIPS_PER_EXAM: "1000",
  });
  corpus = await makeHostileCorpus(corpusDir);
}, 120_000);

afterAll(async () => {
  await Promise.all(workers.map((w) => w.stop()));
  await kit?.close();
  if (root) await fsp.rm(root, { recursive: true, force: true });
});

async function filesUnder(dir: string): Promise<string[]> {
  const out: string[] = [];
  for (const e of await fsp.readdir(dir, { withFileTypes: true }).catch(() => [])) {
    const p = path.join(dir, e.name);
    if (e.isDirectory()) out.push(...(await filesUnder(p)));
    else out.push(p);
  }
  return out;
}

interface Outcome {
  c: CorpusFile;
  status: number | "send failed";
  code?: string;
  message?: string;
  clipId?: string;
  state?: string;
  error?: string | null;
}

describe("hostile uploads", () => {
  it("refuses or fails every hostile file clearly, keeps valid ones, stays up and leaves nothing behind", async () => {
    expect(corpus.length).toBeGreaterThanOrEqual(200);
    const p = await makeProgram(kit.db);
    const m = await makeMember(kit.db, p.id, ["sonographer"]);
    const auth = `Bearer ${await tokenFor(kit, m)}`;
    const exam = await makeExam(kit.db, p.id, m.id);
    // Three workers, one job at a time each (a worker waits up to its 1 s polling interval between
    // jobs, so one alone would take minutes over the ~150 accepted files).
    const queue = await kit.queue();
    const started = Date.now();
    workers = await Promise.all([1, 2, 3].map(() => startMediaWorker({ db: kit.db, storage: kit.storage, config: kit.config, queue, log: () => {} })));

    const outcomes: Outcome[] = [];
    for (const c of corpus) {
      const res = await request(kit.app)
        .post(`/api/exams/${exam.id}/clips`)
        .set("Authorization", auth)
        .attach("file", c.file, { filename: c.uploadName })
        .then(
          (r) => r,
          (e: unknown) => ({ status: "send failed" as const, body: { error: { message: String(e) } } }),
        );
      const o: Outcome = { c, status: res.status };
      if (res.status === 202) o.clipId = res.body.id;
      else {
        o.code = res.body?.error?.code;
        o.message = res.body?.error?.message;
      }
      outcomes.push(o);
    }

    const uploaded = Date.now();
    // The workers finish what was accepted.
    const ids = outcomes.filter((o) => o.clipId).map((o) => o.clipId!);
    const deadline = Date.now() + 150_000;
    let pending = ids.length;
    while (pending > 0 && Date.now() < deadline) {
      await new Promise((r) => setTimeout(r, 500));
      const [{ count }] = await kit.db("clips").whereIn("id", ids).whereIn("state", ["queued", "processing"]).count<{ count: string }[]>("* as count");
      pending = Number(count);
    }
    const rows = new Map((await kit.db("clips").whereIn("id", ids).select("*")).map((r) => [r.id as string, r]));
    for (const o of outcomes) {
      if (!o.clipId) continue;
      o.state = rows.get(o.clipId)?.state;
      o.error = rows.get(o.clipId)?.error;
    }

    const problems: string[] = [];
    const processed = Date.now();
    for (const o of outcomes) {
      const what = `${o.c.label} (${JSON.stringify(o.c.uploadName.slice(0, 60))})`;
      if (typeof o.status !== "number") problems.push(`${what}: the request could not be sent: ${o.message}`);
      else if (o.status >= 500) problems.push(`${what}: ${o.status} ${o.code}: ${o.message}`);
      else if (o.status === 202) {
        if (o.state !== "ready" && o.state !== "failed") problems.push(`${what}: still ${o.state} (a hang)`);
        else if (o.state === "failed" && (!o.error || o.error === SERVER_PROBLEM)) problems.push(`${what}: failed without a clear reason: ${o.error}`);
        else if (o.c.valid && o.state !== "ready") problems.push(`${what}: a valid file failed: ${o.error}`);
        else if (o.c.expectMessage && !o.c.expectMessage.test(o.error ?? ""))
          problems.push(`${what}: ${o.state} with "${o.error}", expected ${o.c.expectMessage}`);
        else if (o.state === "ready" && o.c.mustNotContain) {
          const row = rows.get(o.clipId!);
          for (const key of [row.output_key, row.poster_key, row.strip_key, row.thumb_key].filter(Boolean)) {
            const bytes = await fsp.readFile(path.join(storageDir, key));
            if (bytes.includes(o.c.mustNotContain)) problems.push(`${what}: the appended payload reached ${key}`);
          }
        }
      } else if (o.status >= 400) {
        if (!o.code || !o.message) problems.push(`${what}: ${o.status} without a JSON error`);
        else if (o.c.valid) problems.push(`${what}: a valid file was refused: ${o.status} ${o.message}`);
        else if (o.c.expectMessage && !o.c.expectMessage.test(o.message)) problems.push(`${what}: ${o.status} "${o.message}", expected ${o.c.expectMessage}`);
      } else problems.push(`${what}: unexpected status ${o.status}`);
    }

    // The server is up.
    expect((await request(kit.app).get("/api/health")).status).toBe(200);

    // Nothing left behind: every stored file belongs to a clip row, every key of a row is stored,
    // and the upload temp folder is empty.
    const allRows = await kit.db("clips").where("exam_id", exam.id).select("original_key", "output_key", "poster_key", "strip_key", "thumb_key");
    const keys = new Set(allRows.flatMap((r) => [r.original_key, r.output_key, r.poster_key, r.strip_key, r.thumb_key].filter(Boolean) as string[]));
    const stored = new Set((await filesUnder(storageDir)).map((f) => path.relative(storageDir, f).split(path.sep).join("/")));
    for (const f of stored) if (!keys.has(f)) problems.push(`orphan file in storage: ${f}`);
    for (const k of keys) if (!stored.has(k)) problems.push(`clip row points at a missing file: ${k}`);
    if (allRows.length !== ids.length) problems.push(`${allRows.length} clip rows for ${ids.length} accepted uploads`);
    for (const f of await filesUnder(uploadDir)) problems.push(`upload temp file left: ${path.basename(f)}`);

    // A summary for the person reading the run (which inputs ended how).
    const tally = new Map<string, number>();
    for (const o of outcomes) {
      const k = o.status === 202 ? `202 → ${o.state}` : `${o.status} ${o.code ?? ""}`.trim();
      tally.set(k, (tally.get(k) ?? 0) + 1);
    }
    console.log(
      `hostile corpus: ${corpus.length} files; ${[...tally].map(([k, v]) => `${k}: ${v}`).join(", ")}; uploads ${((uploaded - started) / 1000).toFixed(1)} s, ` +
        `processing ${((processed - uploaded) / 1000).toFixed(1)} s more`,
    );
    if (process.env.HOSTILE_REPORT) {
      fs.writeFileSync(
        process.env.HOSTILE_REPORT,
        outcomes.map((o) => `${o.c.label}\t${o.status}\t${o.code ?? o.state ?? ""}\t${o.message ?? o.error ?? ""}`).join("\n"),
      );
    }
    expect(problems).toEqual([]);
  }, 240_000);

  it("answers 4xx to a file name with control characters that break the part header", async () => {
    const p = await makeProgram(kit.db);
    const m = await makeMember(kit.db, p.id, ["sonographer"]);
    const exam = await makeExam(kit.db, p.id, m.id);
    const auth = `Bearer ${await tokenFor(kit, m)}`;
    const res = await request(kit.app)
      .post(`/api/exams/${exam.id}/clips`)
      .set("Authorization", auth)
      .attach("file", Buffer.from("\x89PNG\r\n\x1a\n"), { filename: CONTROL_CHARACTER_NAMES[0] });
    expect(res.status).toBeGreaterThanOrEqual(400);
    expect(res.status).toBeLessThan(500);
    expect(res.body.error.message).toMatch(/file/);
  });
});
