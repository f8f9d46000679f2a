// Rubric versions and their criteria.
import crypto from "node:crypto";
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import type { Criterion, Rubric } from "../../shared/rubric/types";
import { DEFAULT_CRITERIA, DEFAULT_RUBRIC_NAME } from "../../shared/rubric/default-rubric";

type Q = Db | Knex.Transaction;

export interface RubricRow {
  id: string;
  family_id: string;
  version: number;
  name: string;
  status: Rubric["status"];
  created_at: Date;
  published_at: Date | null;
}

const toCriterion = (r: Record<string, unknown>): Criterion => ({
  key: r.key as string,
  label: r.label as string,
  help: r.help as string,
  kind: r.kind as Criterion["kind"],
  levels: r.levels as Criterion["levels"],
  min: (r.min_value as number | null) ?? null,
  max: (r.max_value as number | null) ?? null,
  required: r.required as boolean,
  critical: r.critical as boolean,
  tolerance: Number(r.tolerance),
  applications: r.applications as string[],
});

function present(row: RubricRow, criteria: Criterion[]): Rubric {
  return {
    id: row.id,
    familyId: row.family_id,
    version: row.version,
    name: row.name,
    status: row.status,
    criteria,
    createdAt: row.created_at.toISOString(),
    publishedAt: row.published_at?.toISOString() ?? null,
  };
}

/** One rubric version with its criteria, scoped to the program. */
export async function getRubric(db: Q, programId: string, id: string): Promise<Rubric | undefined> {
  const row = await db("rubrics").where({ id, program_id: programId }).first<RubricRow | undefined>();
  if (!row) return undefined;
  const criteria = (await db("rubric_criteria").where("rubric_id", id).orderBy("position")).map(toCriterion);
  return present(row, criteria);
}

/** Every rubric version of the program, newest first, without criteria. */
export async function listRubrics(db: Q, programId: string) {
  const rows = await db("rubrics")
    .where("program_id", programId)
    .orderBy([{ column: "name" }, { column: "version", order: "desc" }]);
  const counts = await db("rubric_criteria")
    .whereIn(
      "rubric_id",
      rows.map((r) => r.id),
    )
    .groupBy("rubric_id")
    .select("rubric_id")
    .count<{ rubric_id: string; count: string }[]>("* as count");
  const uses = await db("reviews")
    .whereIn(
      "rubric_id",
      rows.map((r) => r.id),
    )
    .groupBy("rubric_id")
    .select("rubric_id")
    .count<{ rubric_id: string; count: string }[]>("* as count");
  return rows.map((r: RubricRow) => ({
    ...present(r, []),
    criteriaCount: Number(counts.find((c) => c.rubric_id === r.id)?.count ?? 0),
    reviewCount: Number(uses.find((c) => c.rubric_id === r.id)?.count ?? 0),
  }));
}

/** The published rubric used for new reviews of an application (the newest published family that covers it). */
export async function activeRubricFor(db: Q, programId: string): Promise<Rubric | undefined> {
  const row = await db("rubrics").where({ program_id: programId, status: "published" }).orderBy("published_at", "desc").first<RubricRow | undefined>();
  return row ? getRubric(db, programId, row.id) : undefined;
}

/** Writes a rubric version with its criteria. */
export async function insertRubric(
  trx: Knex.Transaction,
  r: { programId: string; familyId?: string; version: number; name: string; status: Rubric["status"]; criteria: Criterion[]; createdBy?: string | null },
): Promise<string> {
  const [row] = await trx("rubrics")
    .insert({
      program_id: r.programId,
      family_id: r.familyId ?? crypto.randomUUID(),
      version: r.version,
      name: r.name,
      status: r.status,
      created_by: r.createdBy ?? null,
      published_at: r.status === "published" ? trx.fn.now() : null,
    })
    .returning("id");
  await trx("rubric_criteria").insert(
    r.criteria.map((c, i) => ({
      rubric_id: row.id,
      key: c.key,
      label: c.label,
      help: c.help,
      kind: c.kind,
      levels: JSON.stringify(c.levels),
      min_value: c.min,
      max_value: c.max,
      required: c.required,
      critical: c.critical,
      tolerance: c.tolerance,
      applications: c.applications,
      position: i,
    })),
  );
  return row.id;
}

/** Seeds the default rubric into a program that has none. */
export async function ensureDefaultRubric(trx: Knex.Transaction, programId: string): Promise<void> {
  if (await trx("rubrics").where("program_id", programId).first("id")) return;
  await insertRubric(trx, { programId, version: 1, name: DEFAULT_RUBRIC_NAME, status: "published", criteria: DEFAULT_CRITERIA });
}

/** A rubric version's row, locked for the change that follows (inside a transaction). */
export function lockRubric(trx: Knex.Transaction, programId: string, id: string): Promise<RubricRow | undefined> {
  return trx("rubrics").where({ id, program_id: programId }).forUpdate().first<RubricRow | undefined>();
}

/** The highest version number of a rubric family. */
export async function latestVersionOf(trx: Knex.Transaction, familyId: string): Promise<number> {
  const [{ max }] = await trx("rubrics").where("family_id", familyId).max<{ max: number }[]>("version as max");
  return max;
}

/** Removes a draft version with its criteria (saving a draft writes it again). */
export async function discardDraft(trx: Knex.Transaction, id: string): Promise<void> {
  await trx("rubric_criteria").where("rubric_id", id).delete();
  await trx("rubrics").where({ id, status: "draft" }).delete();
}

/** Archives one rubric version; its reviews keep pointing at it. */
export async function archiveRubricVersion(trx: Knex.Transaction, id: string): Promise<void> {
  await trx("rubrics").where("id", id).update({ status: "archived", archived_at: trx.fn.now() });
}

/** Publishes a draft, archiving the version of its family published so far. */
export async function publishRubricVersion(trx: Knex.Transaction, row: Pick<RubricRow, "id" | "family_id">): Promise<void> {
  await trx("rubrics").where({ family_id: row.family_id, status: "published" }).update({ status: "archived", archived_at: trx.fn.now() });
  await trx("rubrics").where("id", row.id).update({ status: "published", published_at: trx.fn.now() });
}
