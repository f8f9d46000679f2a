// Exam and clip queries, always scoped by program.
import crypto from "node:crypto";
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import type { z } from "zod";
import type { examListQuerySchema } from "../../shared/schemas/exams";
import type { ClipRow, ExamDetailRow } from "../presenters/exam";
import type { FindingRead } from "../../shared/catalogue";
import type { ExamRow } from "../policies/exam";
import { examClipSummaryColumns, listExamClips } from "./clips";

type Q = Db | Knex.Transaction;

// Crockford-style alphabet: no I, L, O, U, so codes read aloud without confusion.
const CODE_ALPHABET = "0123456789ABCDEFGHJKMNPQRSTVWXYZ";

/** A short random exam code such as "EX-7K3Q9M"; uniqueness is enforced by the database. */
export function newExamCode(): string {
  const bytes = crypto.randomBytes(6);
  return `EX-${[...bytes].map((b) => CODE_ALPHABET[b % 32]).join("")}`;
}

export const findExam = (db: Q, programId: string, id: string) =>
  db("exams").where({ id, program_id: programId }).first<(ExamRow & { application_id: string }) | undefined>();

/** The exam, locked for the rest of the transaction (changes to one exam are serialised). */
export const lockExam = (trx: Q, programId: string, id: string) => findExam(trx, programId, id).forUpdate();

/** The published version of an active application of the program, by its code (new and edited exams are recorded under it). */
export const findActiveApplication = (db: Q, programId: string, code: string) =>
  db("applications").where({ program_id: programId, code, active: true, status: "published" }).first<{ id: string; code: string } | undefined>("id", "code");

/** The finding keys an application asks about. */
export async function applicationFindingKeys(db: Q, applicationId: string): Promise<string[]> {
  return (await db("application_findings").where("application_id", applicationId).select("key")).map((r) => r.key);
}

/** The code of an application, by id. */
export async function applicationCodeOf(db: Q, applicationId: string): Promise<string> {
  return (await db("applications").where("id", applicationId).first("code")).code;
}

export interface NewExamRow {
  program_id: string;
  sonographer_id: string;
  application_id: string;
  code: string;
  performed_at: string | Date;
  setting: string;
  transducer: string;
  preset: string;
  indication: string;
}

/** Inserts a draft; undefined when its code is already taken in the program. */
export async function insertExam(trx: Q, row: NewExamRow): Promise<{ id: string } | undefined> {
  const [inserted] = await trx("exams").insert(row).onConflict(["program_id", "code"]).ignore().returning("id");
  return inserted;
}

/** Sets the given columns of an exam and its updated_at. */
export const updateExamColumns = (trx: Q, id: string, changes: Record<string, unknown>) =>
  trx("exams")
    .where("id", id)
    .update({ updated_at: trx.fn.now(), ...changes });

/** Removes the exam's findings that its application does not ask about. */
export const dropFindingsOutside = (trx: Q, examId: string, applicationId: string) =>
  trx("exam_findings")
    .where("exam_id", examId)
    .whereNotIn("finding_key", trx("application_findings").where("application_id", applicationId).select("key"))
    .delete();

/** A draft becomes submitted, attested now. */
export const markExamSubmitted = (trx: Q, id: string) =>
  trx("exams").where("id", id).update({ status: "submitted", submitted_at: trx.fn.now(), attested_at: trx.fn.now(), updated_at: trx.fn.now() });

export async function examSetting(trx: Q, id: string): Promise<string> {
  return (await trx("exams").where("id", id).first("setting")).setting;
}

/** Deletes an exam (its findings and clips go with it). */
export const deleteExam = (trx: Q, id: string) => trx("exams").where("id", id).delete();

/**
 * Marks the exam changed at `at` (default now) for what happens to its clips; updated_at
 * never moves back (the demo adds clips dated when the scan was performed).
 */
export const touchExam = (trx: Q, id: string, at?: Date) =>
  trx("exams")
    .where("id", id)
    .update({ updated_at: at ? trx.raw("GREATEST(updated_at, ?)", [at]) : trx.fn.now() });

export async function examDetail(db: Q, programId: string, id: string) {
  const exam = (await db("exams as e")
    .join("applications as a", "a.id", "e.application_id")
    .join("users as u", "u.id", "e.sonographer_id")
    .where({ "e.id": id, "e.program_id": programId })
    .first(
      "e.*",
      "a.code as app_code",
      "a.name as app_name",
      "a.version as app_version",
      "a.orientation as app_orientation",
      "a.cautions as app_cautions",
      "u.name as sonographer_name",
    )) as ExamDetailRow | undefined;
  if (!exam) return undefined;
  const [findings, clips] = await Promise.all([
    db("exam_findings").where("exam_id", id).orderBy("finding_key") as Promise<{ finding_key: string; read: FindingRead }[]>,
    listExamClips(db, id) as Promise<ClipRow[]>,
  ]);
  return { exam, findings, clips };
}

const SORTS: Record<string, [string, "asc" | "desc"]> = {
  performedAt: ["e.performed_at", "asc"],
  "-performedAt": ["e.performed_at", "desc"],
  createdAt: ["e.created_at", "asc"],
  "-createdAt": ["e.created_at", "desc"],
  application: ["a.name", "asc"],
  "-application": ["a.name", "desc"],
  status: ["e.status", "asc"],
  "-status": ["e.status", "desc"],
};

