// Program settings: reading them, and changing them with the before and after in the audit log.
import type { Db } from "../db/knex";
import type { ProgramSettings } from "../../shared/schemas/reviews";
import { getSettings, updateSettings } from "../repositories/settings";
import { auditAs } from "../repositories/audit";
import type { Actor } from "./actor";

export const programSettings = (db: Db, programId: string) => getSettings(db, programId);

/** Applies the changes over the current settings (refusing an unacceptable CUSUM rate at or below the acceptable one). */
export function saveSettings(db: Db, actor: Actor, changes: Partial<ProgramSettings>): Promise<ProgramSettings> {
  return db.transaction(async (trx) => {
    const before = await getSettings(trx, actor.programId);
    const after = await updateSettings(trx, actor.programId, changes);
    await auditAs(trx, actor, { action: "settings.changed", entityType: "program", entityId: actor.programId, details: { before, after } });
    return after;
  });
}
