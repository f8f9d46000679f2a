// Feedback on reviewed exams (README "Review rules", "Feedback"): a sonographer's exams with a
// final result, the deciding reads' comments, each finding's outcome, the program's advice
// snippets, and the acknowledgement. Always scoped to the program and the sonographer.
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import { DECIDING_READS } from "../policies/exam";
import type { ExamSetting, FindingRead, Orientation } from "../../shared/catalogue";
import type { Scores } from "../../shared/rubric/types";
import type { Outcome } from "../../shared/schemas/feedback";

type Q = Db | Knex.Transaction;

/** A reviewed exam joined to its application and its final result. */
export interface ReviewedExamRow {
  id: string;
  code: string;
  setting: ExamSetting;
  performed_at: Date;
  feedback_acknowledged_at: Date | null;
  app_code: string;
  app_name: string;
  application_id: string;
  app_version: number;
  app_orientation: Orientation;
  app_cautions: string[];
  scores: Scores;
  credit: boolean;
  credit_reasons: string[];
  limited: boolean;
  source: "single_read" | "double_read_agreed" | "adjudicated";
  decided_at: Date;
  rubric_id: string;
  note: string | null;
}

const reviewedOf = (db: Q, programId: string, sonographerId: string) =>
  db("exams as e")
    .join("applications as ap", "ap.id", "e.application_id")
    .join("exam_results as r", "r.exam_id", "e.id")
    .where({ "e.program_id": programId, "e.sonographer_id": sonographerId, "e.status": "reviewed" });

/** The sonographer's reviewed exams: one (`examId`), or the newest `limit` by the day decided. */
export function reviewedExams(db: Q, programId: string, sonographerId: string, pick: { examId: string } | { newest: number }): Promise<ReviewedExamRow[]> {
  const q = reviewedOf(db, programId, sonographerId);
  if ("examId" in pick) q.where("e.id", pick.examId);
  else q.orderBy("r.decided_at", "desc").limit(pick.newest);
  return q.select(
    "e.id",
    "e.code",
    "e.setting",
    "e.performed_at",
    "e.feedback_acknowledged_at",
    "ap.code as app_code",
    "ap.name as app_name",
    "e.application_id",
    "ap.version as app_version",
    "ap.orientation as app_orientation",
    "ap.cautions as app_cautions",
    "r.scores",
    "r.credit",
    "r.credit_reasons",
    "r.limited",
    "r.source",
    "r.decided_at",
    "r.rubric_id",
    "r.note",
  );
}

/** One reviewed exam of the sonographer with its acknowledgement, or undefined. */
export function reviewedExamAcknowledgement(
  db: Q,
  programId: string,
  sonographerId: string,
  examId: string,
): Promise<{ id: string; feedback_acknowledged_at: Date | null } | undefined> {
  return reviewedOf(db, programId, sonographerId).where("e.id", examId).first("e.id", "e.feedback_acknowledged_at");
}

/** The sonographer has read the feedback. */
export async function markFeedbackAcknowledged(db: Q, examId: string, at: Date): Promise<void> {
  await db("exams").where("id", examId).update({ feedback_acknowledged_at: at });
}

/** The comments of the exams' deciding reads (a calibration read's comment is for the QA lead, not the learner), oldest first. */
export function decidingComments(db: Q, examIds: string[]): Promise<{ exam_id: string; name: string; feedback: string; submitted_at: Date }[]> {
  return db("reviews as v")
    .join("users as u", "u.id", "v.reviewer_id")
    .join("assignments as va", "va.id", "v.assignment_id")
    .whereIn("va.kind", DECIDING_READS)
    .whereIn("v.exam_id", examIds)
    .orderBy("v.submitted_at")
    .select("v.exam_id", "u.name", "v.feedback", "v.submitted_at");
}

/** Each finding's outcome (the sonographer's read against the final read), in the application's order. */
export function findingOutcomesOf(
  db: Q,
  examIds: string[],
): Promise<{ exam_id: string; key: string; label: string; yourRead: FindingRead; referenceRead: FindingRead; outcome: Outcome }[]> {
  return db("finding_outcomes as o")
    .join("exams as x", "x.id", "o.exam_id")
    .join("application_findings as f", function () {
      this.on("f.key", "=", "o.finding_key").andOn("f.application_id", "=", "x.application_id");
    })
    .whereIn("o.exam_id", examIds)
    .orderBy("f.position")
    .select("o.exam_id", "o.finding_key as key", "f.label", "o.sonographer_read as yourRead", "o.reference_read as referenceRead", "o.outcome");
}

/** The program's advice snippets that belong to a criterion, oldest first. */
export function criterionSnippets(db: Q, programId: string): Promise<{ criterion_key: string; text: string }[]> {
  return db("snippets").where("program_id", programId).whereNotNull("criterion_key").orderBy("created_at").select("criterion_key", "text");
}

/** The exam as its question thread and confirmatory results need it (scoped to the program), or undefined. */
export function feedbackExam(
  db: Q,
  programId: string,
  examId: string,
): Promise<{ id: string; program_id: string; sonographer_id: string; status: string; code: string; application_id: string } | undefined> {
  return db("exams").where({ id: examId, program_id: programId }).first("id", "program_id", "sonographer_id", "status", "code", "application_id");
}
