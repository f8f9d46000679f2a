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

/** Appends one event; call it inside the same transaction as the change it records. */
export async function audit(db: Db | Knex.Transaction, e: AuditEvent): Promise<void> {
  await db("audit_log").insert({
    program_id: e.programId,
    actor_user_id: e.actorUserId,
    action: e.action,
    entity_type: e.entityType ?? null,
    entity_id: e.entityId ?? null,
    ip: e.ip ?? null,
    details: e.details ? JSON.stringify(e.details) : null,
  });
}
