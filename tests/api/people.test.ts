// Setup → People rules: an admin manages roles and access, but never leaves the program
// without an administrator; everything is audited.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { makeKit, makeMember, makeProgram, tokenFor, type TestKit } from "./helpers";

let kit: TestKit;
beforeAll(() => {
  kit = makeKit();
});
afterAll(() => kit.close());

describe("people", () => {
  it("refuses to remove the last admin's admin role (409) and to let admins deactivate themselves", async () => {
    const p = await makeProgram(kit.db);
    const admin = await makeMember(kit.db, p.id, ["admin"]);
    const auth = `Bearer ${await tokenFor(kit, admin)}`;
    const demote = await request(kit.app)
      .put(`/api/users/${admin.id}/roles`)
      .set("Authorization", auth)
      .send({ roles: ["reviewer"] });
    expect(demote.status).toBe(409);
    expect(demote.body.error.code).toBe("last_admin");
    const self = await request(kit.app).post(`/api/users/${admin.id}/deactivate`).set("Authorization", auth);
    expect(self.status).toBe(409);
    // With a second admin, the first may step down.
    await makeMember(kit.db, p.id, ["admin"]);
    expect(
      (
        await request(kit.app)
          .put(`/api/users/${admin.id}/roles`)
          .set("Authorization", auth)
          .send({ roles: ["admin", "reviewer"] })
      ).status,
    ).toBe(200);
  });

  it("refuses an empty or unknown role list, naming the field", async () => {
    const p = await makeProgram(kit.db);
    const admin = await makeMember(kit.db, p.id, ["admin"]);
    const m = await makeMember(kit.db, p.id, ["sonographer"]);
    const auth = `Bearer ${await tokenFor(kit, admin)}`;
    const empty = await request(kit.app).put(`/api/users/${m.id}/roles`).set("Authorization", auth).send({ roles: [] });
    expect(empty.status).toBe(400);
    expect(empty.body.error.message).toMatch(/^roles:/);
    const unknown = await request(kit.app)
      .put(`/api/users/${m.id}/roles`)
      .set("Authorization", auth)
      .send({ roles: ["director"] });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.message).toMatch(/^roles\.0:/);
    const badId = await request(kit.app)
      .put(`/api/users/not-a-uuid/roles`)
      .set("Authorization", auth)
      .send({ roles: ["reviewer"] });
    expect(badId.status).toBe(400);
    expect(badId.body.error.message).toMatch(/^id:/);
  });

  it("writes role changes and deactivations to the audit log", async () => {
    const p = await makeProgram(kit.db);
    const admin = await makeMember(kit.db, p.id, ["admin"]);
    const m = await makeMember(kit.db, p.id, ["sonographer"]);
    const auth = `Bearer ${await tokenFor(kit, admin)}`;
    await request(kit.app)
      .put(`/api/users/${m.id}/roles`)
      .set("Authorization", auth)
      .send({ roles: ["sonographer", "reviewer"] });
    await request(kit.app).post(`/api/users/${m.id}/deactivate`).set("Authorization", auth);
    const res = await request(kit.app).get("/api/audit").set("Authorization", auth);
    const actions = res.body.entries.map((e: { action: string; entityId: string }) => `${e.action}:${e.entityId}`);
    expect(actions).toContain(`member.roles_changed:${m.id}`);
    expect(actions).toContain(`member.deactivated:${m.id}`);
    expect(res.body.entries.find((e: { action: string }) => e.action === "member.roles_changed").details).toEqual({
      from: ["sonographer"],
      to: ["sonographer", "reviewer"],
    });
  });

  it("refuses to invite someone who is already an active member (409)", async () => {
    const p = await makeProgram(kit.db);
    const admin = await makeMember(kit.db, p.id, ["admin"]);
    const m = await makeMember(kit.db, p.id, ["sonographer"]);
    const res = await request(kit.app)
      .post("/api/users/invitations")
      .set("Authorization", `Bearer ${await tokenFor(kit, admin)}`)
      .send({ email: m.email, roles: ["reviewer"] });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("already_member");
  });

  it("shows real counts on the admin home, not invented ones", async () => {
    const p = await makeProgram(kit.db);
    const admin = await makeMember(kit.db, p.id, ["admin", "qa_lead"]);
    await makeMember(kit.db, p.id, ["reviewer"]);
    await makeMember(kit.db, p.id, ["sonographer", "reviewer"]);
    const res = await request(kit.app)
      .get("/api/home")
      .set("Authorization", `Bearer ${await tokenFor(kit, admin)}`);
    const cards = Object.fromEntries(res.body.sections.flatMap((s: { cards: { key: string; count: number }[] }) => s.cards.map((c) => [c.key, c.count])));
    expect(cards).toMatchObject({ reviewers: 2, sonographers: 1, active_members: 3, open_invitations: 0, deactivated_members: 0 });
  });
});
