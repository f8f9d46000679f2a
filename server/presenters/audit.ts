// One audit-log row as the API shows it. Session ids never leave the server: a session id
// together with the signing key is a working token. New rows do not store them; rows
// written before that have their session entity id and any session keys in details hidden.
import type { AuditEntry } from "../../shared/schemas/users";
import { withoutSessionKeys, type AuditRow } from "../repositories/audit";

export function presentAuditEntry(r: AuditRow): AuditEntry {
  const isSession = r.entity_type === "session";
  return {
    id: String(r.id),
    at: r.at.toISOString(),
    actor: r.actor_name ?? null,
    action: r.action,
    entityType: r.entity_type,
    entityId: isSession ? null : r.entity_id,
    ip: r.ip,
    details: r.details ? (withoutSessionKeys(r.details) as Record<string, unknown>) : null,
  };
}
