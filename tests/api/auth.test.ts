// Sign-in, sessions and token revocation.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import jwt from "jsonwebtoken";
import { login, makeKit, makeMember, makeProgram, tokenFor, type TestKit } from "./helpers";
import { JWT_ISSUER } from "../../server/auth/tokens";

let kit: TestKit;
let programId: string;
beforeAll(async () => {
  kit = makeKit();
  programId = (await makeProgram(kit.db)).id;
});
afterAll(() => kit.close());

const me = (token: string) => request(kit.app).get("/api/auth/me").set("Authorization", `Bearer ${token}`);

describe("POST /api/auth/login", () => {
  it("signs in and returns the token, the user and an httpOnly SameSite=Strict cookie", async () => {
    const m = await makeMember(kit.db, programId, ["sonographer", "reviewer"]);
    const res = await login(kit, m.email.toUpperCase());
    expect(res.status).toBe(200);
    expect(res.body.user).toMatchObject({ id: m.id, email: m.email, programId, roles: ["sonographer", "reviewer"] });
    expect(typeof res.body.token).toBe("string");
    const cookie = String(res.headers["set-cookie"]);
    expect(cookie).toMatch(/^soundings_session=/);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Strict/i);
    expect(cookie).toMatch(/Path=\//);
    expect(cookie).not.toMatch(/Secure/); // test and development run over plain http on loopback
  });

  it("accepts the Bearer token and the cookie on GET /api/auth/me", async () => {
    const m = await makeMember(kit.db, programId, ["reviewer"]);
    const res = await login(kit, m.email);
    expect((await me(res.body.token)).body.user.id).toBe(m.id);
    const byCookie = await request(kit.app).get("/api/auth/me").set("Cookie", String(res.headers["set-cookie"]).split(";")[0]);
    expect(byCookie.status).toBe(200);
    expect(byCookie.body.user.email).toBe(m.email);
  });

  it("answers the same 401 for an unknown e-mail and a wrong password", async () => {
    const m = await makeMember(kit.db, programId, ["sonographer"]);
    const wrong = await login(kit, m.email, "not-the-password-at-all");
    const unknown = await login(kit, "nobody-here@test.example", "not-the-password-at-all");
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body).toEqual(unknown.body);
    expect(wrong.body.error.code).toBe("invalid_credentials");
  });

  it("refuses a deactivated member with the same 401", async () => {
    const m = await makeMember(kit.db, programId, ["sonographer"]);
    await kit.db("memberships").where({ user_id: m.id }).update({ deactivated_at: new Date() });
    const res = await login(kit, m.email);
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe("invalid_credentials");
  });

  it("names the field in a validation error", async () => {
    const res = await request(kit.app).post("/api/auth/login").send({ email: "not-an-address", password: "x" });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("validation_failed");
    expect(res.body.error.message).toMatch(/^email:/);
    expect(res.body.error.details[0].path).toBe("email");
  });

  it("rate-limits repeated failures with 429, even once the right password is sent", async () => {
    const limited = makeKit({ LOGIN_RATE_MAX: "3" });
    try {
      const m = await makeMember(limited.db, programId, ["sonographer"]);
      for (let i = 0; i < 3; i++) expect((await login(limited, m.email, "wrong-password-here")).status).toBe(401);
      const blocked = await login(limited, m.email);
      expect(blocked.status).toBe(429);
      expect(blocked.body.error.code).toBe("rate_limited");
      // Another address from the same client is counted on its own.
      const other = await makeMember(limited.db, programId, ["sonographer"]);
      expect((await login(limited, other.email)).status).toBe(200);
    } finally {
      await limited.close();
    }
  });

  it("lists a person's programs and moves the session to another one, ending the old token", async () => {
    const m = await makeMember(kit.db, programId, ["sonographer"]);
    const other = await makeProgram(kit.db);
    await makeMember(kit.db, other.id, ["qa_lead"], { userId: m.id });
    const first = (await login(kit, m.email)).body.token;
    const list = await request(kit.app).get("/api/auth/programs").set("Authorization", `Bearer ${first}`);
    expect(list.body.programs).toEqual([
      { id: programId, name: expect.any(String), roles: ["sonographer"], current: true },
      { id: other.id, name: other.name, roles: ["qa_lead"], current: false },
    ]);
    const sw = await request(kit.app).post("/api/auth/switch-program").set("Authorization", `Bearer ${first}`).send({ programId: other.id });
    expect(sw.status).toBe(200);
    expect(sw.body.user).toMatchObject({ programId: other.id, roles: ["qa_lead"] });
    expect((await me(first)).status).toBe(401);
    expect((await me(sw.body.token)).body.user.programId).toBe(other.id);
  });

  it("picks the requested program for a person in two programs", async () => {
    const m = await makeMember(kit.db, programId, ["sonographer"]);
    const other = await makeProgram(kit.db);
    await makeMember(kit.db, other.id, ["reviewer"], { userId: m.id });
    const res = await request(kit.app).post("/api/auth/login").send({ email: m.email, password: m.password, programId: other.id });
    expect(res.status).toBe(200);
    expect(res.body.user).toMatchObject({ programId: other.id, roles: ["reviewer"] });
  });
});

