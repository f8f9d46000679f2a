// A database that goes away under an open pool and a running job queue (a test cluster
// stopped, PostgreSQL restarted): queries fail with their own errors, and the console gets
// no connection noise from the pool and at most one line from the queue, none once it stops.
import { afterAll, afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { startTemporaryCluster } from "../../scripts/lib/postgres";
import { loadConfig } from "../../server/config";
import { createDb } from "../../server/db/knex";
import { CLIP_QUEUE, createJobQueue, isConnectionLoss } from "../../server/jobs/queue";

const cleanups: (() => unknown)[] = [];
afterAll(async () => {
  for (const c of cleanups.reverse()) await c();
});

let printed: string[] = [];
beforeEach(() => {
  printed = [];
  for (const m of ["log", "warn", "error"] as const)
    vi.spyOn(console, m).mockImplementation((...args: unknown[]) => void printed.push(args.map((a) => (a instanceof Error ? a.stack : String(a))).join(" ")));
});
afterEach(() => vi.restoreAllMocks());
// The queue's own lines go to the logger it is given (the server's is silent under test), so
// they are caught here; the pool's would reach the console, which is caught above.
const log = (e: unknown) => void printed.push(e instanceof Error ? (e.stack ?? e.message) : String(e));

const NOISE = /ECONNREFUSED|terminating connection|Acquire connection|Connection Error|^\s+at .+:\d+:\d+\)?$/m;
const LOST_LINE = "Job queue: lost its database connection";

describe("a database that stops under open connections", () => {
  it("fails the queries but prints no connection noise from the pool or the queue", async () => {
    const cluster = await startTemporaryCluster("soundings-quiet-");
    cleanups.push(() => cluster.destroy());
    const config = loadConfig({ NODE_ENV: "test", DATABASE_URL: cluster.url() });
    const db = createDb(config.databaseUrl, 2);
    const queue = await createJobQueue(config, { log });
    await queue.boss.work(CLIP_QUEUE, { pollingIntervalSeconds: 0.5 }, async () => {});
    await db.raw("select 1");

    cluster.stop();
    await expect(db.raw("select 1")).rejects.toThrow();
    await expect(db.raw("select 1")).rejects.toThrow();
    await new Promise((r) => setTimeout(r, 1500)); // a few of the queue's polls
    await queue.stop();
    await db.destroy();

    expect(printed.join("\n")).not.toMatch(NOISE);
    expect(printed.filter((l) => !l.startsWith(LOST_LINE))).toEqual([]);
    expect(printed.length).toBeLessThanOrEqual(1);
  }, 60_000);

  it("says a lost connection once, other errors in full, and nothing once the queue stops", async () => {
    const cluster = await startTemporaryCluster("soundings-quiet-");
    cleanups.push(() => cluster.destroy());
    const queue = await createJobQueue(loadConfig({ NODE_ENV: "test", DATABASE_URL: cluster.url() }), { log });
    const refused = Object.assign(new Error("connect ECONNREFUSED 127.0.0.1:5"), { code: "ECONNREFUSED" });
    for (let i = 0; i < 3; i++) queue.boss.emit("error", refused);
    expect(printed).toEqual([`${LOST_LINE} (ECONNREFUSED); retrying`]);
    queue.boss.emit("error", new Error("a job handler broke"));
    expect(printed).toHaveLength(2);
    expect(printed[1]).toContain("a job handler broke");
    await queue.stop();
    queue.boss.emit("error", { code: "57P01", message: "terminating connection due to administrator command" });
    expect(printed).toHaveLength(2);
  }, 60_000);

  it("tells connection losses from other errors", () => {
    // Codes: Node's socket errors; SQLSTATE 57P01 admin_shutdown and class 08 connection exception (PostgreSQL, Appendix A).
    expect(isConnectionLoss(Object.assign(new Error("connect ECONNREFUSED 127.0.0.1:5"), { code: "ECONNREFUSED" }))).toBe(true);
    expect(isConnectionLoss({ code: "57P01", message: "terminating connection due to administrator command" })).toBe(true);
    expect(isConnectionLoss({ code: "08006", message: "connection failure" })).toBe(true);
    expect(isConnectionLoss(new Error("Connection terminated unexpectedly"))).toBe(true);
    expect(isConnectionLoss({ code: "23505", message: "duplicate key value violates unique constraint" })).toBe(false);
    expect(isConnectionLoss(new Error("job handler failed"))).toBe(false);
    expect(isConnectionLoss(undefined)).toBe(false);
  });
});
