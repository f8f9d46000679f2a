// A request that fails with a 500 is logged without the caller's e-mail or token: the app's
// log is the redacting pino logger (server/log.ts), here writing into a stream the test reads.
import { Writable } from "node:stream";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { makeKit, makeMember, makeProgram, tokenFor, type TestKit } from "./helpers";
import { buildApp } from "../../server/app";
import { createLogger, logFnFor } from "../../server/log";
import type { Db } from "../../server/db/knex";

let kit: TestKit;
beforeAll(() => {
  kit = makeKit();
});
afterAll(() => kit.close());

describe("server log", () => {
  it("logs a failing request's error without the caller's e-mail or token", async () => {
    const p = await makeProgram(kit.db);
    const sono = await makeMember(kit.db, p.id, ["sonographer"]);
    const token = await tokenFor(kit, sono);
    // A repository failure whose message and detail quote the caller (as a database error can).
    const failing = new Proxy(kit.db, {
      apply(target, thisArg, args: unknown[]) {
        if (String(args[0]).startsWith("exams")) {
          throw Object.assign(new Error(`exams query failed for ${sono.email}`), {
            detail: `session ${token} of ${sono.email}`,
            headers: { authorization: `Bearer ${token}` },
          });
        }
        return Reflect.apply(target, thisArg, args);
      },
    }) as Db;
    const lines: string[] = [];
    const destination = new Writable({
      write(chunk, _enc, cb) {
        lines.push(String(chunk));
        cb();
      },
    });
    const { app } = buildApp({
      db: failing,
      config: kit.config,
      storage: kit.storage,
      jobs: { enqueueClip: async () => {} },
      log: logFnFor(createLogger({ level: "info", destination })),
    });

    const res = await request(app).get("/api/exams").set("Authorization", `Bearer ${token}`);
    expect(res.status).toBe(500);
    expect(res.body.error.code).toBe("internal_error");
    const out = lines.join("");
    expect(out).toContain("exams query failed for p***@test.example");
    expect(out).not.toContain(sono.email);
    expect(out).not.toContain(token);
  });
});
