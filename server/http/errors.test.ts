// The error middleware's answer when the database is not there: 503 database_unavailable
// with Retry-After for connection errors (SQLSTATE codes from PostgreSQL's Appendix A:
// 57P01 admin_shutdown, 57P03 cannot_connect_now, class 08 connection_exception), 500 otherwise.
import { describe, expect, it } from "vitest";
import express from "express";
import request from "supertest";
import { errorHandler } from "./errors";

function appThrowing(err: unknown) {
  const app = express();
  app.get("/", () => {
    throw err;
  });
  app.use(errorHandler(() => {}));
  return app;
}

const timeout = Object.assign(new Error("Knex: Timeout acquiring a connection. The pool is probably full."), { name: "KnexTimeoutError" });

describe("errorHandler and an unreachable database", () => {
  it.each([
    ["ECONNREFUSED", Object.assign(new Error("connect ECONNREFUSED 127.0.0.1:5432"), { code: "ECONNREFUSED" })],
    ["57P01", { code: "57P01", message: "terminating connection due to administrator command" }],
    ["57P03", { code: "57P03", message: "the database system is starting up" }],
    ["08006", { code: "08006", message: "connection failure" }],
    ["a terminated connection", new Error("Connection terminated unexpectedly")],
    ["a pool timeout", timeout],
  ])("answers 503 database_unavailable with Retry-After for %s", async (_name, err) => {
    const res = await request(appThrowing(err)).get("/");
    expect(res.status).toBe(503);
    expect(res.body.error.code).toBe("database_unavailable");
    expect(Number(res.headers["retry-after"])).toBeGreaterThan(0);
  });

  it("still answers 500 for other database errors", async () => {
    const res = await request(appThrowing({ code: "23505", message: "duplicate key value violates unique constraint" })).get("/");
    expect(res.status).toBe(500);
    expect(res.headers["retry-after"]).toBeUndefined();
  });
});
