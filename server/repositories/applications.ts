// A program's application catalogue. An application is one code across its versions; the
// published version is the one new exams are recorded under, and an exam keeps the version
// it was recorded under (exams.application_id), with that version's views and findings.
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import type { Application, ApplicationVersion, CreditRuleOfApplication } from "../../shared/schemas/applications";
import { DEFAULT_APPLICATION_CREDIT_RULE, type CatalogueEntry, type Orientation, type Transducer } from "../../shared/catalogue";

type Q = Db | Knex.Transaction;

export interface ApplicationRow {
  id: string;
  program_id: string;
  code: string;
  name: string;
  version: number;
  status: "published" | "archived";
  active: boolean;
  usual_transducers: Transducer[];
  presets: string[];
  depth_min_cm: string;
  depth_max_cm: string;
  orientation: Orientation;
  cautions: string[];
  position: number;
  credit_threshold: number | null;
  credit_non_clinical_cap: number | null;
  credit_min_positive: number;
  credit_require_complete: boolean;
  published_at: Date;
  archived_at: Date | null;
}

/** The content of one version, as written (a catalogue entry without its code). */
export type ApplicationContent = Omit<CatalogueEntry, "code"> & { active: boolean; creditRule: CreditRuleOfApplication };

export const creditRuleOf = (a: Pick<ApplicationRow, "credit_threshold" | "credit_non_clinical_cap" | "credit_min_positive" | "credit_require_complete">) => ({
  threshold: a.credit_threshold,
  nonClinicalCap: a.credit_non_clinical_cap,
  minPositive: a.credit_min_positive,
  requireComplete: a.credit_require_complete,
});

async function present(db: Q, apps: ApplicationRow[]): Promise<Application[]> {
  const ids = apps.map((a) => a.id);
  const [views, findings] = await Promise.all([
    db("application_views").whereIn("application_id", ids).orderBy("position"),
    db("application_findings").whereIn("application_id", ids).orderBy("position"),
  ]);
  return apps.map((a) => ({
    id: a.id,
    code: a.code,
    name: a.name,
    version: a.version,
    status: a.status,
    active: a.active,
    usualTransducers: a.usual_transducers,
    presets: a.presets,
    typicalDepthCm: [Number(a.depth_min_cm), Number(a.depth_max_cm)],
    orientation: a.orientation,
    cautions: a.cautions,
    views: views
      .filter((r) => r.application_id === a.id)
      .map((r) => ({ key: r.key as string, label: r.label as string, required: r.required as boolean, hint: r.hint as string })),
    findings: findings.filter((r) => r.application_id === a.id).map((r) => ({ key: r.key as string, label: r.label as string, hint: r.hint as string })),
    creditRule: creditRuleOf(a),
    publishedAt: a.published_at.toISOString(),
  }));
}

/** The published version of each of the program's applications, in catalogue order. */
export async function listApplications(db: Q, programId: string): Promise<Application[]> {
  const apps = await db("applications").where({ program_id: programId, status: "published" }).orderBy(["position", "name"]);
  return present(db, apps);
}

/** One version (published or archived) of the program's applications. */
export async function getApplication(db: Q, programId: string, id: string): Promise<Application | undefined> {
  const row = await db("applications").where({ id, program_id: programId }).first<ApplicationRow | undefined>();
  return row ? (await present(db, [row]))[0] : undefined;
}

/** Every version of one application code, newest first, with the exams recorded under each. */
export async function versionsOf(db: Q, programId: string, code: string): Promise<ApplicationVersion[]> {
  const rows = await db("applications as a")
    .leftJoin("users as u", "u.id", "a.created_by")
    .where({ "a.program_id": programId, "a.code": code })
    .orderBy("a.version", "desc")
    .select(
      "a.id",
      "a.version",
      "a.status",
      "a.name",
      "a.published_at",
      "a.archived_at",
      "u.name as created_by",
      db.raw("(SELECT count(*)::int FROM exams e WHERE e.application_id = a.id) AS exam_count"),
    );
  return rows.map((r) => ({
    id: r.id,
    version: r.version,
    status: r.status,
    name: r.name,
    publishedAt: r.published_at.toISOString(),
    archivedAt: r.archived_at?.toISOString() ?? null,
    createdBy: r.created_by ?? null,
    examCount: r.exam_count,
  }));
}

