// Invitations to join a program: open (neither accepted nor revoked, not expired), then
// accepted or revoked. Stored by the hash of their token; listed per program.
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import type { Role } from "../../shared/roles";

type Q = Db | Knex.Transaction;

export interface InvitationRow {
  id: string;
  program_id: string;
  email: string;
  name: string | null;
  roles: Role[];
  inviter_name: string | null;
  created_at: Date;
  expires_at: Date;
  accepted_at: Date | null;
  revoked_at: Date | null;
}

/** An open invitation by its token hash, with its program's name; `lock` holds the invitation row. */
export function findOpenInvitation(
  db: Q,
  tokenHash: string,
  opts: { lock?: boolean } = {},
): Promise<{ id: string; program_id: string; email: string; name: string | null; roles: Role[]; program_name: string } | undefined> {
  const q = db("invitations as i")
    .join("programs as p", "p.id", "i.program_id")
    .where("i.token_hash", tokenHash)
    .whereNull("i.accepted_at")
    .whereNull("i.revoked_at")
    .andWhere("i.expires_at", ">", db.fn.now())
    .first("i.id", "i.program_id", "i.email", "i.name", "i.roles", "p.name as program_name");
  if (opts.lock) q.forUpdate("i");
  return q;
}

/** The program's invitations, newest first (the latest 200). */
export function listInvitations(db: Q, programId: string): Promise<InvitationRow[]> {
  return db("invitations as i")
    .leftJoin("users as u", "u.id", "i.invited_by")
    .where("i.program_id", programId)
    .orderBy("i.created_at", "desc")
    .limit(200)
    .select("i.*", "u.name as inviter_name");
}

/** A new open invitation; the answer names `inviterName` as its inviter. */
export async function createInvitation(
  db: Q,
  i: { programId: string; email: string; name: string | null; roles: Role[]; tokenHash: string; invitedBy: string; inviterName: string; hours: number },
): Promise<InvitationRow> {
  const [row] = await db("invitations")
    .insert({
      program_id: i.programId,
      email: i.email,
      name: i.name,
      roles: i.roles,
      token_hash: i.tokenHash,
      invited_by: i.invitedBy,
      expires_at: db.raw(`now() + make_interval(hours => ?)`, [i.hours]),
    })
    .returning("*");
  return { ...row, inviter_name: i.inviterName };
}

/** Revokes the program's open invitations to this address (a new one replaces them). */
export async function revokeOpenInvitationsTo(db: Q, programId: string, email: string): Promise<void> {
  await db("invitations").where({ program_id: programId, email }).whereNull("accepted_at").whereNull("revoked_at").update({ revoked_at: db.fn.now() });
}

/** Revokes one open invitation of the program; false when there is no open one with this id. */
export async function revokeInvitation(db: Q, programId: string, id: string): Promise<boolean> {
  const n = await db("invitations").where({ id, program_id: programId }).whereNull("accepted_at").whereNull("revoked_at").update({ revoked_at: db.fn.now() });
  return n > 0;
}

export async function acceptInvitation(db: Q, id: string): Promise<void> {
  await db("invitations").where("id", id).update({ accepted_at: db.fn.now() });
}

/** Invitations of the program still open (neither accepted nor revoked, not expired). */
export async function countOpenInvitations(db: Q, programId: string): Promise<number> {
  const [r] = await db("invitations")
    .where("program_id", programId)
    .whereNull("accepted_at")
    .whereNull("revoked_at")
    .andWhere("expires_at", ">", db.fn.now())
    .count<{ c: string }[]>("* as c");
  return Number(r.c);
}
