// Session rows: create, look up with the member's current roles, end.
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import type { AuthUser } from "../auth/types";
import type { TokenClaims } from "../auth/tokens";
import type { Role } from "../../shared/roles";

/** The signed-in member behind a token, or null when the session no longer counts. */
export async function loadSessionUser(db: Db, claims: TokenClaims): Promise<AuthUser | null> {
  const row = await db("sessions as s")
    .join("users as u", "u.id", "s.user_id")
    .join("memberships as m", function () {
      this.on("m.user_id", "=", "s.user_id").andOn("m.program_id", "=", "s.program_id");
    })
    .join("programs as p", "p.id", "s.program_id")
    .where("s.id", claims.sid)
    .andWhere("s.user_id", claims.sub)
    .andWhere("s.program_id", claims.pid)
    .whereNull("s.revoked_at")
    .andWhere("s.expires_at", ">", db.fn.now())
    .whereNull("m.deactivated_at")
    .first("u.id", "u.name", "u.email", "m.roles", "p.id as program_id", "p.name as program_name", "s.id as session_id");
  if (!row || row.roles.length === 0) return null;
  return {
    id: row.id,
    name: row.name,
    email: row.email,
    programId: row.program_id,
    programName: row.program_name,
    roles: row.roles as Role[],
    sessionId: row.session_id,
  };
}

export async function createSession(
  db: Db | Knex.Transaction,
  s: { userId: string; programId: string; ttlSeconds: number; ip?: string; userAgent?: string },
): Promise<string> {
  const [row] = await db("sessions")
    .insert({
      user_id: s.userId,
      program_id: s.programId,
      expires_at: db.raw(`now() + make_interval(secs => ?)`, [s.ttlSeconds]),
      ip: s.ip ?? null,
      user_agent: s.userAgent?.slice(0, 300) ?? null,
    })
    .returning("id");
  return row.id as string;
}

/** Ends one session (sign-out, a move to another program). */
export async function endSession(db: Db | Knex.Transaction, sessionId: string, reason: string): Promise<void> {
  await db("sessions").where("id", sessionId).update({ revoked_at: db.fn.now(), revoked_reason: reason });
}

/** Ends sessions of a user; scope to one program and/or keep one session alive. */
export async function endSessions(
  db: Db | Knex.Transaction,
  opts: { userId: string; programId?: string; exceptSessionId?: string; reason: string },
): Promise<number> {
  const q = db("sessions").where("user_id", opts.userId).whereNull("revoked_at");
  if (opts.programId) q.andWhere("program_id", opts.programId);
  if (opts.exceptSessionId) q.andWhereNot("id", opts.exceptSessionId);
  return q.update({ revoked_at: db.fn.now(), revoked_reason: opts.reason });
}
