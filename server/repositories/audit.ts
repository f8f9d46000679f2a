// The append-only audit log: writing events, and reading a program's log.
import type { Knex } from "knex";
import type { Db } from "../db/knex";

export interface AuditEvent {
  programId: string | null;
  actorUserId: string | null;
  action: string;
  entityType?: string;
  entityId?: string;
  ip?: string | null;
  details?: Record<string, unknown>;
}

/** One stored row of the log, with the actor's name when read through listAuditEntries. */
export interface AuditRow {
  id: string | number;
  at: Date;
  actor_name?: string | null;
  action: string;
  entity_type: string | null;
  entity_id: string | null;
  ip: string | null;
  details: Record<string, unknown> | null;
}

const SESSION_KEY = /^(sid|session|session_?id|sessions|session_?ids)$/i;

/** A copy of audit details without keys that name sessions (a session id is half a token). */
export function withoutSessionKeys(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(withoutSessionKeys);
  if (value && typeof value === "object") {
    return Object.fromEntries(
      Object.entries(value as Record<string, unknown>)
        .filter(([k]) => !SESSION_KEY.test(k))
        .map(([k, v]) => [k, withoutSessionKeys(v)]),
    );
  }
  return value;
}

/** Appends one event; call it inside the same transaction as the change it records. */
export async function audit(db: Db | Knex.Transaction, e: AuditEvent): Promise<void> {
  await db("audit_log").insert({
    program_id: e.programId,
    actor_user_id: e.actorUserId,
    action: e.action,
    entity_type: e.entityType ?? null,
    // Session ids are never stored: the log is readable by admins.
    entity_id: e.entityType === "session" ? null : (e.entityId ?? null),
    ip: e.ip ?? null,
    details: e.details ? JSON.stringify(withoutSessionKeys(e.details)) : null,
  });
}

/** Appends one event to each program the user belongs to (a change to the account itself). */
export async function auditInEveryProgram(db: Db | Knex.Transaction, userId: string, action: string, ip: string | null): Promise<void> {
  await db.raw(
    `INSERT INTO audit_log (program_id, actor_user_id, action, entity_type, entity_id, ip)
     SELECT program_id, ?, ?, 'user', ?, ? FROM memberships WHERE user_id = ?`,
    [userId, action, userId, ip, userId],
  );
}

/** One page of the program's log, newest first, with its actors' names and the total count. */
export async function listAuditEntries(
  db: Db | Knex.Transaction,
  programId: string,
  page: { limit: number; offset: number; action?: string },
): Promise<{ rows: AuditRow[]; total: number }> {
  const base = db("audit_log as a").where("a.program_id", programId);
  if (page.action) base.andWhere("a.action", page.action);
  const [rows, [{ count }]] = await Promise.all([
    base
      .clone()
      .leftJoin("users as u", "u.id", "a.actor_user_id")
      .orderBy("a.id", "desc")
      .limit(page.limit)
      .offset(page.offset)
      .select("a.*", "u.name as actor_name"),
    base.clone().count<{ count: string }[]>("* as count"),
  ]);
  return { rows, total: Number(count) };
}

/** Appends one event done by `actor` in its program; call it inside the change's transaction. */
export function auditAs(
  db: Db | Knex.Transaction,
  actor: { programId: string; userId: string; ip: string | null },
  e: Omit<AuditEvent, "programId" | "actorUserId" | "ip">,
): Promise<void> {
  return audit(db, { ...e, programId: actor.programId, actorUserId: actor.userId, ip: actor.ip });
}
