// Follow-ups of clinically significant disagreements and urgent flags: the QA lead's list and
// moving one on (open, in progress, closed with an outcome), audited.
import type { Db } from "../db/knex";
import { HttpError, notFound } from "../http/errors";
import { unseal } from "../auth/sealed";
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

/**
 * Opens the encounter reference of a follow-up's exam for a QA lead, so the callback can find
 * the patient. Every reveal is written to the audit log. 404 when the follow-up is not the
 * program's or its exam has no reference; 503 when this server has no key.
 */
export async function revealEncounterRef(db: Db, key: Buffer | null, actor: Actor, id: string): Promise<{ reference: string }> {
  const row = await db("follow_ups as f")
    .join("exams as e", "e.id", "f.exam_id")
    .where({ "f.id": id, "f.program_id": actor.programId })
    .first("e.id as exam_id", "e.encounter_ref_sealed");
  if (!row) throw notFound("Follow-up");
  if (!row.encounter_ref_sealed) throw new HttpError(404, "no_encounter_ref", "The clinician gave no encounter reference for this exam");
  if (!key) throw new HttpError(503, "encounter_ref_unavailable", "This server has no ENCOUNTER_KEY to open encounter references with");
  let reference: string;
  try {
    reference = unseal(key, row.exam_id, row.encounter_ref_sealed);
  } catch {
    throw new HttpError(500, "encounter_ref_unreadable", "The encounter reference cannot be opened with this server's key (was ENCOUNTER_KEY changed?)");
  }
  await auditAs(db, actor, { action: "follow_up.encounter_ref_revealed", entityType: "follow_up", entityId: id, details: { examId: row.exam_id } });
  return { reference };
}
