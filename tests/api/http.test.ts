// How the API answers bad requests: always JSON { error: { code, message } }.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { makeKit, makeMember, makeProgram, tokenFor, type TestKit } from "./helpers";

let kit: TestKit;
beforeAll(() => {
  kit = makeKit({ JSON_BODY_LIMIT: "2kb" });
});
afterAll(() => kit.close());

describe("bad input", () => {
  it("answers 400 invalid_json for a malformed body", async () => {
    const res = await request(kit.app).post("/api/auth/login").set("Content-Type", "application/json").send('{"email": "a@b.example",');
    expect(res.status).toBe(400);
    expect(res.body.error).toMatchObject({ code: "invalid_json" });
  });

  it("answers 404 route_not_found as JSON for an unknown API route", async () => {
    const res = await request(kit.app).get("/api/no-such-thing");
    expect(res.status).toBe(404);
    expect(res.type).toBe("application/json");
    expect(res.body.error.code).toBe("route_not_found");
    expect(res.body.error.message).toContain("/api/no-such-thing");
  });

  it("answers 413 payload_too_large for an oversized body", async () => {
    const res = await request(kit.app)
      .post("/api/auth/login")
      .send({ email: "a@b.example", password: "x".repeat(4000) });
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe("payload_too_large");
  });

  it("answers 415 when the body is not JSON", async () => {
    const res = await request(kit.app).post("/api/auth/login").set("Content-Type", "text/plain").send("email=a@b.example");
    expect(res.status).toBe(415);
    expect(res.body.error.code).toBe("unsupported_media_type");
  });

  it("names the missing field", async () => {
    const res = await request(kit.app).post("/api/auth/login").send({ email: "someone@test.example" });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/^password:/);
  });
});

describe("GET /api/openapi.json", () => {
  it("documents every API route, generated from the zod schemas", async () => {
    const res = await request(kit.app).get("/api/openapi.json");
    expect(res.status).toBe(200);
    expect(res.body.openapi).toMatch(/^3\.1/);
    const documented = Object.entries(res.body.paths as Record<string, Record<string, unknown>>).flatMap(([p, ops]) =>
      Object.keys(ops).map((m) => `${m.toUpperCase()} ${p}`),
    );
    for (const r of kit.routes.filter((r) => r.path !== "/openapi.json")) {
      expect(documented).toContain(`${r.method} /api${r.path.replace(/:([A-Za-z_]+)/g, "{$1}")}`);
    }
    const login = res.body.paths["/api/auth/login"].post;
    expect(login.requestBody.content["application/json"].schema.properties.email).toBeDefined();
  });
});

describe("a POST without a body", () => {
  // RFC 9110 section 8.3: Content-Type describes content; a request without content has no
  // media type to refuse, so it is validated as an empty object.
  it("names the first missing field when the route needs a body", async () => {
    const res = await request(kit.app).post("/api/auth/login");
    expect(res.status, JSON.stringify(res.body)).toBe(400);
    expect(res.body.error.code).toBe("validation_failed");
    expect(res.body.error.message).toMatch(/^email:/);
  });

  it("succeeds where the body is optional", async () => {
    const program = (await makeProgram(kit.db)).id;
    const reviewer = await makeMember(kit.db, program, ["reviewer"]);
    const auth = `Bearer ${await tokenFor(kit, reviewer)}`;
    const res = await request(kit.app).post("/api/queue/next").set("Authorization", auth).set("Content-Length", "0");
    expect(res.status, JSON.stringify(res.body)).toBe(204);
    const read = await request(kit.app).post("/api/notifications/read").set("Authorization", auth);
    expect(read.status, JSON.stringify(read.body)).toBe(204);
  });

  it("still answers 415 for an empty body labelled with another type", async () => {
    const res = await request(kit.app).post("/api/auth/login").set("Content-Type", "text/plain");
    expect(res.status).toBe(415);
  });
});
