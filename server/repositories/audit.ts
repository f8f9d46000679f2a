// Writes to the append-only audit log.
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

/** Appends one event done by `actor` in its program; call it inside the change's transaction. */
export function auditAs(
  db: Db | Knex.Transaction,
  actor: { programId: string; userId: string; ip: string | null },
  e: Omit<AuditEvent, "programId" | "actorUserId" | "ip">,
): Promise<void> {
  return audit(db, { ...e, programId: actor.programId, actorUserId: actor.userId, ip: actor.ip });
}
