// The queries behind learner progress, the roster and the credentialing report (README
// "Progress and credentialing"): a program's sonographers, their non-draft exams with the
// final result, the outcomes of their reads, and the roster's open follow-ups.
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import type { FindingRead } from "../../shared/catalogue";
import type { Scores } from "../../shared/rubric/types";

type Q = Db | Knex.Transaction;

export interface ProgressRange {
  from?: string;
  to?: string;
}

export interface ProgressExamRow {
  id: string;
  sonographer_id: string;
  application_id: string;
  /** The application's code (the same across its versions). */
  application_code: string;
  status: string;
  performed_at: Date;
  submitted_at: Date;
  credit: boolean | null;
  setting: "clinical" | "educational" | "simulated";
  limited: boolean | null;
  /** The final read has a positive finding. */
  positive: boolean | null;
  scores: Scores | null;
  rubric_id: string | null;
  acknowledged: boolean;
}

/** The active sonographers of the program (the learners progress is kept for), by name. */
export function programSonographers(db: Q, programId: string): Promise<{ id: string; name: string; email: string; created_at: Date }[]> {
  return db("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .where("m.program_id", programId)
    .whereNull("m.deactivated_at")
    .whereRaw(`'sonographer' = ANY(m.roles)`)
    .orderBy("u.name")
    .select("u.id", "u.name", "u.email", "m.created_at");
}

/** Whether the user is a sonographer of the program (active or not: history stays readable). */
export async function isProgramSonographer(db: Q, programId: string, userId: string): Promise<boolean> {
  const member = await db("memberships").where({ program_id: programId, user_id: userId }).whereRaw(`'sonographer' = ANY(roles)`).first("id");
  return !!member;
}

export function peopleByIds(db: Q, userIds: string[]): Promise<{ id: string; name: string; email: string }[]> {
  return db("users").whereIn("id", userIds).select("id", "name", "email");
}

/** The published version of each of the program's applications in catalogue order, inactive ones included. */
export function programApplications(db: Q, programId: string): Promise<ProgressApplicationRow[]> {
  return db("applications")
    .where({ program_id: programId, status: "published" })
    .orderBy([{ column: "position" }, { column: "name" }])
    .select("id", "code", "name", "active", "credit_threshold", "credit_non_clinical_cap", "credit_min_positive", "credit_require_complete");
}

export interface ProgressApplicationRow {
  id: string;
  code: string;
  name: string;
  active: boolean;
  credit_threshold: number | null;
  credit_non_clinical_cap: number | null;
  credit_min_positive: number;
  credit_require_complete: boolean;
}

/**
 * The sonographers' non-draft exams in the order performed, with their final result when
 * there is one. The range is on the day the exam was performed; `to` includes its whole day (UTC).
 */
export function progressExams(db: Q, programId: string, userIds: string[], { from, to }: ProgressRange): Promise<ProgressExamRow[]> {
  const q = db("exams as e")
    .join("applications as ap", "ap.id", "e.application_id")
    .leftJoin("exam_results as r", "r.exam_id", "e.id")
    .where("e.program_id", programId)
    .whereIn("e.sonographer_id", userIds)
    .whereNot("e.status", "draft")
    .orderBy([{ column: "e.performed_at" }, { column: "e.submitted_at" }, { column: "e.id" }])
    .select(
      "e.id",
      "e.sonographer_id",
      "e.application_id",
      "ap.code as application_code",
      "e.status",
      "e.performed_at",
      "e.submitted_at",
      "r.credit",
      "e.setting",
      "r.limited",
      db.raw(`EXISTS (SELECT 1 FROM jsonb_array_elements(r.reads) x WHERE x->>'read' = 'positive') AS positive`),
      "r.scores",
      "r.rubric_id",
      db.raw("e.feedback_acknowledged_at IS NOT NULL as acknowledged"),
    );
  if (from) q.where("e.performed_at", ">=", `${from}T00:00:00Z`);
  if (to) q.whereRaw(`e.performed_at < (?::date + 1)`, [to]);
  return q;
}

/** The sonographer's and the final read of each finding of the given exams. */
export function readOutcomesOf(db: Q, examIds: string[]): Promise<{ exam_id: string; sonographer_read: FindingRead; reference_read: FindingRead }[]> {
  return db("finding_outcomes").whereIn("exam_id", examIds).select("exam_id", "sonographer_read", "reference_read");
}

/** Sonographers of the program with a disagreement follow-up not yet closed. */
export async function sonographersWithOpenFollowUps(db: Q, programId: string): Promise<Set<string>> {
  return new Set(
    await db("follow_ups as f")
      .join("exams as e", "e.id", "f.exam_id")
      .where("f.program_id", programId)
      .whereNot("f.status", "closed")
      .distinct()
      .pluck("e.sonographer_id"),
  );
}

export async function programName(db: Q, programId: string): Promise<string> {
  const program = await db("programs").where("id", programId).first("name");
  return program.name;
}
