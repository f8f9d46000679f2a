// Confirmatory results (README "Progress and credentialing", "Accuracy"): entered later by
// the exam's sonographer or a QA lead, per finding; saving replaces the listed findings'
// entries (method null clears one) in one transaction with its audit entry.
import type { Db } from "../db/knex";
import type { AuthUser } from "../auth/types";
import type { Actor } from "./actor";
import { HttpError } from "../http/errors";
import { assertCanView } from "../policies/exam";
import { assertMayConfirm } from "../policies/progress";
import { feedbackExam } from "../repositories/feedback";
import { clearConfirmation, confirmationsOf, examFindingKeys, upsertConfirmation } from "../repositories/confirmations";
import { auditAs } from "../repositories/audit";
import type { z } from "zod";
import type { Confirmations, confirmationsInputSchema } from "../../shared/schemas/progress";

async function confirmableExam(db: Db, user: AuthUser, examId: string) {
  const exam = await feedbackExam(db, user.programId, examId);
  assertMayConfirm(await assertCanView(db, user, exam));
  return exam!;
}

export async function examConfirmations(db: Db, user: AuthUser, examId: string): Promise<Confirmations> {
  const exam = await confirmableExam(db, user, examId);
  return { items: await confirmationsOf(db, exam.id, exam.application_id) };
}

export async function saveConfirmations(
  db: Db,
  user: AuthUser,
  actor: Actor,
  examId: string,
  input: z.output<typeof confirmationsInputSchema>,
): Promise<Confirmations> {
  const exam = await confirmableExam(db, user, examId);
  if (exam.status === "draft") throw new HttpError(409, "exam_draft", "Confirmatory results can be entered once the exam is submitted");
  const findings = await examFindingKeys(db, exam.id);
  input.items.forEach((item, i) => {
    if (!findings.has(item.findingKey))
      throw new HttpError(400, "validation_failed", `items.${i}.findingKey: the exam has no finding "${item.findingKey}"`, [
        { path: `items.${i}.findingKey`, message: "not a finding of this exam" },
      ]);
  });
  return db.transaction(async (trx) => {
    for (const item of input.items)
      if (item.method === null) await clearConfirmation(trx, exam.id, item.findingKey);
      else
        await upsertConfirmation(trx, {
          programId: actor.programId,
          examId: exam.id,
          findingKey: item.findingKey,
          method: item.method,
          result: item.result,
          note: item.note,
          enteredBy: actor.userId,
        });
    await auditAs(trx, actor, { action: "confirmations.recorded", entityType: "exam", entityId: exam.id, details: { items: input.items } });
    return { items: await confirmationsOf(trx, exam.id, exam.application_id) };
  });
}