describe("tokens", () => {
  it("rejects a tampered token with 401", async () => {
    const m = await makeMember(kit.db, programId, ["sonographer"]);
    const token = await tokenFor(kit, m);
    const [h, p, s] = token.split(".");
    const payload = JSON.parse(Buffer.from(p, "base64url").toString());
    const forgedPayload = Buffer.from(JSON.stringify({ ...payload, sub: "00000000-0000-4000-8000-000000000000" })).toString("base64url");
    expect((await me(`${h}.${forgedPayload}.${s}`)).status).toBe(401);
    const flipped = s.slice(0, -2) + (s.at(-2) === "A" ? "B" : "A") + s.at(-1);
    expect((await me(`${h}.${p}.${flipped}`)).status).toBe(401);
    const otherSecret = jwt.sign(payload, "some-other-secret-of-enough-length", { algorithm: "HS256" });
    expect((await me(otherSecret)).status).toBe(401);
    const none = `${Buffer.from('{"alg":"none","typ":"JWT"}').toString("base64url")}.${p}.`;
    expect((await me(none)).status).toBe(401);
  });

  it("rejects an expired token with 401 session_expired", async () => {
    const m = await makeMember(kit.db, programId, ["sonographer"]);
    const valid = await tokenFor(kit, m);
    const claims = jwt.decode(valid) as { sub: string; sid: string; pid: string };
    const expired = jwt.sign({ sub: claims.sub, sid: claims.sid, pid: claims.pid, exp: Math.floor(Date.now() / 1000) - 60 }, kit.config.jwtSecret, {
      issuer: JWT_ISSUER,
    });
    const res = await me(expired);
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe("session_expired");
  });

  it("stops working after logout", async () => {
    const m = await makeMember(kit.db, programId, ["sonographer"]);
    const { body } = await login(kit, m.email);
    expect((await me(body.token)).status).toBe(200);
    const out = await request(kit.app).post("/api/auth/logout").set("Authorization", `Bearer ${body.token}`);
    expect(out.status).toBe(204);
    expect(String(out.headers["set-cookie"])).toMatch(/soundings_session=;/);
    expect((await me(body.token)).status).toBe(401);
  });

  it("stops working after a password change, except for the session that changed it", async () => {
    const m = await makeMember(kit.db, programId, ["sonographer"]);
    const a = (await login(kit, m.email)).body.token;
    const b = (await login(kit, m.email)).body.token;
    const change = await request(kit.app)
      .post("/api/auth/password/change")
      .set("Authorization", `Bearer ${a}`)
      .send({ currentPassword: m.password, newPassword: "a-brand-new-passphrase" });
    expect(change.status).toBe(204);
    expect((await me(a)).status).toBe(200);
    expect((await me(b)).status).toBe(401);
    expect((await login(kit, m.email)).status).toBe(401);
    expect((await login(kit, m.email, "a-brand-new-passphrase")).status).toBe(200);
  });

  it("refuses a new password shorter than 12 characters, naming the field", async () => {
    const m = await makeMember(kit.db, programId, ["sonographer"]);
    const t = await tokenFor(kit, m);
    const res = await request(kit.app)
      .post("/api/auth/password/change")
      .set("Authorization", `Bearer ${t}`)
      .send({ currentPassword: m.password, newPassword: "short-11chr" });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/^newPassword: .*12/);
  });

  it("refuses a wrong current password", async () => {
    const m = await makeMember(kit.db, programId, ["sonographer"]);
    const t = await tokenFor(kit, m);
    const res = await request(kit.app)
      .post("/api/auth/password/change")
      .set("Authorization", `Bearer ${t}`)
      .send({ currentPassword: "not-my-password", newPassword: "a-brand-new-passphrase" });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("wrong_password");
  });

  it("stops working after a role is removed, and answers with the new roles after re-sign-in", async () => {
    const admin = await makeMember(kit.db, programId, ["admin"]);
    const m = await makeMember(kit.db, programId, ["sonographer", "reviewer"]);
    const t = await tokenFor(kit, m);
    const res = await request(kit.app)
      .put(`/api/users/${m.id}/roles`)
      .set("Authorization", `Bearer ${await tokenFor(kit, admin)}`)
      .send({ roles: ["sonographer"] });
    expect(res.status).toBe(200);
    expect((await me(t)).status).toBe(401);
    expect((await login(kit, m.email)).body.user.roles).toEqual(["sonographer"]);
  });

  it("keeps the token when a role is only added", async () => {
    const admin = await makeMember(kit.db, programId, ["admin"]);
    const m = await makeMember(kit.db, programId, ["sonographer"]);
    const t = await tokenFor(kit, m);
    await request(kit.app)
      .put(`/api/users/${m.id}/roles`)
      .set("Authorization", `Bearer ${await tokenFor(kit, admin)}`)
      .send({ roles: ["sonographer", "reviewer"] });
    expect((await me(t)).body.user.roles).toEqual(["sonographer", "reviewer"]);
  });

  it("stops working after deactivation", async () => {
    const admin = await makeMember(kit.db, programId, ["admin"]);
    const m = await makeMember(kit.db, programId, ["sonographer"]);
    const t = await tokenFor(kit, m);
    const res = await request(kit.app)
      .post(`/api/users/${m.id}/deactivate`)
      .set("Authorization", `Bearer ${await tokenFor(kit, admin)}`);
    expect(res.status).toBe(200);
    expect(res.body.member.active).toBe(false);
    expect((await me(t)).status).toBe(401);
  });
});
