// The agreement report on the 100,000-review bench program: GET /api/reports/agreement
// timed (median of 5) beside GET /api/health in the same run. Target: under 500 ms.
// The report includes each criterion's alpha with its bootstrap interval.
import os from "node:os";
import request from "supertest";
import { startTemporaryCluster } from "../scripts/lib/postgres";
import { createDb, migrate } from "../server/db/knex";
import { loadConfig } from "../server/config";
import { buildApp } from "../server/app";
import { createLocalStorage } from "../server/storage/local";
import { seedBench } from "../seeds/bench";
import { createSession } from "../server/repositories/sessions";
import { signSessionToken } from "../server/auth/tokens";

const cluster = await startTemporaryCluster("soundings-bench-agreement-");
const config = loadConfig({ NODE_ENV: "test", DATABASE_URL: cluster.url() });
const db = createDb(config.databaseUrl);
try {
  await migrate(db);
  let t = performance.now();
  const programId = await seedBench(db);
  await db.raw("ANALYZE");
  console.log(`seeded 100,000 reviews in ${((performance.now() - t) / 1000).toFixed(1)} s`);
  const [lead] = await db("users").insert({ email: "bench-lead@bench.example", name: "Bench Lead" }).returning("id");
  await db("memberships").insert({ user_id: lead.id, program_id: programId, roles: ["qa_lead"] });
  const sid = await createSession(db, { userId: lead.id, programId, ttlSeconds: 3600 });
  const token = signSessionToken(config.jwtSecret, { sub: lead.id, sid, pid: programId }, 3600);
  const { app } = buildApp({
    db,
    config,
    storage: createLocalStorage(os.tmpdir()),
    jobs: { enqueueClip: async () => {} },
    log: console.error,
  });
  let intervals = 0;
  const median = async (path: string, auth: boolean) => {
    const ts: number[] = [];
    for (let i = 0; i < 5; i++) {
      t = performance.now();
      const r = auth ? await request(app).get(path).set("Authorization", `Bearer ${token}`) : await request(app).get(path);
      if (r.status !== 200) throw new Error(`${path}: ${r.status}`);
      ts.push(performance.now() - t);
      if (auth) intervals = (r.body.criteria as { alpha: { ci95: unknown } }[]).filter((c) => c.alpha.ci95).length;
    }
    return ts.sort((a, b) => a - b)[2];
  };
  const health = await median("/api/health", false);
  const all = await median("/api/reports/agreement", true);
  const year = await median(`/api/reports/agreement?from=${new Date(Date.now() - 90 * 86400_000).toISOString().slice(0, 10)}&criterion=depth`, true);
  console.log(`reference GET /api/health ${health.toFixed(1)} ms`);
  console.log(`GET /api/reports/agreement (all 50,000 double reads) ${all.toFixed(0)} ms  (target < 500 ms; ratio to health ${(all / health).toFixed(0)})`);
  console.log(`GET /api/reports/agreement (last 90 days, depth) ${year.toFixed(0)} ms`);
  console.log(`(each includes alpha's 1,000-resample bootstrap interval for ${intervals} criteria with variation)`);
  console.log(`load average while measuring: ${os.loadavg()[0].toFixed(1)} on ${os.cpus().length} cores (other work on the machine slows every figure)`);
} finally {
  await db.destroy();
  cluster.destroy();
}
