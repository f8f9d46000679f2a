// The wire-contract check of defineRoute: an answer that does not match its declared schema,
// or carries a field the schema does not name, is a 500 naming the route and the field.
import { describe, expect, it } from "vitest";
import express from "express";
import request from "supertest";
import { z } from "zod";
import { OpenAPIRegistry } from "@asteasolutions/zod-to-openapi";
import { defineRoute, type RouteKit } from "./route";
import { errorHandler } from "./errors";

const thingSchema = z.object({ id: z.string(), at: z.string(), items: z.array(z.object({ n: z.number() })) });

function appWith(
  answer: unknown,
  checkResponses = true,
  responses: Record<number, { description: string; schema?: z.ZodType; file?: string }> = { 200: { description: "the thing", schema: thingSchema } },
) {
  const kit: RouteKit = { router: express.Router(), registry: new OpenAPIRegistry(), authenticate: (_q, _s, n) => n(), routes: [], checkResponses };
  defineRoute(kit, {
    method: "get",
    path: "/thing",
    summary: "a thing",
    tag: "test",
    access: "public",
    responses,
    handler: () => answer,
  });
  const app = express();
  app.use("/api", kit.router);
  app.use(errorHandler(() => {}));
  return { app, kit };
}

describe("response checking", () => {
  it("passes an answer that matches, after the JSON round trip (a Date is a string on the wire)", async () => {
    const res = await request(appWith({ id: "a", at: new Date(0), items: [{ n: 1 }] }).app).get("/api/thing");
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ id: "a", at: "1970-01-01T00:00:00.000Z", items: [{ n: 1 }] });
  });

  it("refuses a wrong type, naming the route and the path", async () => {
    const res = await request(appWith({ id: "a", at: "x", items: [{ n: "1" }] }).app).get("/api/thing");
    expect(res.status).toBe(500);
    expect(res.body.error.code).toBe("response_schema_mismatch");
    expect(res.body.error.message).toMatch(/^GET \/thing → 200: items\.0\.n:/);
  });

  it("refuses a field the schema does not name, even deep in an array", async () => {
    const res = await request(appWith({ id: "a", at: "x", items: [{ n: 1, secret: "s" }] }).app).get("/api/thing");
    expect(res.status).toBe(500);
    expect(res.body.error.message).toBe("GET /thing → 200: items.0.secret is not declared in the response schema");
  });

  it("refuses a JSON answer whose status is declared without a schema, or not declared at all", async () => {
    const bare = await request(appWith({ id: "a" }, true, { 200: { description: "something" } }).app).get("/api/thing");
    expect(bare.status).toBe(500);
    expect(bare.body.error).toEqual({ code: "response_schema_mismatch", message: "GET /thing → 200: a JSON answer, but the route declares no schema for it" });
    const fileOnly = await request(appWith({ id: "a" }, true, { 200: { description: "a file", file: "text/csv" } }).app).get("/api/thing");
    expect(fileOnly.status).toBe(500);
    const other = await request(appWith({ id: "a" }, true, { 201: { description: "made", schema: z.object({ id: z.string() }) } }).app).get("/api/thing");
    expect(other.body.error.message).toBe("GET /thing → 200: the route declares no answer with this status");
  });

  it("sends the answer unchecked when checking is off (production)", async () => {
    const res = await request(appWith({ id: 1 }, false).app).get("/api/thing");
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ id: 1 });
  });

  it("records what each route declares in the route table", () => {
    expect(appWith({}).kit.routes).toEqual([{ method: "GET", path: "/thing", access: "public", responses: { 200: "json" } }]);
  });
});
