// The review queue under load: 50 simulated reviewers in a claim-and-submit loop on
// loopback for a bounded time. Reports throughput, p50/p95/p99 latency of claims and of
// submissions, and the number of duplicate claims (must be 0), against a trivial route
// (GET /api/health) measured in the same run at the same concurrency.
import http from "node:http";
import os from "node:os";
import { startTemporaryCluster } from "../scripts/lib/postgres";
import { createDb, migrate } from "../server/db/knex";
import { loadConfig } from "../server/config";
import { buildApp } from "../server/app";
import { seedQueueProgram } from "./queue-program";
import { createLocalStorage } from "../server/storage/local";

const REVIEWERS = 50;
const EXAMS = 3000;
const SECONDS = Number(process.env.BENCH_SECONDS ?? 20);

const cluster = await startTemporaryCluster("soundings-bench-queue-");
// E-mail goes nowhere: a port with nothing listening, failures are logged and ignored.
const config = loadConfig({ NODE_ENV: "test", DATABASE_URL: cluster.url(), SMTP_PORT: "9" });
const db = createDb(config.databaseUrl, 20);
try {
  await migrate(db);
  const { reviewerTokens: tokens } = await seedQueueProgram(db, config.jwtSecret, {
    tag: "Bench",
    reviewers: REVIEWERS,
    exams: EXAMS,
    setting: (i) => (i % 3 ? "clinical" : "educational"),
  });

  const { app: server } = buildApp({
    db,
    config,
    storage: createLocalStorage(os.tmpdir()),
    jobs: { enqueueClip: async () => {} },
    log: () => {},
  });
  const listener = server.listen(0, "127.0.0.1");
  await new Promise((r) => listener.once("listening", r));
  const port = (listener.address() as { port: number }).port;
  const agent = new http.Agent({ keepAlive: true, maxSockets: REVIEWERS });

  const call = (method: string, path: string, token?: string, body?: object) =>
    new Promise<{ status: number; ms: number; json: unknown }>((resolve, reject) => {
      const t0 = performance.now();
      const data = body ? JSON.stringify(body) : undefined;
      const req = http.request(
        {
          host: "127.0.0.1",
          port,
          path,
          method,
          agent,
          headers: {
            ...(token ? { authorization: `Bearer ${token}` } : {}),
            ...(data ? { "content-type": "application/json", "content-length": Buffer.byteLength(data) } : {}),
          },
        },
        (res) => {
          const chunks: Buffer[] = [];
          res.on("data", (c) => chunks.push(c));
          res.on("end", () => {
            const text = Buffer.concat(chunks).toString();
            resolve({ status: res.statusCode ?? 0, ms: performance.now() - t0, json: text ? JSON.parse(text) : null });
          });
        },
      );
      req.on("error", reject);
      req.end(data);
    });
  const pct = (xs: number[], p: number) => [...xs].sort((a, b) => a - b)[Math.min(xs.length - 1, Math.floor(xs.length * p))] ?? NaN;

  // Reference: the trivial route at the same concurrency.
  const health: number[] = [];
  const refEnd = performance.now() + 3000;
  await Promise.all(
    Array.from({ length: REVIEWERS }, async () => {
      while (performance.now() < refEnd) health.push((await call("GET", "/api/health")).ms);
    }),
  );

  const claims: number[] = [];
  const submits: number[] = [];
  const claimedBy = new Map<string, number>();
  let duplicates = 0;
  let errors = 0;
  const scores = { transducer: "suitable", marker: "follows", depth: "fits", gain: "balanced", plane: "standard", labels: "complete", quality: "4" };
  const end = performance.now() + SECONDS * 1000;
  const t0 = performance.now();
  await Promise.all(
    tokens.map(async (token, who) => {
      while (performance.now() < end) {
        const next = await call("POST", "/api/queue/next", token, {});
        claims.push(next.ms);
        if (next.status === 204) break;
        if (next.status !== 200) {
          errors++;
          continue;
        }
        const id = (next.json as { assignment: { id: string } }).assignment.id;
        if (claimedBy.has(id) && claimedBy.get(id) !== who) duplicates++;
        claimedBy.set(id, who);
        const sub = await call("POST", `/api/assignments/${id}/review`, token, {
          scores,
          reads: [{ key: "aneurysm", read: "negative" }],
          feedback: "",
          timeSpentSeconds: 30,
        });
        submits.push(sub.ms);
        if (sub.status !== 201) errors++;
      }
    }),
  );
  const wall = (performance.now() - t0) / 1000;
  const [{ count: dbDuplicates }] = await db
    .raw(`SELECT count(*)::int AS count FROM (SELECT assignment_id FROM reviews GROUP BY assignment_id HAVING count(*) > 1) d`)
    .then((r) => r.rows);
  const fmt = (xs: number[]) => `p50 ${pct(xs, 0.5).toFixed(1)} ms, p95 ${pct(xs, 0.95).toFixed(1)} ms, p99 ${pct(xs, 0.99).toFixed(1)} ms`;
  console.log(`reference  GET /api/health          ${health.length} requests, ${fmt(health)}`);
  console.log(`claims     POST /api/queue/next     ${claims.length} requests, ${fmt(claims)}`);
  console.log(`submits    POST …/review            ${submits.length} requests, ${fmt(submits)}`);
  console.log(`throughput ${(submits.length / wall).toFixed(1)} reviews/s over ${wall.toFixed(1)} s with ${REVIEWERS} reviewers; errors ${errors}`);
  console.log(`duplicate claims: ${duplicates} seen by clients, ${dbDuplicates} in the database (must be 0)`);
  console.log(
    `ratio p50 claim / p50 health: ${(pct(claims, 0.5) / pct(health, 0.5)).toFixed(2)}; p50 submit / p50 health: ${(pct(submits, 0.5) / pct(health, 0.5)).toFixed(2)}`,
  );
  agent.destroy();
  listener.close();
  if (duplicates || dbDuplicates) process.exitCode = 1;
} finally {
  await db.destroy();
  cluster.destroy();
}
