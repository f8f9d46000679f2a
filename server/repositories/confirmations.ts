// Confirmatory results (README "Progress and credentialing", "Accuracy"): what a later test
// (CT, formal echo, surgery, clinical follow-up, or none) showed for each finding of an exam.
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import type { Confirmation, ConfirmationMethod } from "../../shared/schemas/progress";

type Q = Db | Knex.Transaction;

/** Every finding the exam's sonographer read, in the application's order, with what was entered for it. */
export async function confirmationsOf(db: Q, examId: string, applicationId: string): Promise<Confirmation[]> {
  const rows = await db("application_findings as af")
    .join("exam_findings as f", function () {
      this.on("f.finding_key", "=", "af.key").andOnVal("f.exam_id", "=", examId);
    })
    .leftJoin("confirmations as c", function () {
      this.on("c.finding_key", "=", "af.key").andOnVal("c.exam_id", "=", examId);
    })
    .leftJoin("users as u", "u.id", "c.entered_by")
    .where("af.application_id", applicationId)
    .orderBy("af.position")
    .select("af.key", "af.label", "f.read", "c.method", "c.result", "c.note", "c.entered_at", "u.name as entered_by");
  return rows.map((r) => ({
    findingKey: r.key,
    label: r.label,
    sonographerRead: r.read,
    method: r.method ?? null,
    result: r.result ?? null,
    note: r.note ?? "",
    enteredBy: r.entered_by ?? null,
    enteredAt: r.entered_at ? r.entered_at.toISOString() : null,
  }));
}

/** The keys of the findings the exam's sonographer read. */
export async function examFindingKeys(db: Q, examId: string): Promise<Set<string>> {
  return new Set(await db("exam_findings").where("exam_id", examId).pluck("finding_key"));
}

/** Records (or replaces) what the confirmatory test showed for one finding. */
export async function upsertConfirmation(
  db: Q,
  c: {
    programId: string;
    examId: string;
    findingKey: string;
    method: ConfirmationMethod;
    result: "positive" | "negative" | null;
    note: string;
    enteredBy: string;
  },
): Promise<void> {
  await db("confirmations")
    .insert({
      exam_id: c.examId,
      program_id: c.programId,
      finding_key: c.findingKey,
      method: c.method,
      result: c.result,
      note: c.note,
      entered_by: c.enteredBy,
      entered_at: db.fn.now(),
    })
    .onConflict(["exam_id", "finding_key"])
    .merge();
}

/** Clears what was entered for one finding. */
export async function clearConfirmation(db: Q, examId: string, findingKey: string): Promise<void> {
  await db("confirmations").where({ exam_id: examId, finding_key: findingKey }).delete();
}

/** Confirmations of the given exams with the sonographer's read of each finding (progress accuracy). */
export function confirmedReadsOf(
  db: Q,
  examIds: string[],
): Promise<{ exam_id: string; method: string; result: "positive" | "negative" | null; read: "positive" | "negative" | "indeterminate" }[]> {
  return db("confirmations as c")
    .join("exam_findings as f", function () {
      this.on("f.exam_id", "=", "c.exam_id").andOn("f.finding_key", "=", "c.finding_key");
    })
    .whereIn("c.exam_id", examIds)
    .select("c.exam_id", "c.method", "c.result", "f.read");
}
