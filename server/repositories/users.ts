// Accounts: the user rows behind every membership (e-mail, name, password hash). A user is
// not program-scoped (one account may belong to several programs); what a program may see
// of its people goes through ./members.ts.
import type { Knex } from "knex";
import type { Db } from "../db/knex";

type Q = Db | Knex.Transaction;

export interface Account {
  id: string;
  name: string;
  email: string;
  password_hash: string | null;
}

/** The account with this e-mail address (already lower-cased), or undefined. */
export function findAccountByEmail(db: Q, email: string, opts: { lock?: boolean } = {}): Promise<Account | undefined> {
  const q = db("users").where("email", email).first("id", "name", "email", "password_hash");
  if (opts.lock) q.forUpdate();
  return q;
}

/** Whether someone has already set a password under this address (an account that can sign in). */
export async function hasPasswordAccount(db: Q, email: string): Promise<boolean> {
  return Boolean(await db("users").where("email", email).whereNotNull("password_hash").first("id"));
}

/** The stored password hash of a user, or undefined when there is none. */
export async function passwordHashOf(db: Q, userId: string): Promise<string | undefined> {
  return (await db("users").where("id", userId).first("password_hash"))?.password_hash ?? undefined;
}

/** Replaces a hash made at another cost, only if it is still the one that was checked. */
export async function renewPasswordHash(db: Q, userId: string, oldHash: string, newHash: string): Promise<void> {
  await db("users").where({ id: userId, password_hash: oldHash }).update({ password_hash: newHash });
}

/** Sets a new password (and, for an account that had none, its name). */
export async function setPassword(db: Q, userId: string, passwordHash: string, name?: string): Promise<void> {
  await db("users")
    .where("id", userId)
    .update({ ...(name === undefined ? {} : { name }), password_hash: passwordHash, password_changed_at: db.fn.now() });
}

/** A new account with its password set. */
export async function createAccount(db: Q, a: { email: string; name: string; passwordHash: string }): Promise<Pick<Account, "id" | "name" | "email">> {
  const [row] = await db("users")
    .insert({ email: a.email, name: a.name, password_hash: a.passwordHash, password_changed_at: db.fn.now() })
    .returning(["id", "name", "email"]);
  return row;
}

export async function markSignedIn(db: Q, userId: string): Promise<void> {
  await db("users").where("id", userId).update({ last_sign_in_at: db.fn.now() });
}
