// Follow-ups of clinically significant disagreements (opened when an exam is settled) and
// their progress: open → in progress → closed, by a QA lead of the program.
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import type { FollowUp, FollowUpStatus } from "../../shared/schemas/follow-ups";

type Q = Db | Knex.Transaction;

/** The program's follow-ups, newest first, optionally of one status, with exam and people named. */
export async function listFollowUps(db: Q, programId: string, status?: FollowUpStatus): Promise<FollowUp[]> {
  const q = db("follow_ups as f")
    .join("exams as e", "e.id", "f.exam_id")
    .join("applications as ap", "ap.id", "e.application_id")
    .join("users as s", "s.id", "e.sonographer_id")
    .leftJoin("users as c", "c.id", "f.closed_by")
    .where("f.program_id", programId);
  if (status) q.andWhere("f.status", status);
  const rows = await q
    .orderBy("f.created_at", "desc")
    .select("f.*", "e.code", "e.performed_at", "ap.name as application", "s.name as sonographer", "c.name as closed_by_name");
  return rows.map((r) => ({
    id: r.id,
    examId: r.exam_id,
    examCode: r.code,
    application: r.application,
    sonographer: r.sonographer,
    performedAt: r.performed_at.toISOString(),
    reason: r.reason,
    status: r.status,
    note: r.note,
    createdAt: r.created_at.toISOString(),
    closedAt: r.closed_at?.toISOString() ?? null,
    closedBy: r.closed_by_name ?? null,
  }));
}

/** Follow-ups of the program not closed yet. */
export async function countOpenFollowUps(db: Q, programId: string): Promise<number> {
  const [r] = await db("follow_ups").where("program_id", programId).whereNot("status", "closed").count<{ c: string }[]>("* as c");
  return Number(r.c);
}

/**
 * Moves a follow-up to `status` (closing records who and when; any other status clears
 * them), and changes its note when one is given. Undefined when the program has no such follow-up.
 */
export async function setFollowUpStatus(
  db: Q,
  programId: string,
  id: string,
  change: { status: FollowUpStatus; note?: string; by: string },
): Promise<{ id: string; status: FollowUpStatus } | undefined> {
  const closing = change.status === "closed";
  const [row] = await db("follow_ups")
    .where({ id, program_id: programId })
    .update({
      status: change.status,
      ...(change.note !== undefined ? { note: change.note } : {}),
      closed_at: closing ? db.fn.now() : null,
      closed_by: closing ? change.by : null,
    })
    .returning(["id", "status"]);
  return row;
}

/** Opens a follow-up of a clinically significant disagreement found when the exam was settled. */
export async function openFollowUp(trx: Knex.Transaction, f: { programId: string; examId: string; reviewId: string | null; reason: string }) {
  await trx("follow_ups").insert({ program_id: f.programId, exam_id: f.examId, review_id: f.reviewId, reason: f.reason });
}
