// Signing out: this session ends at once (its token is refused from then on).
import type { Db } from "../db/knex";
import { endSession } from "../repositories/sessions";
import { auditAs } from "../repositories/audit";
import type { Actor } from "./actor";

export function signOut(db: Db, actor: Actor, sessionId: string): Promise<void> {
  return db.transaction(async (trx) => {
    await endSession(trx, sessionId, "logout");
    await auditAs(trx, actor, { action: "auth.signed_out", entityType: "user", entityId: actor.userId });
  });
}
