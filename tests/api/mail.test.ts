// Invitation and password-reset e-mails, received over SMTP by the fake mail server
// (maildev) that scripts/test-run.ts starts, and the one-time links inside them.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import crypto from "node:crypto";
import { linkToken, login, mailsFor, makeKit, makeMember, makeProgram, tokenFor, waitForMail, type TestKit } from "./helpers";

let kit: TestKit;
let programId: string;
let programName: string;
beforeAll(async () => {
  kit = makeKit({ LOGIN_RATE_MAX: "1000" });
  ({ id: programId, name: programName } = await makeProgram(kit.db));
});
afterAll(() => kit.close());

const address = () => `mail-${crypto.randomBytes(4).toString("hex")}@test.example`;

describe("invitations", () => {
  it("sends a one-time link that sets the password and joins the program with the roles given", async () => {
    const admin = await makeMember(kit.db, programId, ["admin"]);
    const email = address();
    const res = await request(kit.app)
      .post("/api/users/invitations")
      .set("Authorization", `Bearer ${await tokenFor(kit, admin)}`)
      .send({ email, roles: ["reviewer", "qa_lead"] });
    expect(res.status).toBe(201);
    const mail = await waitForMail(email, "invited");
    expect(mail.subject).toContain(programName);
    expect(mail.text).toContain("Reviewer, QA lead");
    const token = linkToken(mail);
    // Only a hash of the token is stored.
    expect(await kit.db("invitations").where("token_hash", token).first()).toBeUndefined();

    const preview = await request(kit.app).get(`/api/auth/invitations/${token}`);
    expect(preview.body).toEqual({ email, programName, roles: ["reviewer", "qa_lead"], existingUser: false, name: null });

    const short = await request(kit.app).post("/api/auth/invitations/accept").send({ token, name: "Wren Alder", password: "too-short" });
    expect(short.status).toBe(400);
    expect(short.body.error.message).toMatch(/^password:/);

    const accept = await request(kit.app).post("/api/auth/invitations/accept").send({ token, name: "Wren Alder", password: "a-long-enough-secret" });
    expect(accept.status).toBe(200);
    expect(accept.body.user).toMatchObject({ email, name: "Wren Alder", programId, roles: ["reviewer", "qa_lead"] });
    expect((await login(kit, email, "a-long-enough-secret")).status).toBe(200);

    const again = await request(kit.app).post("/api/auth/invitations/accept").send({ token, name: "Someone Else", password: "another-long-secret" });
    expect(again.status).toBe(404);
  });

  it("refuses an expired or revoked invitation", async () => {
    const admin = await makeMember(kit.db, programId, ["admin"]);
    const auth = `Bearer ${await tokenFor(kit, admin)}`;
    const email = address();
    const created = await request(kit.app)
      .post("/api/users/invitations")
      .set("Authorization", auth)
      .send({ email, roles: ["sonographer"] });
    const token = linkToken(await waitForMail(email, "invited"));
    await kit
      .db("invitations")
      .where("id", created.body.invitation.id)
      .update({ expires_at: kit.db.raw("now() - interval '1 minute'") });
    expect((await request(kit.app).get(`/api/auth/invitations/${token}`)).status).toBe(404);

    const email2 = address();
    const c2 = await request(kit.app)
      .post("/api/users/invitations")
      .set("Authorization", auth)
      .send({ email: email2, roles: ["sonographer"] });
    const token2 = linkToken(await waitForMail(email2, "invited"));
    expect((await request(kit.app).delete(`/api/users/invitations/${c2.body.invitation.id}`).set("Authorization", auth)).status).toBe(204);
    const accept = await request(kit.app).post("/api/auth/invitations/accept").send({ token: token2, name: "Late Comer", password: "a-long-enough-secret" });
    expect(accept.status).toBe(404);
  });

  it("asks an existing account for its own password before joining another program", async () => {
    const other = await makeProgram(kit.db);
    const admin = await makeMember(kit.db, other.id, ["admin"]);
    const existing = await makeMember(kit.db, programId, ["sonographer"]);
    await request(kit.app)
      .post("/api/users/invitations")
      .set("Authorization", `Bearer ${await tokenFor(kit, admin)}`)
      .send({ email: existing.email, roles: ["reviewer"] });
    const token = linkToken(await waitForMail(existing.email, "invited"));
    expect((await request(kit.app).get(`/api/auth/invitations/${token}`)).body.existingUser).toBe(true);
    const wrong = await request(kit.app).post("/api/auth/invitations/accept").send({ token, name: "X", password: "not-my-password-at-all" });
    expect(wrong.status).toBe(400);
    const right = await request(kit.app).post("/api/auth/invitations/accept").send({ token, name: "X", password: existing.password });
    expect(right.status).toBe(200);
    expect(right.body.user).toMatchObject({ id: existing.id, programId: other.id, roles: ["reviewer"] });
  });
});

describe("password reset", () => {
  it("e-mails a one-time link; the new password works, the old one and every session stop", async () => {
    const m = await makeMember(kit.db, programId, ["sonographer"]);
    const oldToken = (await login(kit, m.email)).body.token;
    const res = await request(kit.app).post("/api/auth/password/forgot").send({ email: m.email });
    expect(res.status).toBe(202);
    const token = linkToken(await waitForMail(m.email, "Reset"));
    const reset = await request(kit.app).post("/api/auth/password/reset").send({ token, password: "fresh-password-2026" });
    expect(reset.status).toBe(204);
    expect((await request(kit.app).get("/api/auth/me").set("Authorization", `Bearer ${oldToken}`)).status).toBe(401);
    expect((await login(kit, m.email)).status).toBe(401);
    expect((await login(kit, m.email, "fresh-password-2026")).status).toBe(200);
    const reuse = await request(kit.app).post("/api/auth/password/reset").send({ token, password: "another-password-2026" });
    expect(reuse.status).toBe(400);
    expect(reuse.body.error.code).toBe("invalid_token");
  });

  it("refuses an expired reset link", async () => {
    const m = await makeMember(kit.db, programId, ["sonographer"]);
    await request(kit.app).post("/api/auth/password/forgot").send({ email: m.email });
    const token = linkToken(await waitForMail(m.email, "Reset"));
    await kit
      .db("password_resets")
      .where("user_id", m.id)
      .update({ expires_at: kit.db.raw("now() - interval '1 minute'") });
    const res = await request(kit.app).post("/api/auth/password/reset").send({ token, password: "fresh-password-2026" });
    expect(res.status).toBe(400);
    expect((await login(kit, m.email)).status).toBe(200);
  });

  it("answers 202 for an unknown address and sends nothing", async () => {
    const email = address();
    expect((await request(kit.app).post("/api/auth/password/forgot").send({ email })).status).toBe(202);
    await new Promise((r) => setTimeout(r, 500));
    expect(await mailsFor(email)).toEqual([]);
  });
});
