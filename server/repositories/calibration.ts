// Calibration sets: the set, its exams (each with the QA lead's optional reference answer),
// the blinded calibration reads it sends out (assignments of kind "calibration") and the
// reviews they come back as. Every read is scoped to the program.
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import type { ReferenceAnswer } from "../../shared/schemas/calibration";
import type { FindingRead } from "../../shared/catalogue";
import type { ScoreValue } from "../../shared/rubric/types";

type Q = Db | Knex.Transaction;

export interface CalibrationExam {
  id: string;
  sonographer_id: string;
  application_id: string;
  app_code: string;
}

/** The submitted (not draft) exams of the program among `examIds`, with their application. */
export function submittedExams(db: Q, programId: string, examIds: string[]): Promise<CalibrationExam[]> {
  return db("exams as e")
    .join("applications as ap", "ap.id", "e.application_id")
    .where("e.program_id", programId)
    .whereIn("e.id", examIds)
    .whereNot("e.status", "draft")
    .select("e.id", "e.sonographer_id", "e.application_id", "ap.code as app_code");
}

/** One submitted exam with its application named, for the reference form. */
export function submittedExamWithApplication(
  db: Q,
  programId: string,
  id: string,
): Promise<{ id: string; code: string; application_id: string; app_code: string; app_name: string } | undefined> {
  return db("exams as e")
    .join("applications as ap", "ap.id", "e.application_id")
    .where({ "e.id": id, "e.program_id": programId })
    .whereNot("e.status", "draft")
    .first("e.id", "e.code", "e.application_id", "ap.code as app_code", "ap.name as app_name");
}

/** Each application's findings (key and label), in catalogue order, for the given application ids. */
export async function findingsByApplication(db: Q, applicationIds: string[]): Promise<Map<string, { key: string; label: string }[]>> {
  const rows: { application_id: string; key: string; label: string }[] = await db("application_findings")
    .whereIn("application_id", [...new Set(applicationIds)])
    .orderBy(["application_id", "position"])
    .select("application_id", "key", "label");
  const out = new Map<string, { key: string; label: string }[]>();
  for (const r of rows) out.set(r.application_id, [...(out.get(r.application_id) ?? []), { key: r.key, label: r.label }]);
  return out;
}

/** Active reviewers of the program (all of them, or those among `ids`), as user ids. */
export function activeReviewerIds(db: Q, programId: string, ids?: string[]): Promise<string[]> {
  const q = db("memberships").where("program_id", programId).whereNull("deactivated_at").whereRaw(`'reviewer' = ANY(roles)`);
  if (ids) q.whereIn("user_id", ids);
  return q.pluck("user_id");
}

/**
 * Writes a set with its exams in order (and their reference answers) and opens one blinded
 * calibration read per exam and reviewer, never a reviewer's own exam. Returns the set's id.
 */
export async function insertCalibrationSet(
  trx: Knex.Transaction,
  s: {
    programId: string;
    name: string;
    createdBy: string;
    rubricId: string;
    items: { examId: string; reference?: ReferenceAnswer }[];
    reads: { examId: string; reviewerId: string }[];
  },
): Promise<string> {
  const [set] = await trx("calibration_sets").insert({ program_id: s.programId, name: s.name, created_by: s.createdBy }).returning("id");
  await trx("calibration_items").insert(
    s.items.map((e, i) => ({ set_id: set.id, exam_id: e.examId, reference: e.reference ? JSON.stringify(e.reference) : null, position: i })),
  );
  await trx("assignments").insert(
    s.reads.map((r) => ({
      program_id: s.programId,
      exam_id: r.examId,
      kind: "calibration",
      state: "open",
      assigned_to: r.reviewerId,
      rubric_id: s.rubricId,
      calibration_set_id: set.id,
      priority: 2,
      due_at: trx.fn.now(),
    })),
  );
  return set.id as string;
}

/** The program's sets, newest first, with their exam count, reads sent and reads submitted. */
export async function listCalibrationSets(db: Q, programId: string) {
  const rows = await db("calibration_sets as c")
    .where("c.program_id", programId)
    .orderBy("c.created_at", "desc")
    .select(
      "c.id",
      "c.name",
      "c.created_at",
      db.raw(`(SELECT count(*)::int FROM calibration_items i WHERE i.set_id = c.id) AS exams`),
      db.raw(`(SELECT count(*)::int FROM assignments a WHERE a.calibration_set_id = c.id) AS reads`),
      db.raw(`(SELECT count(*)::int FROM assignments a WHERE a.calibration_set_id = c.id AND a.state = 'submitted') AS done`),
    );
  return rows.map((r) => ({
    id: r.id as string,
    name: r.name as string,
    createdAt: (r.created_at as Date).toISOString(),
    exams: r.exams as number,
    reads: r.reads as number,
    done: r.done as number,
  }));
}

export function findCalibrationSet(db: Q, programId: string, id: string): Promise<{ id: string; name: string } | undefined> {
  return db("calibration_sets").where({ id, program_id: programId }).first("id", "name");
}

export interface CalibrationItemRow {
  exam_id: string;
  reference: ReferenceAnswer | null;
  code: string;
  application_id: string;
  app_code: string;
  app_name: string;
}

/** A set's exams in the set's order, with their reference answers and applications. */
export function calibrationItems(db: Q, setId: string): Promise<CalibrationItemRow[]> {
  return db("calibration_items as i")
    .join("exams as e", "e.id", "i.exam_id")
    .join("applications as ap", "ap.id", "e.application_id")
    .where("i.set_id", setId)
    .orderBy("i.position")
    .select("i.exam_id", "i.reference", "e.code", "e.application_id", "ap.code as app_code", "ap.name as app_name");
}

export interface CalibrationReadRow {
  exam_id: string;
  reviewer_id: string;
  name: string;
  scores: Record<string, ScoreValue> | null;
  reads: { key: string; read: FindingRead }[] | null;
  rubric_id: string;
}

/** The submitted calibration reads of a set, with their reviewer's name. */
export function calibrationReads(db: Q, setId: string): Promise<CalibrationReadRow[]> {
  return db("reviews as r")
    .join("assignments as a", "a.id", "r.assignment_id")
    .join("users as u", "u.id", "r.reviewer_id")
    .where("a.calibration_set_id", setId)
    .select("r.exam_id", "r.reviewer_id", "u.name", "r.scores", "r.reads", "r.rubric_id");
}

/** The rubric version the set's reads were sent under. */
export async function calibrationRubricId(db: Q, setId: string): Promise<string | undefined> {
  return (await db("assignments").where("calibration_set_id", setId).first("rubric_id"))?.rubric_id;
}
