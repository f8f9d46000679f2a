// Session ids never reach an API response: with the signing key, a session id is a token.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { login, makeKit, makeMember, makeProgram, type TestKit } from "./helpers";

let kit: TestKit;
let programId: string;
beforeAll(async () => {
  kit = makeKit();
  programId = (await makeProgram(kit.db)).id;
});
afterAll(() => kit.close());

describe("session ids", () => {
  it("appear nowhere in the audit log, /auth/me or /auth/programs, for new and old rows", async () => {
    const admin = await makeMember(kit.db, programId, ["admin"]);
    const m = await makeMember(kit.db, programId, ["sonographer"]);
    const other = await makeProgram(kit.db);
    await makeMember(kit.db, other.id, ["reviewer"], { userId: m.id });
    const adminToken = (await login(kit, admin.email)).body.token;
    const first = (await login(kit, m.email)).body.token;
    const switched = await request(kit.app).post("/api/auth/switch-program").set("Authorization", `Bearer ${first}`).send({ programId: other.id });
    expect(switched.status).toBe(200);
    const again = (await login(kit, m.email)).body.token;
    expect((await request(kit.app).post("/api/auth/logout").set("Authorization", `Bearer ${again}`)).status).toBe(204);
    expect((await login(kit, m.email, "not-the-password-at-all")).status).toBe(401);

    const sessionIds: string[] = await kit.db("sessions").whereIn("user_id", [admin.id, m.id]).pluck("id");
    expect(sessionIds.length).toBeGreaterThanOrEqual(4);
    // A row as written before session ids were kept out of the log.
    await kit.db("audit_log").insert({
      program_id: programId,
      actor_user_id: m.id,
      action: "auth.signed_in",
      entity_type: "session",
      entity_id: sessionIds[0],
      details: JSON.stringify({ sessionId: sessionIds[1], nested: { sid: sessionIds[2] }, kept: "yes" }),
    });

    const auth = `Bearer ${adminToken}`;
    const auditRes = await request(kit.app).get("/api/audit?limit=200").set("Authorization", auth);
    expect(auditRes.status).toBe(200);
    expect(auditRes.body.entries.map((e: { action: string }) => e.action)).toEqual(expect.arrayContaining(["auth.signed_in", "auth.signed_out"]));
    expect(auditRes.body.entries.some((e: { details: { kept?: string } | null }) => e.details?.kept === "yes")).toBe(true);
    const bodies = [
      auditRes.text,
      (await request(kit.app).get("/api/auth/me").set("Authorization", auth)).text,
      (await request(kit.app).get("/api/auth/programs").set("Authorization", auth)).text,
      switched.text.replace(switched.body.token, ""),
    ];
    for (const body of bodies) for (const sid of sessionIds) expect(body).not.toContain(sid);

    // Stored rows written now hold no session id either.
    const stored = JSON.stringify(await kit.db("audit_log").whereIn("actor_user_id", [admin.id, m.id]).whereNot("entity_type", "session"));
    for (const sid of sessionIds) expect(stored).not.toContain(sid);
  });
});
