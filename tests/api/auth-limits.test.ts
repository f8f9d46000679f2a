// The sign-in limiter counts failures only, per account and client, per account over all
// clients, and per client over all accounts; each answers 429 with the JSON error shape.
import { describe, expect, it } from "vitest";
import request from "supertest";
import { login, makeKit, makeMember, makeProgram, TEST_PASSWORD, type TestKit } from "./helpers";

// Client addresses from TEST-NET-3 (RFC 5737), sent through a trusted proxy header.
const from = (kit: TestKit, n: number, email: string, password = TEST_PASSWORD) =>
  request(kit.app).post("/api/auth/login").set("X-Forwarded-For", `203.0.113.${n}`).send({ email, password });

async function withKit(env: Record<string, string>, fn: (kit: TestKit, programId: string) => Promise<void>) {
  const kit = makeKit(env);
  try {
    await fn(kit, (await makeProgram(kit.db)).id);
  } finally {
    await kit.close();
  }
}

describe("sign-in rate limits", () => {
  it("does not count successful sign-ins", () =>
    withKit({ LOGIN_RATE_MAX: "3" }, async (kit, programId) => {
      const m = await makeMember(kit.db, programId, ["sonographer"]);
      for (let i = 0; i < 5; i++) expect((await login(kit, m.email)).status).toBe(200);
      for (let i = 0; i < 3; i++) expect((await login(kit, m.email, "wrong-password-here")).status).toBe(401);
      const blocked = await login(kit, m.email);
      expect(blocked.status).toBe(429);
      expect(blocked.body.error.code).toBe("rate_limited");
    }));

  it("caps failures of one account across client addresses", () =>
    withKit({ LOGIN_RATE_MAX_PER_ACCOUNT: "3", TRUST_PROXY: "true" }, async (kit, programId) => {
      const m = await makeMember(kit.db, programId, ["sonographer"]);
      for (const n of [1, 2, 3]) expect((await from(kit, n, m.email, "wrong-password-here")).status).toBe(401);
      const blocked = await from(kit, 4, m.email);
      expect(blocked.status).toBe(429);
      expect(blocked.body.error).toMatchObject({ code: "rate_limited", message: expect.any(String) });
      // Other accounts are not affected.
      const other = await makeMember(kit.db, programId, ["sonographer"]);
      expect((await from(kit, 4, other.email)).status).toBe(200);
    }));

  it("caps failures of one client address across accounts", () =>
    withKit({ LOGIN_RATE_MAX_PER_CLIENT: "3", TRUST_PROXY: "true" }, async (kit, programId) => {
      const people = await Promise.all([1, 2, 3, 4].map(() => makeMember(kit.db, programId, ["sonographer"])));
      for (const p of people.slice(0, 3)) expect((await from(kit, 9, p.email, "wrong-password-here")).status).toBe(401);
      const blocked = await from(kit, 9, people[3].email);
      expect(blocked.status).toBe(429);
      expect(blocked.body.error.code).toBe("rate_limited");
      // Another client signs in to the same account.
      expect((await from(kit, 10, people[3].email)).status).toBe(200);
    }));
});
