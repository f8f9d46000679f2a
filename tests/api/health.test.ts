// GET /api/health against a database of its own, which the test then stops.
import { afterAll, describe, expect, it } from "vitest";
import request from "supertest";
import { startTemporaryCluster } from "../../scripts/lib/postgres";
import { createDb } from "../../server/db/knex";
import { buildApp } from "../../server/app";
import { loadConfig } from "../../server/config";
import { createLocalStorage } from "../../server/storage/local";
import os from "node:os";

const cleanups: (() => unknown)[] = [];
afterAll(async () => {
  for (const c of cleanups.reverse()) await c(); // the pool closes before its cluster goes
});

describe("GET /api/health", () => {
  it("answers 200 with the database up and 503 once it is stopped", async () => {
    const cluster = await startTemporaryCluster("soundings-health-");
    cleanups.push(() => cluster.destroy());
    const config = loadConfig({ NODE_ENV: "test", DATABASE_URL: cluster.url() });
    const db = createDb(config.databaseUrl, 2);
    cleanups.push(() => db.destroy());
    // Health touches neither media nor jobs: storage and queue are inert stand-ins here.
    const { app } = buildApp({
      db,
      config,
      storage: createLocalStorage(os.tmpdir()),
      jobs: { enqueueClip: async () => {} },
      log: () => {},
    });

    const up = await request(app).get("/api/health");
    expect(up.status).toBe(200);
    expect(up.body).toEqual({ ok: true, db: "up" });

    cluster.stop();
    const down = await request(app).get("/api/health");
    expect(down.status).toBe(503);
    expect(down.body).toEqual({ ok: false, db: "down" });
  });
});
