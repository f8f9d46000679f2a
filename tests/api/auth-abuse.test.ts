// Anonymous requests cannot exhaust the CPU: tokens are checked before any password is
// hashed, bcrypt runs in worker threads (the event loop stays free), and every public
// route that does work is rate-limited per client and per e-mail address or token.
import crypto from "node:crypto";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import request from "supertest";
import bcrypt from "bcryptjs";
import { makeKit, makeProgram, type TestKit } from "./helpers";

// Counts calls of hashPassword made by the routes (the real function still runs).
const hashCalls = vi.hoisted(() => ({ n: 0 }));
vi.mock("../../server/auth/passwords", async (importOriginal) => {
  const real = await importOriginal<typeof import("../../server/auth/passwords")>();
  return {
    ...real,
    hashPassword: (password: string, rounds: number) => {
      hashCalls.n++;
      return real.hashPassword(password, rounds);
    },
  };
});
const { hashPassword } = await import("../../server/auth/passwords");

let kit: TestKit;
beforeAll(async () => {
  kit = makeKit();
  await makeProgram(kit.db);
});
afterAll(() => kit.close());

const badToken = () => crypto.randomBytes(32).toString("base64url");

describe("anonymous password work", () => {
  it("answers 16 parallel bad-token resets and accepts with 400/404 without hashing a password", async () => {
    hashCalls.n = 0;
    const calls = Array.from({ length: 16 }, (_, i) =>
      i % 2
        ? request(kit.app).post("/api/auth/password/reset").send({ token: badToken(), password: "long-enough-password" })
        : request(kit.app).post("/api/auth/invitations/accept").send({ token: badToken(), name: "A Person", password: "long-enough-password" }),
    );
    const answers = await Promise.all(calls);
    expect(answers.map((r) => r.status).sort()).toEqual([...Array(8).fill(400), ...Array(8).fill(404)]);
    expect(answers.find((r) => r.status === 400)!.body.error.code).toBe("invalid_token");
    expect(hashCalls.n).toBe(0);
  });

  it("keeps /api/health answering while 8 bcrypt hashes of cost 12 run, none of them on the event loop", async () => {
    const onMainThread = vi.spyOn(bcrypt, "hash");
    let hashesDone = 0;
    const hashes = Array.from({ length: 8 }, () => hashPassword("a-password-to-hash", 12).then((h) => (hashesDone++, h)));
    const health = await request(kit.app).get("/api/health");
    const doneWhenHealthAnswered = hashesDone;
    const results = await Promise.all(hashes);
    expect(health.status).toBe(200);
    expect(doneWhenHealthAnswered).toBeLessThan(8);
    // Cost 12 as in "$2b$12$…" (the modular crypt format bcrypt hashes carry).
    for (const h of results) expect(h).toMatch(/^\$2[aby]\$12\$/);
    expect(onMainThread).not.toHaveBeenCalled();
    onMainThread.mockRestore();
  });
});

describe("rate limits of public routes", () => {
  it("limits one client across the reset and invitation routes, with the JSON error shape", async () => {
    const limited = makeKit({ ANON_RATE_MAX_PER_CLIENT: "3" });
    try {
      const statuses = [];
      statuses.push((await request(limited.app).post("/api/auth/password/forgot").send({ email: "someone@test.example" })).status);
      statuses.push((await request(limited.app).get(`/api/auth/invitations/${badToken()}`)).status);
      statuses.push((await request(limited.app).post("/api/auth/password/reset").send({ token: badToken(), password: "long-enough-password" })).status);
      expect(statuses).toEqual([202, 404, 400]);
      const blocked = await request(limited.app)
        .post("/api/auth/invitations/accept")
        .send({ token: badToken(), name: "A Person", password: "long-enough-password" });
      expect(blocked.status).toBe(429);
      expect(blocked.body.error).toMatchObject({ code: "rate_limited", message: expect.any(String) });
      // Health stays outside the limits.
      expect((await request(limited.app).get("/api/health")).status).toBe(200);
    } finally {
      await limited.close();
    }
  });

  it("limits one token and one e-mail address across clients", async () => {
    const limited = makeKit({ ANON_RATE_MAX_PER_KEY: "2", TRUST_PROXY: "true" });
    try {
      const token = badToken();
      const from = (n: number) => ({ "X-Forwarded-For": `198.51.100.${n}` }); // TEST-NET-2, RFC 5737
      for (const n of [1, 2]) expect((await request(limited.app).get(`/api/auth/invitations/${token}`).set(from(n))).status).toBe(404);
      expect((await request(limited.app).get(`/api/auth/invitations/${token}`).set(from(3))).status).toBe(429);
      expect((await request(limited.app).post("/api/auth/password/reset").set(from(4)).send({ token, password: "long-enough-password" })).status).toBe(429);
      expect((await request(limited.app).get(`/api/auth/invitations/${badToken()}`).set(from(3))).status).toBe(404);

      const email = "target@test.example";
      for (const n of [5, 6]) expect((await request(limited.app).post("/api/auth/password/forgot").set(from(n)).send({ email })).status).toBe(202);
      expect((await request(limited.app).post("/api/auth/password/forgot").set(from(7)).send({ email })).status).toBe(429);
    } finally {
      await limited.close();
    }
  });
});
