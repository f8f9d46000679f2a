// The API under a mixed load: autocannon with BENCH_CONNECTIONS (100) connections for
// BENCH_SECONDS (30) s per scenario on 127.0.0.1 — queue claims each followed by a review
// submit or a release, exam pages, feedback lists, media Range requests, and all of them mixed
// on every connection — against GET /api/health at the same connections and duration in the
// same run. Reports requests/s, p50/p99 latency, errors and non-2xx answers, and the ratios
// to the health reference. Every scenario stops after its duration.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import crypto from "node:crypto";
import autocannon from "autocannon";
import { startTemporaryCluster } from "../scripts/lib/postgres";
import { createDb, migrate } from "../server/db/knex";
import { loadConfig } from "../server/config";
import { buildApp } from "../server/app";
import { seedQueueProgram } from "./queue-program";
import { createLocalStorage } from "../server/storage/local";
import { originalKey, processedKey } from "../server/storage/keys";
import { insertClip, markClipReady } from "../server/repositories/clips";

const CONNECTIONS = Number(process.env.BENCH_CONNECTIONS ?? 100);
const SECONDS = Number(process.env.BENCH_SECONDS ?? 30);
const EXAMS = Number(process.env.BENCH_EXAMS ?? 3000);

const cluster = await startTemporaryCluster("soundings-bench-load-");
const storageDir = fs.mkdtempSync(path.join(os.tmpdir(), "soundings-bench-load-media-"));
const config = loadConfig({ NODE_ENV: "test", DATABASE_URL: cluster.url(), SMTP_PORT: "9", STORAGE_DIR: storageDir });
const db = createDb(config.databaseUrl, 20);
try {
  await migrate(db);
  const seeded = await seedQueueProgram(db, config.jwtSecret, { tag: "Load", reviewers: CONNECTIONS, exams: EXAMS, setting: () => "clinical" });
  const program = { id: seeded.programId };
  const { sonographerToken: sonoToken, reviewerTokens, exams } = seeded;
  // One ready 4 MiB clip on the sonographer's first exam, for the Range requests.
  const clipId = crypto.randomUUID();
  const videoKey = processedKey(program.id, clipId, 1, "video.mp4");
  fs.mkdirSync(path.dirname(path.join(storageDir, videoKey)), { recursive: true });
  fs.writeFileSync(path.join(storageDir, videoKey), crypto.randomBytes(4 << 20));
  await insertClip(db, {
    id: clipId,
    examId: exams[0].id,
    programId: program.id,
    view: null,
    kind: "video",
    originalName: "load.mp4",
    originalKey: originalKey(program.id, clipId),
    sha256: crypto.randomBytes(32).toString("hex"),
    sizeBytes: 4 << 20,
    mime: "video/mp4",
    position: 0,
  });
  await markClipReady(db, clipId, 1, { output_key: videoKey, poster_key: videoKey });

  const { app: server } = buildApp({
    db,
    config,
    storage: createLocalStorage(storageDir),
    jobs: { enqueueClip: async () => {} },
    log: () => {},
  });
  const listener = server.listen(0, "127.0.0.1");
  await new Promise((r) => listener.once("listening", r));
  const url = `http://127.0.0.1:${(listener.address() as { port: number }).port}`;

  // autocannon resets a connection's context after each pass through its request list, so
  // a reviewer is lent to one connection for one claim-and-answer pass from a free list:
  // no two connections ever act as the same reviewer at once.
  type Ctx = { token?: string; assignment?: string };
  const freeReviewers = [...reviewerTokens];
  let passes = 0;
  const review = JSON.stringify({
    scores: { transducer: "suitable", marker: "follows", depth: "fits", gain: "balanced", plane: "standard", labels: "complete", quality: "4" },
    reads: [{ key: "aneurysm", read: "negative" }],
    feedback: "Aorta seen along its length.",
    timeSpentSeconds: 30,
  });
  const json = { "content-type": "application/json" };
  // Claim, then alternately submit a review or release the claim.
  const claimCycle: autocannon.Request[] = [
    {
      method: "POST",
      path: "/api/queue/next",
      headers: json,
      body: "{}",
      setupRequest: (req, ctx: Ctx) => {
        ctx.token = freeReviewers.pop();
        return { ...req, headers: { ...req.headers, authorization: `Bearer ${ctx.token}` } };
      },
      onResponse: (status, body, ctx: Ctx) => {
        ctx.assignment = status === 200 ? JSON.parse(body).assignment.id : undefined;
      },
    },
    {
      method: "POST",
      headers: json,
      setupRequest: (req, ctx: Ctx) => {
        const submit = ++passes % 2 === 0;
        return {
          ...req,
          path: `/api/assignments/${ctx.assignment ?? "00000000-0000-0000-0000-000000000000"}/${submit ? "review" : "release"}`,
          body: submit ? review : "{}",
          headers: { ...req.headers, authorization: `Bearer ${ctx.token}` },
        };
      },
      onResponse: (_status, _body, ctx: Ctx) => {
        if (ctx.token) freeReviewers.push(ctx.token);
      },
    },
  ];
  const asSono = { authorization: `Bearer ${sonoToken}` };
  const examPage: autocannon.Request = { method: "GET", path: `/api/exams/${exams[0].id}`, headers: asSono };
  const feedback: autocannon.Request = { method: "GET", path: "/api/me/feedback", headers: asSono };
  const range: autocannon.Request = {
    method: "GET",
    setupRequest: (req) => {
      const start = crypto.randomInt(0, (4 << 20) - 65536);
      return { ...req, path: `/api/clips/${clipId}/media/video`, headers: { ...asSono, range: `bytes=${start}-${start + 65535}` } };
    },
  };

  const scenarios: [string, autocannon.Request[]][] = [
    ["reference  GET /api/health", [{ method: "GET", path: "/api/health" }]],
    ["queue      claim + submit/release", claimCycle],
    ["exam page  GET /api/exams/:id", [examPage]],
    ["feedback   GET /api/me/feedback", [feedback]],
    ["media      GET …/media/video Range 64 KiB", [range]],
    ["mixed      all of the above per connection", [...claimCycle, examPage, feedback, range]],
  ];
  console.log(`${CONNECTIONS} connections, ${SECONDS} s per scenario, ${EXAMS} queued exams`);
  const statuses = (r: autocannon.Result) =>
    Object.entries(r.statusCodeStats ?? {})
      .map(([code, v]) => `${code}: ${v.count}`)
      .join(", ");
  let ref: autocannon.Result | undefined;
  for (const [name, requests] of scenarios) {
    // Connections cut off at the end of a scenario never give their reviewer back.
    freeReviewers.splice(0, freeReviewers.length, ...reviewerTokens);
    const r = await autocannon({ url, connections: CONNECTIONS, duration: SECONDS, requests, timeout: 30 });
    ref ??= r;
    const ratio =
      ref === r
        ? ""
        : `  ratio to health: req/s ${(r.requests.average / ref.requests.average).toFixed(2)}, p50 ${(r.latency.p50 / ref.latency.p50).toFixed(1)}×, p99 ${(r.latency.p99 / ref.latency.p99).toFixed(1)}×`;
    console.log(
      `${name.padEnd(44)} ${r.requests.average.toFixed(0).padStart(6)} req/s  p50 ${r.latency.p50} ms  p99 ${r.latency.p99} ms  errors ${r.errors} timeouts ${r.timeouts} non-2xx ${r.non2xx}${r.non2xx ? ` (${statuses(r)})` : ""}${ratio}`,
    );
  }
  const [{ reviews }] = await db("reviews").count<{ reviews: string }[]>("* as reviews");
  const [{ releases }] = await db("audit_log")
    .where("action", "assignment.released")
    .count<{ releases: string }[]>("* as releases")
    .catch(() => [{ releases: "?" }]);
  console.log(`reviews submitted during the run: ${reviews}; claims released: ${releases}`);
  console.log(`load average while measuring: ${os.loadavg()[0].toFixed(1)} on ${os.cpus().length} cores (other work on the machine slows every figure)`);
  listener.close();
} finally {
  await db.destroy();
  cluster.destroy();
  fs.rmSync(storageDir, { recursive: true, force: true });
}
