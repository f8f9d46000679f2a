// Members of a program: the user row joined to its membership in that program.
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import type { SessionUser } from "../../shared/schemas/auth";
import type { Role } from "../../shared/roles";

type Q = Db | Knex.Transaction;

const memberColumns = ["u.id", "u.name", "u.email", "m.roles", "m.deactivated_at", "m.created_at", "u.last_sign_in_at", "m.dicom_operator_names"];

export interface MemberRow {
  id: string;
  name: string;
  email: string;
  roles: Role[];
  deactivated_at: Date | null;
  created_at: Date;
  last_sign_in_at: Date | null;
  dicom_operator_names: string[];
}

const members = (db: Q, programId: string) => db("memberships as m").join("users as u", "u.id", "m.user_id").where("m.program_id", programId);

export function listMembers(db: Q, programId: string): Promise<MemberRow[]> {
  return members(db, programId).select(memberColumns).orderBy("u.name");
}

/** One member of the program, or undefined (another program's user is simply not found). */
export async function findMember(db: Q, programId: string, userId: string, lock = false): Promise<MemberRow | undefined> {
  const q = members(db, programId).where("u.id", userId).first(memberColumns);
  if (lock) q.forUpdate();
  return q;
}

/** Count of active admins in the program, optionally leaving one user out. */
export async function activeAdminCount(db: Q, programId: string, exceptUserId?: string): Promise<number> {
  const q = db("memberships").where("program_id", programId).whereNull("deactivated_at").whereRaw(`'admin' = ANY(roles)`);
  if (exceptUserId) q.andWhereNot("user_id", exceptUserId);
  const [{ count }] = await q.count<{ count: string }[]>("* as count");
  return Number(count);
}

/** Whether this address has a membership in the program, and whether it is deactivated. */
export function membershipByEmail(db: Q, programId: string, email: string): Promise<{ deactivated_at: Date | null } | undefined> {
  return db("memberships as m").join("users as u", "u.id", "m.user_id").where({ "u.email": email, "m.program_id": programId }).first("m.deactivated_at");
}

/** Makes the user a member with these roles; a former membership comes back active with them. */
export async function joinProgram(db: Q, userId: string, programId: string, roles: Role[]): Promise<void> {
  await db.raw(
    `INSERT INTO memberships (user_id, program_id, roles) VALUES (?, ?, ?)
     ON CONFLICT (user_id, program_id) DO UPDATE SET roles = EXCLUDED.roles, deactivated_at = NULL`,
    [userId, programId, roles],
  );
}

export async function setMemberRoles(db: Q, programId: string, userId: string, roles: Role[]): Promise<void> {
  await db("memberships").where({ user_id: userId, program_id: programId }).update({ roles });
}

/** Deactivates the membership as of `at` (a deactivated member keeps their first date). */
export async function setOperatorNames(db: Q, programId: string, userId: string, names: string[]): Promise<void> {
  await db("memberships").where({ program_id: programId, user_id: userId }).update({ dicom_operator_names: names });
}

/** Members other than `userId` who already gave one of these operator names (compared as normalised). */
export async function operatorNameHolders(db: Q, programId: string, userId: string): Promise<{ name: string; dicom_operator_names: string[] }[]> {
  return members(db, programId).whereNot("u.id", userId).whereRaw("cardinality(m.dicom_operator_names) > 0").select("u.name", "m.dicom_operator_names");
}

export async function deactivateMember(db: Q, programId: string, userId: string, at: Date): Promise<void> {
  await db("memberships").where({ user_id: userId, program_id: programId }).update({ deactivated_at: at });
}

export async function reactivateMember(db: Q, programId: string, userId: string): Promise<void> {
  await db("memberships").where({ user_id: userId, program_id: programId }).update({ deactivated_at: null });
}

/** The user's active memberships, oldest first, as session users. */
export async function activeMemberships(db: Q, userId: string): Promise<SessionUser[]> {
  const rows = await db("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .join("programs as p", "p.id", "m.program_id")
    .where("m.user_id", userId)
    .whereNull("m.deactivated_at")
    .orderBy("m.created_at")
    .select("u.id", "u.name", "u.email", "m.roles", "p.id as program_id", "p.name as program_name");
  return rows.map((r) => ({ id: r.id, name: r.name, email: r.email, programId: r.program_id, programName: r.program_name, roles: r.roles }));
}

/** Whether the user holds the reviewer role in an active membership of the program. */
export async function isActiveReviewer(db: Q, programId: string, userId: string): Promise<boolean> {
  const row = await db("memberships")
    .where({ user_id: userId, program_id: programId })
    .whereNull("deactivated_at")
    .whereRaw(`'reviewer' = ANY(roles)`)
    .first("user_id");
  return Boolean(row);
}

/** Active members of the program holding `role`. */
export async function countActiveWithRole(db: Q, programId: string, role: Role): Promise<number> {
  const [r] = await db("memberships")
    .where("program_id", programId)
    .whereNull("deactivated_at")
    .whereRaw("? = ANY(roles)", [role])
    .count<{ c: string }[]>("* as c");
  return Number(r.c);
}

/** Members of the program, active or deactivated. */
export async function countMembers(db: Q, programId: string, which: "active" | "deactivated"): Promise<number> {
  const q = db("memberships").where("program_id", programId);
  if (which === "active") q.whereNull("deactivated_at");
  else q.whereNotNull("deactivated_at");
  const [r] = await q.count<{ c: string }[]>("* as c");
  return Number(r.c);
}
