// What authentication costs per request: GET /api/auth/me (JWT check + session lookup)
// against GET /api/health (one trivial database round trip), on loopback, same run, same
// connection pool. Target: the ratio stays under 4 (a JWT check plus one indexed
// four-table lookup against a bare `select 1`; measured about 3.5 on 2 cores).
import http from "node:http";
import os from "node:os";
import { createLocalStorage } from "../server/storage/local";
import { startTemporaryCluster } from "../scripts/lib/postgres";
import { createDb, migrate } from "../server/db/knex";
import { loadConfig } from "../server/config";
import { buildApp } from "../server/app";
import { seedDemoIfEmpty, DEMO_PASSWORD } from "../seeds/demo";

const REQUESTS = 2000;
const CONCURRENCY = 8;

const cluster = await startTemporaryCluster("soundings-bench-");
const config = loadConfig({ NODE_ENV: "test", DATABASE_URL: cluster.url() });
const db = createDb(config.databaseUrl);
try {
  await migrate(db);
  await seedDemoIfEmpty(db, 4);
  const { app } = buildApp({
    db,
    config,
    storage: createLocalStorage(os.tmpdir()),
    jobs: { enqueueClip: async () => {} },
    log: () => {},
  });
  const server = app.listen(0, "127.0.0.1");
  await new Promise((r) => server.once("listening", r));
  const port = (server.address() as { port: number }).port;
  const agent = new http.Agent({ keepAlive: true, maxSockets: CONCURRENCY });
  const login = await fetch(`http://127.0.0.1:${port}/api/auth/login`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify({ email: "reviewer@cedarhollow.example", password: DEMO_PASSWORD }),
  });
  const { token } = (await login.json()) as { token: string };

  const get = (p: string, auth?: string) =>
    new Promise<number>((resolve, reject) => {
      const t0 = performance.now();
      http
        .get({ host: "127.0.0.1", port, path: p, agent, headers: auth ? { authorization: `Bearer ${auth}` } : {} }, (res) => {
          res.resume();
          res.on("end", () => (res.statusCode === 200 ? resolve(performance.now() - t0) : reject(new Error(`${p}: ${res.statusCode}`))));
        })
        .on("error", reject);
    });

  async function measure(p: string, auth?: string) {
    const times: number[] = [];
    let next = 0;
    const t0 = performance.now();
    await Promise.all(
      Array.from({ length: CONCURRENCY }, async () => {
        while (next++ < REQUESTS) times.push(await get(p, auth));
      }),
    );
    const wall = performance.now() - t0;
    times.sort((a, b) => a - b);
    return { rps: (times.length / wall) * 1000, p50: times[Math.floor(times.length * 0.5)], p95: times[Math.floor(times.length * 0.95)] };
  }

  await measure("/api/health"); // warm-up
  const health = await measure("/api/health");
  const me = await measure("/api/auth/me", token);
  const fmt = (r: typeof health) => `${r.rps.toFixed(0)} req/s, p50 ${r.p50.toFixed(2)} ms, p95 ${r.p95.toFixed(2)} ms`;
  console.log(`reference  GET /api/health  ${fmt(health)}`);
  console.log(`measured   GET /api/auth/me ${fmt(me)}`);
  console.log(`ratio (p50 me / p50 health): ${(me.p50 / health.p50).toFixed(2)}  (target < 4)`);
  agent.destroy();
  server.close();
} finally {
  await db.destroy();
  cluster.destroy();
}
