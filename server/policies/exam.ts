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

/**
 * How the caller relates to the exam: its sonographer, a QA lead of the program, or a
 * reviewer holding (or having submitted) one of its assignments; null = may not see it.
 */
export async function examAccess(db: Knex | Knex.Transaction, user: AuthUser, exam: ExamRow | undefined): Promise<ExamAccess | null> {
  if (!exam || exam.program_id !== user.programId) return null;
  if (exam.sonographer_id === user.id) return "owner";
  if (user.roles.includes("qa_lead")) return "lead";
  if (!user.roles.includes("reviewer")) return null;
  const held = await db("assignments")
    .where("exam_id", exam.id)
    .where((q) => q.where("reviewer_id", user.id).orWhere("assigned_to", user.id))
    .whereIn("state", ["claimed", "submitted"])
    .first("id");
  return held ? "reviewer" : null;
}

export async function assertCanView<T extends ExamRow>(db: Knex | Knex.Transaction, user: AuthUser, exam: T | undefined): Promise<ExamAccess> {
  const access = await examAccess(db, user, exam);
  if (!access) throw notFound("Exam");
  return access;
}

/** Only the owner changes an exam, and only while it is a draft. */
export function assertCanEdit<T extends ExamRow>(user: AuthUser, exam: T | undefined): asserts exam is T {
  if (!exam || exam.program_id !== user.programId) throw notFound("Exam");
  if (exam.sonographer_id !== user.id) {
    if (user.roles.includes("qa_lead")) throw new HttpError(403, "forbidden", "Only the sonographer who performed the exam can change it");
    throw notFound("Exam");
  }
  if (exam.status !== "draft") throw new HttpError(409, "exam_not_draft", "This exam has been submitted and can no longer be changed");
}
