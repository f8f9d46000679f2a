// One-time password-reset links: stored by the hash of their token, used once, and all of a
// user's open links end together when one is used.
import type { Knex } from "knex";
import type { Db } from "../db/knex";

type Q = Db | Knex.Transaction;

export interface PasswordReset {
  user_id: string;
  used_at: Date | null;
  expires_at: Date;
}

export async function createPasswordReset(db: Q, r: { userId: string; tokenHash: string; minutes: number }): Promise<void> {
  await db("password_resets").insert({
    user_id: r.userId,
    token_hash: r.tokenHash,
    expires_at: db.raw(`now() + make_interval(mins => ?)`, [r.minutes]),
  });
}

/** The link with this token hash, or undefined; `lock` holds its row to the end of the transaction. */
export function findPasswordReset(db: Q, tokenHash: string, opts: { lock?: boolean } = {}): Promise<PasswordReset | undefined> {
  const q = db("password_resets").where("token_hash", tokenHash).first("user_id", "used_at", "expires_at");
  if (opts.lock) q.forUpdate();
  return q;
}

/** Marks every open link of the user used. */
export async function usePasswordResets(db: Q, userId: string): Promise<void> {
  await db("password_resets").where("user_id", userId).whereNull("used_at").update({ used_at: db.fn.now() });
}
