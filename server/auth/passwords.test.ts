// Password hashing in the worker pool: bcrypt's cost is read back from the hash itself
// ("$2b$NN$…", the modular crypt format of bcrypt), and the dummy hash used for unknown
// addresses has the configured cost, so unknown and known accounts cost the same to check.
import { afterAll, describe, expect, it } from "vitest";
import bcrypt from "bcryptjs";
import { closePasswordPool, hashCost, hashPassword, timingDummyHash, verifyPassword } from "./passwords";

afterAll(() => closePasswordPool());

describe("passwords", () => {
  it("hashes in the pool so that the reference library verifies it, at the cost asked for", async () => {
    const h = await hashPassword("a-password-for-the-pool", 5);
    expect(h).toMatch(/^\$2b\$05\$/);
    expect(hashCost(h)).toBe(5);
    expect(bcrypt.compareSync("a-password-for-the-pool", h)).toBe(true);
    expect(await verifyPassword("a-password-for-the-pool", h, 5)).toBe(true);
    expect(await verifyPassword("another-password", h, 5)).toBe(false);
  });

  it("checks an unknown address against a dummy hash of the configured cost, whatever cost came first", async () => {
    expect(await verifyPassword("anything-at-all", null, 4)).toBe(false);
    expect(hashCost(await timingDummyHash(4))).toBe(4);
    expect(await verifyPassword("anything-at-all", undefined, 6)).toBe(false);
    expect(hashCost(await timingDummyHash(6))).toBe(6);
  });
});
