// Rubric versions: listing and reading them, starting a draft, saving (a draft in place, a
// published version into its next published version, archiving the old one), publishing a
// draft and archiving a version; each change is audited in its transaction.
import type { Db } from "../db/knex";
import { notFound } from "../http/errors";
import type { z } from "zod";
import type { Rubric, rubricInputSchema } from "../../shared/rubric/types";
import {
  archiveRubricVersion,
  discardDraft,
  getRubric,
  insertRubric,
  latestVersionOf,
  listRubrics,
  lockRubric,
  publishRubricVersion,
} from "../repositories/rubrics";
import { auditAs } from "../repositories/audit";
import { assertArchivable, assertEditable, assertPublishable } from "../policies/rubric";
import type { Actor } from "./actor";

type Input = z.output<typeof rubricInputSchema>;

export const programRubrics = (db: Db, programId: string) => listRubrics(db, programId);

/** One version with its criteria; 404 when the program has none with this id. */
export async function rubricById(db: Db, programId: string, id: string): Promise<Rubric> {
  const rubric = await getRubric(db, programId, id);
  if (!rubric) throw notFound("Rubric");
  return rubric;
}

/** Starts a new rubric family as a draft, version 1. */
export async function createRubric(db: Db, actor: Actor, input: Input): Promise<Rubric> {
  const id = await db.transaction(async (trx) => {
    const id = await insertRubric(trx, {
      programId: actor.programId,
      version: 1,
      name: input.name,
      status: "draft",
      criteria: input.criteria,
      createdBy: actor.userId,
    });
    await auditAs(trx, actor, { action: "rubric.created", entityType: "rubric", entityId: id });
    return id;
  });
  return rubricById(db, actor.programId, id);
}

/** Saves a version: a draft is written again (a new id, same version); a published one gets its next published version. */
export async function saveRubric(db: Db, actor: Actor, id: string, input: Input): Promise<Rubric> {
  const savedId = await db.transaction(async (trx) => {
    const row = await lockRubric(trx, actor.programId, id);
    if (!row) throw notFound("Rubric");
    assertEditable(row.status);
    const base = { programId: actor.programId, familyId: row.family_id, name: input.name, criteria: input.criteria, createdBy: actor.userId };
    if (row.status === "draft") {
      await discardDraft(trx, row.id);
      const draftId = await insertRubric(trx, { ...base, version: row.version, status: "draft" });
      await auditAs(trx, actor, { action: "rubric.draft_saved", entityType: "rubric", entityId: draftId });
      return draftId;
    }
    const next = (await latestVersionOf(trx, row.family_id)) + 1;
    await archiveRubricVersion(trx, row.id);
    const nextId = await insertRubric(trx, { ...base, version: next, status: "published" });
    await auditAs(trx, actor, { action: "rubric.new_version", entityType: "rubric", entityId: nextId, details: { from: row.version, to: next } });
    return nextId;
  });
  return rubricById(db, actor.programId, savedId);
}

/** Publishes a draft (the family's published version is archived). */
export async function publishRubric(db: Db, actor: Actor, id: string): Promise<Rubric> {
  await db.transaction(async (trx) => {
    const row = await lockRubric(trx, actor.programId, id);
    if (!row) throw notFound("Rubric");
    assertPublishable(row.status);
    await publishRubricVersion(trx, row);
    await auditAs(trx, actor, { action: "rubric.published", entityType: "rubric", entityId: row.id });
  });
  return rubricById(db, actor.programId, id);
}

export async function archiveRubric(db: Db, actor: Actor, id: string): Promise<Rubric> {
  await db.transaction(async (trx) => {
    const row = await lockRubric(trx, actor.programId, id);
    if (!row) throw notFound("Rubric");
    assertArchivable(row.status);
    await archiveRubricVersion(trx, row.id);
    await auditAs(trx, actor, { action: "rubric.archived", entityType: "rubric", entityId: row.id });
  });
  return rubricById(db, actor.programId, id);
}