/** A version's row, locked for the change that follows (inside a transaction). */
export function lockApplication(trx: Knex.Transaction, programId: string, id: string): Promise<ApplicationRow | undefined> {
  return trx("applications").where({ id, program_id: programId }).forUpdate().first<ApplicationRow | undefined>();
}

/** Whether the program has an application with this code (in any version). */
export async function applicationCodeTaken(db: Q, programId: string, code: string): Promise<boolean> {
  return !!(await db("applications").where({ program_id: programId, code }).first("id"));
}

/** The position a new application takes: after the program's others. */
export async function nextApplicationPosition(db: Q, programId: string): Promise<number> {
  const [{ max }] = await db("applications").where("program_id", programId).max<{ max: number | null }[]>("position as max");
  return (max ?? -1) + 1;
}

/** Archives a published version; its exams keep pointing at it. */
export async function archiveApplicationVersion(trx: Knex.Transaction, id: string): Promise<void> {
  await trx("applications").where("id", id).update({ status: "archived", archived_at: trx.fn.now() });
}

/** Writes one published version of an application with its views and findings; returns its id. */
export async function insertApplicationVersion(
  db: Q,
  a: { programId: string; code: string; version: number; position: number; createdBy?: string | null; content: ApplicationContent },
): Promise<string> {
  const c = a.content;
  const [row] = await db("applications")
    .insert({
      program_id: a.programId,
      code: a.code,
      version: a.version,
      status: "published",
      name: c.name,
      active: c.active,
      usual_transducers: c.usualTransducers,
      presets: c.presets,
      depth_min_cm: c.typicalDepthCm[0],
      depth_max_cm: c.typicalDepthCm[1],
      orientation: c.orientation,
      cautions: c.cautions,
      credit_threshold: c.creditRule.threshold,
      credit_non_clinical_cap: c.creditRule.nonClinicalCap,
      credit_min_positive: c.creditRule.minPositive,
      credit_require_complete: c.creditRule.requireComplete,
      position: a.position,
      created_by: a.createdBy ?? null,
    })
    .returning("id");
  if (c.views.length)
    await db("application_views").insert(
      c.views.map((x, i) => ({ application_id: row.id, key: x.key, label: x.label, required: x.required, hint: x.hint, position: i })),
    );
  if (c.findings.length)
    await db("application_findings").insert(c.findings.map((x, i) => ({ application_id: row.id, key: x.key, label: x.label, hint: x.hint, position: i })));
  return row.id;
}

/** Copies a catalogue into a program as version 1 of each application (when a program is created). */
export async function insertCatalogue(db: Q, programId: string, catalogue: CatalogueEntry[]): Promise<void> {
  for (const [i, { code, ...content }] of catalogue.entries())
    await insertApplicationVersion(db, {
      programId,
      code,
      version: 1,
      position: i,
      content: { ...content, active: true, creditRule: DEFAULT_APPLICATION_CREDIT_RULE },
    });
}

/** The views and findings of the exam's application version, in their catalogue order. */
export async function viewsAndFindingsOfExam(db: Q, examId: string) {
  const [views, findings] = await Promise.all([
    db("application_views as v")
      .join("exams as e", "e.application_id", "v.application_id")
      .where("e.id", examId)
      .orderBy("v.position")
      .select<{ key: string; label: string }[]>("v.key", "v.label"),
    db("application_findings as f")
      .join("exams as e", "e.application_id", "f.application_id")
      .where("e.id", examId)
      .orderBy("f.position")
      .select<{ key: string; label: string; hint: string }[]>("f.key", "f.label", "f.hint"),
  ]);
  return { views, findings };
}

/** The findings of an application version, in their catalogue order. */
export function findingsOfApplication(db: Q, applicationId: string) {
  return db("application_findings").where("application_id", applicationId).orderBy("position").select<{ key: string; label: string }[]>("key", "label");
}