/** One page of a sonographer's own exams with clip counts, and the total for paging. */
export async function listOwnExams(db: Q, programId: string, userId: string, q: z.output<typeof examListQuerySchema>) {
  const base = db("exams as e").join("applications as a", "a.id", "e.application_id").where({ "e.program_id": programId, "e.sonographer_id": userId });
  if (q.status === "submitted") base.whereIn("e.status", ["submitted", "in_review", "adjudication"]);
  else if (q.status) base.andWhere("e.status", q.status);
  if (q.application) base.andWhere("a.code", q.application);
  if (q.from) base.andWhere("e.performed_at", ">=", q.from);
  if (q.to) base.andWhere("e.performed_at", "<", db.raw(`?::date + 1`, [q.to]));
  const [column, direction] = SORTS[q.sort];
  const [rows, [{ count }]] = await Promise.all([
    base
      .clone()
      .select(
        "e.id",
        "e.code",
        "e.status",
        "e.performed_at",
        "e.setting",
        "e.updated_at",
        "a.code as app_code",
        "a.name as app_name",
        ...examClipSummaryColumns(db),
      )
      .orderBy([
        { column, order: direction },
        { column: "e.id", order: "asc" },
      ])
      .limit(q.limit)
      .offset(q.offset),
    base.clone().count<{ count: string }[]>("* as count"),
  ]);
  return { rows, total: Number(count) };
}

/** Replaces an exam's findings with the given reads. */
export async function replaceFindings(trx: Knex.Transaction, examId: string, findings: { key: string; read: FindingRead }[]) {
  await trx("exam_findings").where("exam_id", examId).delete();
  if (findings.length) await trx("exam_findings").insert(findings.map((f) => ({ exam_id: examId, finding_key: f.key, read: f.read })));
}

/** What the scoring rules need to know about an exam. */
export async function examContext(db: Q, programId: string, examId: string) {
  const e = await db("exams as e")
    .join("applications as a", "a.id", "e.application_id")
    .where({ "e.id": examId, "e.program_id": programId })
    .first(
      "e.id",
      "e.program_id",
      "e.sonographer_id",
      "e.setting",
      "e.code",
      "e.double_read",
      "e.status",
      "e.application_id",
      "a.code as application_code",
      "a.credit_require_complete as require_complete",
    );
  if (!e) return undefined;
  // One after another: inside a transaction they share one connection, where parallel queries
  // only queue up (and pg warns that a later major version refuses them).
  const findings = await db("application_findings")
    .where("application_id", e.application_id)
    .orderBy("position")
    .select<{ key: string; label: string }[]>("key", "label");
  const sonographerReads = await db("exam_findings").where("exam_id", examId).select("finding_key as key", "read");
  const requiredViews = await db("application_views")
    .where({ application_id: e.application_id, required: true })
    .orderBy("position")
    .select<{ key: string; label: string }[]>("key", "label");
  const clipViews = await db("clips").where({ exam_id: examId, state: "ready" }).whereNotNull("view_key").distinct().pluck("view_key");
  return { ...e, findingKeys: findings.map((f) => f.key), findingLabels: findings, sonographerReads, requiredViews, clipViews } as {
    id: string;
    program_id: string;
    sonographer_id: string;
    setting: string;
    code: string;
    double_read: boolean;
    status: string;
    application_id: string;
    application_code: string;
    findingKeys: string[];
    findingLabels: { key: string; label: string }[];
    sonographerReads: { key: string; read: FindingRead }[];
    /** Whether the application version's credit rule asks for every required view. */
    require_complete: boolean;
    requiredViews: { key: string; label: string }[];
    /** The views of the exam's ready clips. */
    clipViews: string[];
  };
}

// The exam's review states, as the review flow moves it (README "Review rules").

/** A submitted exam enters review; `double` records whether it also gets a second read. */
export async function markExamInReview(trx: Knex.Transaction, examId: string, double: boolean) {
  await trx("exams").where("id", examId).update({ status: "in_review", double_read: double });
}

/** The double reads disagreed: the exam waits for adjudication. */
export async function markExamInAdjudication(trx: Knex.Transaction, examId: string) {
  await trx("exams").where("id", examId).update({ status: "adjudication", updated_at: trx.fn.now() });
}

/** The exam's final result is decided. */
export async function markExamReviewed(trx: Knex.Transaction, examId: string) {
  await trx("exams").where("id", examId).update({ status: "reviewed", updated_at: trx.fn.now() });
}

/** An exam of the program with its application's code and name (what a reviewer's page shows of it). */
export const findExamWithApplication = (db: Q, programId: string, examId: string) =>
  db("exams as e").join("applications as ap", "ap.id", "e.application_id").where({ "e.id": examId, "e.program_id": programId }).first<
    | {
        id: string;
        program_id: string;
        sonographer_id: string;
        code: string;
        application_id: string;
        performed_at: Date;
        setting: string;
        status: string;
        app_code: string;
        app_name: string;
      }
    | undefined
  >("e.id", "e.program_id", "e.sonographer_id", "e.code", "e.application_id", "e.performed_at", "e.setting", "e.status", "ap.code as app_code", "ap.name as app_name");

/** How many of a sonographer's exams are in `status` (home counts). */
export async function countOwnExams(db: Q, programId: string, sonographerId: string, status: string): Promise<number> {
  const [r] = await db("exams").where({ program_id: programId, sonographer_id: sonographerId, status }).count<{ c: string }[]>("* as c");
  return Number(r.c);
}

/** Exams of the program submitted and still waiting for their final result. */
export async function countExamsAwaitingResult(db: Q, programId: string): Promise<number> {
  const [r] = await db("exams").where("program_id", programId).whereIn("status", ["submitted", "in_review", "adjudication"]).count<{ c: string }[]>("* as c");
  return Number(r.c);
}
