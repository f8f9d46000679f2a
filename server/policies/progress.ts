// Who may see whose progress and feedback (README "Progress and credentialing"): a
// sonographer only their own; a QA lead every sonographer of the program. Unknown people
// answer 404, so ids of users outside the program reveal nothing.
import type { Knex } from "knex";
import { forbidden, notFound } from "../http/errors";
import type { AuthUser } from "../auth/types";
import type { ExamAccess } from "./exam";
import { isProgramSonographer } from "../repositories/progress";

/** 404 unless the user is a sonographer of the program (active or not: history stays readable). */
export async function assertProgramSonographer(db: Knex | Knex.Transaction, programId: string, userId: string): Promise<void> {
  if (!(await isProgramSonographer(db, programId, userId))) throw notFound("Clinician");
}

/**
 * Whose credentialing report the caller may export: a QA lead anyone of the program (the
 * whole program without `userId`, answered as null), a sonographer only themself.
 */
export async function credentialingReportSubject(db: Knex | Knex.Transaction, user: AuthUser, userId: string | undefined): Promise<string | null> {
  if (!user.roles.includes("qa_lead")) {
    if (userId && userId !== user.id) throw forbidden("A clinician may export only their own report");
    return user.id;
  }
  if (!userId) return null;
  await assertProgramSonographer(db, user.programId, userId);
  return userId;
}

/** Confirmatory results are the exam's sonographer's and the QA leads' business; a reviewer gets 404. */
export function assertMayConfirm(access: ExamAccess): void {
  if (access === "reviewer") throw notFound("Exam");
}
