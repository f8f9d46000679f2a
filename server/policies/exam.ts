// Who may do what to an exam. Not being allowed to see an exam answers 404, so ids of other
// people's exams (or other programs') reveal nothing.
import type { Knex } from "knex";
import { HttpError, notFound } from "../http/errors";
import type { AuthUser } from "../auth/types";

export interface ExamRow {
  id: string;
  program_id: string;
  sonographer_id: string;
  status: string;
}

export type ExamAccess = "owner" | "lead" | "reviewer";

/** Reads that decide an exam. A calibration read only measures its reader and never counts here. */
export const DECIDING_READS = ["primary", "second", "adjudication"] as const;

/**
 * What the relation is needed for: `view` = the blinded exam and its clip media (a live claim,
 * a submitted read of any kind, an adjudication handed to the caller); `thread` = the learner's
 * question thread, the final result and question notifications (a submitted deciding read only).
 */
export type ReviewerPurpose = "view" | "thread";

/**
 * The one rule for "is this user a reviewer of this exam": the caller's assignments on the
 * exam that count for `purpose`, as a subquery (use with whereExists). `examId` is an id or a
 * column reference of the outer query (`db.ref("e.id")`). A claim whose lease ran out went back
 * to the queue and gives nothing.
 */
export function reviewerReads(db: Knex | Knex.Transaction, userId: string, purpose: ReviewerPurpose, examId: string | Knex.Ref<string, object>) {
  const q = db("assignments as ra").where("ra.exam_id", examId).select(db.raw("1"));
  if (purpose === "thread") return q.where({ "ra.reviewer_id": userId, "ra.state": "submitted" }).whereIn("ra.kind", DECIDING_READS);
  return q.where((w) =>
    w
      .where({ "ra.reviewer_id": userId, "ra.state": "submitted" })
      .orWhere((c) => c.where({ "ra.reviewer_id": userId, "ra.state": "claimed" }).andWhere("ra.lease_expires_at", ">", db.fn.now()))
      .orWhere((h) => h.where({ "ra.assigned_to": userId, "ra.kind": "adjudication" }).whereIn("ra.state", ["open", "claimed"])),
  );
}

/** The users who are reviewers of the exam's thread (as reviewerReads "thread"), joined as `u`. */
export const threadReviewers = (db: Knex | Knex.Transaction, examId: string) =>
  db("assignments as ra")
    .join("users as u", "u.id", "ra.reviewer_id")
    .where({ "ra.exam_id": examId, "ra.state": "submitted" })
    .whereIn("ra.kind", DECIDING_READS);

/**
 * How the caller relates to the exam: its sonographer, a QA lead of the program, or a
 * reviewer of it for `purpose` (see reviewerReads); null = may not see it.
 */
export async function examAccess(
  db: Knex | Knex.Transaction,
  user: AuthUser,
  exam: ExamRow | undefined,
  purpose: ReviewerPurpose = "view",
): Promise<ExamAccess | null> {
  if (!exam || exam.program_id !== user.programId) return null;
  if (exam.sonographer_id === user.id) return "owner";
  if (user.roles.includes("qa_lead")) return "lead";
  if (!user.roles.includes("reviewer")) return null;
  const held = await db.first(db.raw("exists (?) as held", [reviewerReads(db, user.id, purpose, exam.id)]));
  return held?.held ? "reviewer" : null;
}

export async function assertCanView<T extends ExamRow>(
  db: Knex | Knex.Transaction,
  user: AuthUser,
  exam: T | undefined,
  purpose: ReviewerPurpose = "view",
): Promise<ExamAccess> {
  const access = await examAccess(db, user, exam, purpose);
  if (!access) throw notFound("Exam");
  return access;
}

/** Only the owner changes an exam, and only while it is a draft. */
export function assertCanEdit<T extends ExamRow>(user: AuthUser, exam: T | undefined): asserts exam is T {
  if (!exam || exam.program_id !== user.programId) throw notFound("Exam");
  if (exam.sonographer_id !== user.id) {
    if (user.roles.includes("qa_lead")) throw new HttpError(403, "forbidden", "Only the clinician who performed the exam can change it");
    throw notFound("Exam");
  }
  if (exam.status !== "draft") throw new HttpError(409, "exam_not_draft", "This exam has been submitted and can no longer be changed");
}

/** The exam a clip belongs to (a row of findClipWithExam), as the rules above see it. */
export const examOfClip = (c: { exam_id: string; exam_program_id: string; sonographer_id: string; exam_status: string }): ExamRow => ({
  id: c.exam_id,
  program_id: c.exam_program_id,
  sonographer_id: c.sonographer_id,
  status: c.exam_status,
});

/** Only the owner changes a clip, and only while its exam is a draft (as assertCanEdit). */
export function assertCanEditClip<T extends { exam_id: string; exam_program_id: string; sonographer_id: string; exam_status: string }>(
  user: AuthUser,
  clip: T | undefined,
): asserts clip is T {
  if (!clip) throw notFound("Clip");
  assertCanEdit(user, examOfClip(clip));
}

/** Whether the reviewer's own read of the exam is in: until it is, they see none of the sonographer's reads. */
export async function reviewerReadIsIn(db: Knex | Knex.Transaction, reviewerId: string, examId: string): Promise<boolean> {
  return !!(await db("reviews").where({ exam_id: examId, reviewer_id: reviewerId }).first("id"));
}
