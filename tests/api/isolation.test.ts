// Every query is scoped to the caller's program: another program's people, invitations,
// catalogue and audit entries are invisible (404 when named directly).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { makeKit, makeMember, makeProgram, tokenFor, type TestKit, type TestMember } from "./helpers";
import { newEmailToken } from "../../server/auth/tokens";

let kit: TestKit;
let adminA: TestMember;
let leadA: TestMember;
let memberB: TestMember;
let invitationB: string;
let programB: string;
beforeAll(async () => {
  kit = makeKit();
  const a = await makeProgram(kit.db, "Isolation A");
  const b = await makeProgram(kit.db, "Isolation B");
  programB = b.id;
  adminA = await makeMember(kit.db, a.id, ["admin"]);
  leadA = await makeMember(kit.db, a.id, ["qa_lead"]);
  memberB = await makeMember(kit.db, b.id, ["sonographer"]);
  await makeMember(kit.db, b.id, ["admin"]);
  const [inv] = await kit
    .db("invitations")
    .insert({
      program_id: b.id,
      email: "someone-b@test.example",
      roles: ["reviewer"],
      token_hash: newEmailToken().hash,
      expires_at: new Date(Date.now() + 3600_000),
    })
    .returning("id");
  invitationB = inv.id;
  await kit.db("audit_log").insert({ program_id: b.id, action: "test.only_in_b" });
});
afterAll(() => kit.close());

const as = async (m: TestMember) => `Bearer ${await tokenFor(kit, m)}`;

describe("cross-program isolation", () => {
  it("answers 404 when an admin names another program's member", async () => {
    const auth = await as(adminA);
    for (const [method, path, body] of [
      ["put", `/api/users/${memberB.id}/roles`, { roles: ["admin"] }],
      ["post", `/api/users/${memberB.id}/deactivate`, undefined],
      ["post", `/api/users/${memberB.id}/reactivate`, undefined],
    ] as const) {
      const res = await request(kit.app)[method](path).set("Authorization", auth).send(body);
      expect(res.status, path).toBe(404);
    }
    const row = await kit.db("memberships").where({ user_id: memberB.id, program_id: programB }).first();
    expect(row.roles).toEqual(["sonographer"]);
    expect(row.deactivated_at).toBeNull();
  });

  it("answers 404 for another program's invitation and leaves it open", async () => {
    const res = await request(kit.app)
      .delete(`/api/users/invitations/${invitationB}`)
      .set("Authorization", await as(adminA));
    expect(res.status).toBe(404);
    expect((await kit.db("invitations").where("id", invitationB).first()).revoked_at).toBeNull();
  });

  it("lists only the caller's program's members, invitations and audit entries", async () => {
    const auth = await as(adminA);
    const users = await request(kit.app).get("/api/users").set("Authorization", auth);
    expect(users.body.members.map((m: { id: string }) => m.id).sort()).toEqual([adminA.id, leadA.id].sort());
    const invs = await request(kit.app).get("/api/users/invitations").set("Authorization", auth);
    expect(invs.body.invitations).toEqual([]);
    const auditRes = await request(kit.app).get("/api/audit?limit=200").set("Authorization", auth);
    expect(auditRes.body.entries.map((e: { action: string }) => e.action)).not.toContain("test.only_in_b");
  });

  it("serves each program its own catalogue", async () => {
    const apps = await request(kit.app)
      .get("/api/applications")
      .set("Authorization", await as(leadA));
    const ids = apps.body.applications.map((a: { id: string }) => a.id);
    const bIds = (await kit.db("applications").where("program_id", programB).select("id")).map((r) => r.id);
    expect(ids.length).toBeGreaterThan(0);
    expect(ids.filter((id: string) => bIds.includes(id))).toEqual([]);
  });

  it("binds a token to one program even when the person belongs to two", async () => {
    const both = await makeMember(kit.db, adminA.programId, ["sonographer"]);
    await makeMember(kit.db, programB, ["admin"], { userId: both.id });
    const res = await request(kit.app)
      .get("/api/users")
      .set("Authorization", await as(both));
    expect(res.status).toBe(403);
  });
});
