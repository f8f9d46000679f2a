// Reviews (submitted reads), their autosaved drafts, and each exam's final result
// (exam_results) with its per-finding outcomes, always scoped to the program.
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import type { Scores } from "../../shared/rubric/types";
import type { FindingRead } from "../../shared/catalogue";
import { DECIDING_READS, reviewerReads } from "../policies/exam";

type Q = Db | Knex.Transaction;
type Read = { key: string; read: FindingRead };

export interface ReviewRecord {
  id: string;
  program_id: string;
  assignment_id: string;
  exam_id: string;
  reviewer_id: string;
  rubric_id: string;
  scores: Scores;
  reads: Read[];
  feedback: string;
  time_spent_seconds: number;
  limited: boolean;
  credit: boolean;
  significant_disagreement: boolean;
  submitted_at: Date;
}

// Drafts -------------------------------------------------------------------------------

/** The autosaved draft of an assignment, if any. */
export const findDraft = (db: Q, assignmentId: string) =>
  db("review_drafts").where("assignment_id", assignmentId).first<{ data: unknown; updated_at: Date } | undefined>("data", "updated_at");

/** Stores the draft of an assignment (one per assignment), stamped with who wrote it. */
export async function saveDraft(trx: Knex.Transaction, assignmentId: string, data: Record<string, unknown> & { reviewerId: string }) {
  await trx("review_drafts")
    .insert({ assignment_id: assignmentId, data: JSON.stringify(data), updated_at: trx.fn.now() })
    .onConflict("assignment_id")
    .merge();
}

export async function deleteDraft(trx: Knex.Transaction, assignmentId: string) {
  await trx("review_drafts").where("assignment_id", assignmentId).delete();
}

/** Drops a draft left by a previous holder of an expired claim: it is theirs, not `reviewerId`'s. */
export async function deleteDraftOfOthers(trx: Knex.Transaction, assignmentId: string, reviewerId: string) {
  await trx("review_drafts").where("assignment_id", assignmentId).whereRaw(`data->>'reviewerId' IS DISTINCT FROM ?`, [reviewerId]).delete();
}

// Reviews ------------------------------------------------------------------------------

/** Stores a submitted read. */
export async function insertReview(
  trx: Knex.Transaction,
  r: {
    programId: string;
    assignmentId: string;
    examId: string;
    reviewerId: string;
    rubricId: string;
    scores: Scores;
    reads: Read[];
    feedback: string;
    timeSpentSeconds: number;
    limited: boolean;
    credit: boolean;
    significantDisagreement: boolean;
    /** The reason given with an urgent flag ("needs clinical follow-up now"), or null. */
    urgentReason?: string | null;
    at?: Date;
  },
): Promise<{ id: string; submitted_at: Date; credit: boolean }> {
  const [review] = await trx("reviews")
    .insert({
      program_id: r.programId,
      assignment_id: r.assignmentId,
      exam_id: r.examId,
      reviewer_id: r.reviewerId,
      rubric_id: r.rubricId,
      scores: JSON.stringify(r.scores),
      reads: JSON.stringify(r.reads),
      feedback: r.feedback,
      time_spent_seconds: r.timeSpentSeconds,
      limited: r.limited,
      urgent_reason: r.urgentReason ?? null,
      credit: r.credit,
      significant_disagreement: r.significantDisagreement,
      ...(r.at ? { submitted_at: r.at } : {}),
    })
    .returning(["id", "submitted_at", "credit"]);
  return review;
}

/** The exam's primary and second reads submitted so far, each with its assignment's kind. */
export function doubleReadsOf(trx: Q, examId: string) {
  return trx("reviews as r")
    .join("assignments as a", "a.id", "r.assignment_id")
    .where("r.exam_id", examId)
    .whereIn("a.kind", ["primary", "second"])
    .select<(ReviewRecord & { kind: "primary" | "second" })[]>("r.*", "a.kind");
}

/** The primary and second reads of the given exams with their reviewers' names (the adjudication screen). */
export function doubleReadsWithReviewers(db: Q, examIds: string[]) {
  return db("reviews as r")
    .join("assignments as a", "a.id", "r.assignment_id")
    .join("users as u", "u.id", "r.reviewer_id")
    .whereIn("r.exam_id", examIds)
    .whereIn("a.kind", ["primary", "second"])
    .select("r.exam_id", "a.kind", "u.name as reviewer", "u.id as reviewer_id", "r.scores", "r.reads", "r.feedback", "r.limited", "r.submitted_at") as Promise<
    {
      exam_id: string;
      kind: "primary" | "second";
      reviewer: string;
      reviewer_id: string;
      scores: Scores;
      reads: Read[];
      feedback: string;
      limited: boolean;
      submitted_at: Date;
    }[]
  >;
}

