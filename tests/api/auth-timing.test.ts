// Sign-in and forgot-password answer alike for real and unknown accounts: every stored hash
// ends at the configured cost, and forgot-password answers before any lookup or write.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { login, makeKit, makeMember, makeProgram, type TestKit } from "./helpers";
import { hashCost } from "../../server/auth/passwords";

let kit: TestKit;
let programId: string;
beforeAll(async () => {
  kit = makeKit({ BCRYPT_ROUNDS: "5" });
  programId = (await makeProgram(kit.db)).id;
});
afterAll(() => kit.close());

const storedHash = async (id: string): Promise<string> => (await kit.db("users").where("id", id).first("password_hash")).password_hash;

describe("sign-in timing", () => {
  it("re-hashes a password stored at another cost at the configured cost on a successful sign-in", async () => {
    const m = await makeMember(kit.db, programId, ["sonographer"]); // stored at cost 4
    expect(hashCost(await storedHash(m.id))).toBe(4);
    expect((await login(kit, m.email, "not-the-password-at-all")).status).toBe(401);
    expect(hashCost(await storedHash(m.id))).toBe(4); // a wrong password changes nothing
    expect((await login(kit, m.email)).status).toBe(200);
    expect(hashCost(await storedHash(m.id))).toBe(kit.config.bcryptRounds);
    expect((await login(kit, m.email)).status).toBe(200);
  });
});

describe("forgot-password timing", () => {
  it("answers a real address before the reset link is written or mailed", async () => {
    const m = await makeMember(kit.db, programId, ["sonographer"]);
    // Hold the table (reads still pass) so that writing the reset link (and so queueing its mail) must wait.
    const blocker = await kit.db.transaction();
    await blocker.raw("LOCK TABLE password_resets IN EXCLUSIVE MODE");
    let answer: request.Response | "still waiting";
    try {
      const call = request(kit.app).post("/api/auth/password/forgot").send({ email: m.email });
      answer = await Promise.race([call.then((r) => r), new Promise<"still waiting">((r) => setTimeout(() => r("still waiting"), 8000))]);
      expect(await kit.db("password_resets").where("user_id", m.id).first()).toBeUndefined();
    } finally {
      await blocker.commit();
    }
    expect(answer).not.toBe("still waiting");
    expect((answer as request.Response).status).toBe(202);
    // Once the table is free, the link is written after all.
    for (let i = 0; i < 100 && !(await kit.db("password_resets").where("user_id", m.id).first()); i++) await new Promise((r) => setTimeout(r, 50));
    expect(await kit.db("password_resets").where("user_id", m.id).first()).toBeDefined();
  });
});
