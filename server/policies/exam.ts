// Who may do what to an exam. Not being allowed to see an exam answers 404, so ids of other
// people's exams (or other programs') reveal nothing.
import { HttpError, notFound } from "../http/errors";
import type { AuthUser } from "../auth/types";

export interface ExamRow {
  id: string;
  program_id: string;
  sonographer_id: string;
  status: string;
}

/** The owner and the program's QA leads see an exam (assigned reviewers come with the queue). */
export function canViewExam(user: AuthUser, exam: ExamRow): boolean {
  if (exam.program_id !== user.programId) return false;
  return exam.sonographer_id === user.id || user.roles.includes("qa_lead");
}

export function assertCanView<T extends ExamRow>(user: AuthUser, exam: T | undefined): asserts exam is T {
  if (!exam || !canViewExam(user, exam)) throw notFound("Exam");
}

/** Only the owner changes an exam, and only while it is a draft. */
export function assertCanEdit<T extends ExamRow>(user: AuthUser, exam: T | undefined): asserts exam is T {
  assertCanView(user, exam);
  if (exam.sonographer_id !== user.id) throw new HttpError(403, "forbidden", "Only the sonographer who performed the exam can change it");
  if (exam.status !== "draft") throw new HttpError(409, "exam_not_draft", "This exam has been submitted and can no longer be changed");
}

/** Whether the viewer may see who performed the exam (the owner and QA leads may). */
export const mayIdentifySonographer = (user: AuthUser, exam: ExamRow) => exam.sonographer_id === user.id || user.roles.includes("qa_lead");