/** The caller's latest deciding read of an exam (a calibration read does not count). */
export function latestDecidingReviewBy(db: Q, programId: string, examId: string, reviewerId: string) {
  return db("reviews as v")
    .join("assignments as va", "va.id", "v.assignment_id")
    .where({ "v.exam_id": examId, "v.reviewer_id": reviewerId, "v.program_id": programId })
    .whereIn("va.kind", DECIDING_READS)
    .orderBy("v.submitted_at", "desc")
    .first<ReviewRecord | undefined>("v.*");
}

// Final results ------------------------------------------------------------------------

/** Writes (or replaces) the exam's final result. */
export async function writeFinalResult(
  trx: Knex.Transaction,
  r: {
    examId: string;
    programId: string;
    rubricId: string;
    scores: Scores;
    reads: Read[];
    source: "single_read" | "double_read_agreed" | "adjudicated";
    decidedBy: string | null;
    credit: boolean;
    /** Why it earned no credit, as decided (empty when it did). */
    reasons: string[];
    limited: boolean;
    note: string;
    at?: Date;
  },
) {
  await trx("exam_results")
    .insert({
      exam_id: r.examId,
      program_id: r.programId,
      rubric_id: r.rubricId,
      scores: JSON.stringify(r.scores),
      reads: JSON.stringify(r.reads),
      source: r.source,
      decided_by: r.decidedBy,
      credit: r.credit,
      credit_reasons: r.reasons,
      limited: r.limited,
      note: r.note,
      decided_at: r.at ?? trx.fn.now(),
    })
    .onConflict("exam_id")
    .merge();
}

/** Replaces the exam's per-finding outcomes (the sonographer's read against the final read). */
export async function replaceFindingOutcomes(
  trx: Knex.Transaction,
  examId: string,
  rows: { finding_key: string; sonographer_read: FindingRead; reference_read: FindingRead; outcome: string }[],
) {
  await trx("finding_outcomes").where("exam_id", examId).delete();
  if (rows.length) await trx("finding_outcomes").insert(rows.map((r) => ({ exam_id: examId, ...r })));
}

/** The exam's final result, if decided. */
export const findFinalResult = (db: Q, programId: string, examId: string) =>
  db("exam_results")
    .where({ exam_id: examId, program_id: programId })
    .first<{ credit: boolean; source: "single_read" | "double_read_agreed" | "adjudicated"; decided_at: Date } | undefined>("credit", "source", "decided_at");

// Questions to reviewers -----------------------------------------------------------------

/**
 * Exams with a question thread, newest message first (at most 200): every exam of the
 * program, or with `reviewerId` only those that reviewer read (a deciding read).
 */
export function questionThreads(db: Q, programId: string, reviewerId: string | null) {
  const threads = db("feedback_messages")
    .where("program_id", programId)
    .groupBy("exam_id")
    .select("exam_id")
    .count("* as n")
    .max("created_at as last_at")
    .as("t");
  const q = db("exams as e")
    .join("applications as ap", "ap.id", "e.application_id")
    .join(threads, "t.exam_id", "e.id")
    .where("e.program_id", programId)
    .orderBy("t.last_at", "desc")
    .limit(200)
    .select(
      "e.id",
      "e.code",
      "ap.code as app_code",
      "ap.name as app_name",
      "t.n",
      "t.last_at",
      // Compared in SQL so the sonographer's id never leaves the database.
      db.raw(
        `(SELECT lm.author_id = e.sonographer_id FROM feedback_messages lm WHERE lm.exam_id = e.id
          ORDER BY lm.created_at DESC, lm.id DESC LIMIT 1) AS last_from_sonographer`,
      ),
    );
  if (reviewerId) q.whereExists(reviewerReads(db, reviewerId, "thread", db.ref("e.id")));
  return q as unknown as Promise<
    { id: string; code: string; app_code: string; app_name: string; n: string | number; last_at: Date | string; last_from_sonographer: boolean | null }[]
  >;
}

/** Exams the reviewer read (a deciding read) whose thread ends with a question from the sonographer (home). */
export async function countQuestionsAwaitingAnswer(db: Q, programId: string, reviewerId: string): Promise<number> {
  const [r] = await db("exams as e")
    .where("e.program_id", programId)
    .whereExists(reviewerReads(db, reviewerId, "thread", db.ref("e.id")))
    .whereRaw(`(SELECT m.author_id = e.sonographer_id FROM feedback_messages m WHERE m.exam_id = e.id ORDER BY m.created_at DESC, m.id DESC LIMIT 1) IS TRUE`)
    .count<{ c: string }[]>("* as c");
  return Number(r.c);
}
