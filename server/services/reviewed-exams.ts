// The reviewer's side of the sonographer's questions: the threads on exams the caller
// reviewed (a QA lead: every exam of the program), and one exam as its reviewer read it
// (blinded: never the sonographer), which marks the caller's question notifications for it read.
import type { Db } from "../db/knex";
import type { AuthUser } from "../auth/types";
import { examAccess } from "../policies/exam";
import { assertMayReadReviewedExam } from "../policies/review";
import { findExamWithApplication } from "../repositories/exams";
import { findingsOfApplication } from "../repositories/applications";
import { findFinalResult, latestDecidingReviewBy, questionThreads } from "../repositories/reviews";
import { getRubric } from "../repositories/rubrics";
import { markExamNotificationsRead } from "../repositories/notifications";

/** Question threads, newest message first: on exams the caller read, or for a QA lead every exam of the program. */
export function questionThreadsFor(db: Db, viewer: AuthUser) {
  return questionThreads(db, viewer.programId, viewer.roles.includes("qa_lead") ? null : viewer.id);
}

/** One exam as the caller reviewed it: the exam, their latest deciding read with its rubric and findings, and the final result. */
export async function reviewedExam(db: Db, viewer: AuthUser, examId: string) {
  const exam = await findExamWithApplication(db, viewer.programId, examId);
  // 404 rather than 403, as in policies/exam.ts: an id of an exam you did not read reveals nothing.
  // A calibration read alone gives no access: the final result is not its reader's to see.
  assertMayReadReviewedExam(await examAccess(db, viewer, exam, "thread"));
  const review = await latestDecidingReviewBy(db, viewer.programId, exam!.id, viewer.id);
  const [rubric, findings, result] = await Promise.all([
    review ? getRubric(db, viewer.programId, review.rubric_id) : Promise.resolve(undefined),
    findingsOfApplication(db, exam!.application_id),
    findFinalResult(db, viewer.programId, exam!.id),
  ]);
  await markExamNotificationsRead(db, viewer.id, exam!.id, "feedback_reply");
  return { exam: exam!, review, rubric, findings, result };
}
export type ReviewedExam = Awaited<ReturnType<typeof reviewedExam>>;
