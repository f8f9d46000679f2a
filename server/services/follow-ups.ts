// Follow-ups of clinically significant disagreements and urgent flags: the QA lead's list and
// moving one on (open, in progress, closed with an outcome), audited.
import type { Db } from "../db/knex";
import { notFound } from "../http/errors";
import type { z } from "zod";
import type { FollowUpStatus, followUpUpdateSchema } from "../../shared/schemas/follow-ups";
import { listFollowUps, setFollowUpStatus } from "../repositories/follow-ups";
import { auditAs } from "../repositories/audit";
import type { Actor } from "./actor";

export const programFollowUps = (db: Db, programId: string, status?: FollowUpStatus) => listFollowUps(db, programId, status);

/** Moves a follow-up on; closing needs an outcome (and a note for some), checked by the schema. */
export function updateFollowUp(db: Db, actor: Actor, id: string, change: z.output<typeof followUpUpdateSchema>) {
  return db.transaction(async (trx) => {
    const row = await setFollowUpStatus(trx, actor.programId, id, { ...change, by: actor.userId });
    if (!row) throw notFound("Follow-up");
    await auditAs(trx, actor, { action: "follow_up.updated", entityType: "follow_up", entityId: row.id, details: change });
    return row;
  });
}
