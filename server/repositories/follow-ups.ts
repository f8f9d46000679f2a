// Follow-ups of clinically significant disagreements (opened when an exam is settled) and
// their progress: open → in progress → closed, by a QA lead of the program.
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import type { FollowUp, FollowUpOutcome, FollowUpStatus } from "../../shared/schemas/follow-ups";

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
    // Urgent and overdue first: what needs someone now.
    .orderByRaw("(f.status <> 'closed' AND f.urgent) DESC, (f.status <> 'closed' AND f.due_at < now()) DESC, f.created_at DESC")
    .select(
      "f.*",
      "e.code",
      "e.performed_at",
      db.raw("e.encounter_ref_sealed IS NOT NULL as has_encounter_ref"),
      "ap.name as application",
      "s.name as sonographer",
      "c.name as closed_by_name",
    );
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
    urgent: r.urgent,
    outcome: r.outcome ?? null,
    actedAt: r.acted_at?.toISOString() ?? null,
    actedBy: r.acted_by,
    dueAt: r.due_at.toISOString(),
    overdue: r.status !== "closed" && r.due_at.getTime() < Date.now(),
    hasEncounterRef: Boolean(r.has_encounter_ref),
  }));
}

/** Follow-ups of the program not closed yet. */
export async function countOpenFollowUps(db: Q, programId: string): Promise<number> {
  const [r] = await db("follow_ups").where("program_id", programId).whereNot("status", "closed").count<{ c: string }[]>("* as c");
  return Number(r.c);
}

/**
 * Moves a follow-up to `status`. Closing records the outcome, when and by whom it was acted
 * on, and who recorded it; any other status clears the closing. The note changes when given.
 * Undefined when the program has no such follow-up.
 */
export async function setFollowUpStatus(
  db: Q,
  programId: string,
  id: string,
  change: { status: FollowUpStatus; note?: string; outcome?: FollowUpOutcome | null; actedAt?: string | null; actedBy?: string; by: string },
): Promise<{ id: string; status: FollowUpStatus } | undefined> {
  const closing = change.status === "closed";
  const [row] = await db("follow_ups")
    .where({ id, program_id: programId })
    .update({
      status: change.status,
      ...(change.note !== undefined ? { note: change.note } : {}),
      closed_at: closing ? db.fn.now() : null,
      closed_by: closing ? change.by : null,
      outcome: closing ? change.outcome : (change.outcome ?? null),
      acted_at: change.actedAt ? new Date(change.actedAt) : closing ? db.fn.now() : null,
      acted_by: change.actedBy ?? "",
    })
    .returning(["id", "status"]);
  return row;
}

/**
 * Opens a follow-up of an exam, or joins the one already open: a second reason (an urgent
 * flag, then the settled disagreement) is added to the open follow-up's reason rather than
 * opening another. An urgent one is due sooner; the due time never moves later.
 */
export async function openFollowUp(
  trx: Knex.Transaction,
  f: { programId: string; examId: string; reviewId: string | null; reason: string; dueHours: number; urgent?: boolean; flaggedBy?: string },
): Promise<{ id: string; created: boolean }> {
  const open = await trx("follow_ups").where({ program_id: f.programId, exam_id: f.examId }).whereNot("status", "closed").forUpdate().first("id", "reason");
  const due = trx.raw(`now() + make_interval(hours => ?)`, [f.dueHours]);
  if (open) {
    await trx("follow_ups")
      .where("id", open.id)
      .update({
        reason: `${open.reason}\n${f.reason}`,
        ...(f.urgent ? { urgent: true, flagged_by: f.flaggedBy ?? null } : {}),
        due_at: trx.raw(`least(due_at, now() + make_interval(hours => ?))`, [f.dueHours]),
      });
    return { id: open.id, created: false };
  }
  const [row] = await trx("follow_ups")
    .insert({
      program_id: f.programId,
      exam_id: f.examId,
      review_id: f.reviewId,
      reason: f.reason,
      urgent: f.urgent ?? false,
      flagged_by: f.flaggedBy ?? null,
      due_at: due,
    })
    .returning("id");
  return { id: row.id, created: true };
}

/** Counts by outcome, time to closure and overdue ones, for the Program screen (closed in the range; open now). */
export async function followUpReport(db: Q, programId: string, range: { from: Date; to: Date }) {
  const closed = await db("follow_ups")
    .where("program_id", programId)
    .where("status", "closed")
    .whereBetween("closed_at", [range.from, range.to])
    .groupByRaw("coalesce(outcome, 'unrecorded')")
    .select(db.raw("coalesce(outcome, 'unrecorded') as outcome"))
    .count<{ outcome: string; count: string }[]>("* as count");
  const [times] = await db("follow_ups")
    .where("program_id", programId)
    .where("status", "closed")
    .whereBetween("closed_at", [range.from, range.to])
    .select(
      db.raw("percentile_cont(0.5) within group (order by extract(epoch from closed_at - created_at) / 3600) as median_hours"),
      db.raw("percentile_cont(0.9) within group (order by extract(epoch from closed_at - created_at) / 3600) as p90_hours"),
      db.raw("count(*) filter (where urgent) as urgent_closed"),
      db.raw("count(*) filter (where closed_at > due_at) as closed_late"),
    );
  const [open] = await db("follow_ups")
    .where("program_id", programId)
    .whereNot("status", "closed")
    .select(db.raw("count(*) as open"), db.raw("count(*) filter (where due_at < now()) as overdue"), db.raw("count(*) filter (where urgent) as urgent"));
  return {
    byOutcome: closed.map((c) => ({ outcome: c.outcome, count: Number(c.count) })),
    medianHoursToClose: times.median_hours === null ? null : Number(times.median_hours),
    p90HoursToClose: times.p90_hours === null ? null : Number(times.p90_hours),
    closedLate: Number(times.closed_late),
    urgentClosed: Number(times.urgent_closed),
    open: Number(open.open),
    openOverdue: Number(open.overdue),
    openUrgent: Number(open.urgent),
  };
}
