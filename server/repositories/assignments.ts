// Assignments: the reads of an exam (primary, second, adjudication, calibration) and the
// lease a reviewer holds on one, always scoped to the program. The state transitions are
// named after what happens (claim, releaseAssignment, extendLease, reassign, markSubmitted);
// every lease is measured by the database clock, the one the queue uses.
import type { Knex } from "knex";
import type { Db } from "../db/knex";

type Q = Db | Knex.Transaction;

/** Reads a reviewer takes from the queue ("Start next"); an adjudication is decided elsewhere. */
export const QUEUE_KINDS = ["primary", "second", "calibration"] as const;
/** An adjudication still waiting for its decision. */
const UNDECIDED = ["open", "claimed"] as const;

export interface AssignmentRecord {
  id: string;
  program_id: string;
  exam_id: string;
  kind: "primary" | "second" | "adjudication" | "calibration";
  state: "open" | "claimed" | "submitted" | "cancelled";
  reviewer_id: string | null;
  assigned_to: string | null;
  rubric_id: string | null;
  claimed_at: Date | null;
  lease_expires_at: Date | null;
  due_at: Date;
  submitted_at: Date | null;
  /** The lease has run out (or there is none), by the database clock. */
  lease_over: boolean;
}

const leaseUntil = (db: Q, leaseMinutes: number) => db.raw(`now() + make_interval(mins => ?)`, [leaseMinutes]);

/** One assignment of the program with `lease_over`; `lock` takes its row lock (inside a transaction). */
export function findAssignment(db: Q, programId: string, id: string, opts: { lock?: boolean } = {}) {
  const q = db("assignments")
    .where({ id, program_id: programId })
    .first<AssignmentRecord | undefined>(["*", db.raw("(lease_expires_at IS NULL OR lease_expires_at <= now()) AS lease_over")]);
  if (opts.lock) q.forUpdate();
  return q;
}

/**
 * The reads a reviewer could claim now (assignments `a` joined to exams `e` and applications
 * `ap`): first or second reads that are open or whose claim ran out, not handed to someone
 * else, not of the reviewer's own exams, and not of an exam the reviewer already reads.
 */
export function claimable(db: Q, programId: string, reviewerId: string) {
  return (
    db("assignments as a")
      .join("exams as e", "e.id", "a.exam_id")
      .join("applications as ap", "ap.id", "e.application_id")
      .where("a.program_id", programId)
      .whereIn("a.kind", QUEUE_KINDS)
      .where((q) => q.where("a.state", "open").orWhere((q2) => q2.where("a.state", "claimed").andWhere("a.lease_expires_at", "<=", db.fn.now())))
      .where((q) => q.whereNull("a.assigned_to").orWhere("a.assigned_to", reviewerId))
      .whereNot("e.sonographer_id", reviewerId)
      // A calibration read is always handed to one reviewer and may repeat an exam they read.
      .where((q) =>
        q.where("a.kind", "calibration").orWhereNotExists(function () {
          this.from("assignments as b")
            .whereRaw("b.exam_id = a.exam_id")
            .andWhere("b.reviewer_id", reviewerId)
            .whereNot("b.state", "cancelled")
            .whereNot("b.kind", "calibration")
            .whereRaw("b.id <> a.id");
        }),
      )
  );
}

/** What waits for the reviewer, grouped by application and setting, with the oldest wait in seconds. */
export function waitingByApplication(db: Q, programId: string, reviewerId: string) {
  return claimable(db, programId, reviewerId)
    .groupBy("ap.code", "ap.name", "e.setting")
    .select(
      "ap.code",
      "ap.name",
      "e.setting",
      db.raw("count(*)::int as count"),
      db.raw("extract(epoch from now() - min(a.due_at))::int as oldest_seconds"),
    ) as unknown as Promise<{ code: string; name: string; setting: string; count: number; oldest_seconds: number }[]>;
}

/** The live claims a reviewer holds, with the exam's code and application. */
export function heldClaims(db: Q, programId: string, reviewerId: string) {
  return db("assignments as a")
    .join("exams as e", "e.id", "a.exam_id")
    .join("applications as ap", "ap.id", "e.application_id")
    .where({ "a.program_id": programId, "a.reviewer_id": reviewerId, "a.state": "claimed" })
    .andWhere("a.lease_expires_at", ">", db.fn.now())
    .select("a.id", "a.kind", "a.state", "a.claimed_at", "a.lease_expires_at", "a.due_at", "e.code", "ap.name as application", "ap.code as application_code");
}

/** The oldest live queue claim a reviewer already holds ("Start next" hands it back). */
export function oldestLiveClaim(trx: Q, programId: string, reviewerId: string) {
  return trx("assignments")
    .where({ program_id: programId, reviewer_id: reviewerId, state: "claimed" })
    .whereIn("kind", QUEUE_KINDS)
    .andWhere("lease_expires_at", ">", trx.fn.now())
    .orderBy("claimed_at")
    .first<{ id: string; exam_id: string } | undefined>("id", "exam_id");
}

/**
 * Claims the next due read for a reviewer atomically (`FOR UPDATE SKIP LOCKED`: clinical
 * first, then the oldest), as a lease of `leaseMinutes` under the given rubric version.
 */
export async function claim(
  trx: Knex.Transaction,
  o: { programId: string; reviewerId: string; leaseMinutes: number; rubricId: string | null; application?: string },
): Promise<{ id: string; exam_id: string } | undefined> {
  const candidate = claimable(trx, o.programId, o.reviewerId)
    .orderBy([{ column: "a.priority" }, { column: "a.due_at" }, { column: "a.created_at" }, { column: "a.id" }])
    .limit(1)
    .forUpdate("a")
    .skipLocked()
    .select("a.id");
  if (o.application) candidate.andWhere("ap.code", o.application);
  const [row] = await trx("assignments")
    .whereIn("id", candidate)
    .update({
      state: "claimed",
      reviewer_id: o.reviewerId,
      claimed_at: trx.fn.now(),
      lease_expires_at: leaseUntil(trx, o.leaseMinutes),
      rubric_id: o.rubricId,
    })
    .returning(["id", "exam_id"]);
  return row;
}

/** Extends the holder's lease by `leaseMinutes` from now; returns the new end. */
export async function extendLease(trx: Knex.Transaction, id: string, leaseMinutes: number): Promise<Date> {
  const [a] = await trx("assignments")
    .where("id", id)
    .update({ lease_expires_at: leaseUntil(trx, leaseMinutes) })
    .returning("lease_expires_at");
  return a.lease_expires_at;
}

/** Gives a claimed read back to the queue. */
export async function releaseAssignment(trx: Knex.Transaction, id: string): Promise<void> {
  await trx("assignments").where("id", id).update({ state: "open", reviewer_id: null, claimed_at: null, lease_expires_at: null });
}

/** Hands an unsubmitted read to one reviewer: back in the queue, claimable by them only. */
export async function reassign(trx: Knex.Transaction, id: string, reviewerId: string): Promise<void> {
  await trx("assignments").where("id", id).update({ state: "open", reviewer_id: null, claimed_at: null, lease_expires_at: null, assigned_to: reviewerId });
}

/** Closes a read as done by `reviewerId` (at `at`, now by default). */
export async function markSubmitted(trx: Knex.Transaction, id: string, reviewerId: string, at?: Date): Promise<void> {
  await trx("assignments")
    .where("id", id)
    .update({ state: "submitted", reviewer_id: reviewerId, submitted_at: at ?? trx.fn.now(), lease_expires_at: null });
}

/** Whether the reviewer holds, held or was handed another (non-cancelled) read of the same exam. */
export async function readsExamElsewhere(trx: Q, examId: string, exceptAssignmentId: string, reviewerId: string): Promise<boolean> {
  const other = await trx("assignments")
    .where("exam_id", examId)
    .whereNot("id", exceptAssignmentId)
    .whereNot("state", "cancelled")
    .where((q) => q.where("reviewer_id", reviewerId).orWhere("assigned_to", reviewerId))
    .first("id");
  return Boolean(other);
}

/** Opens the reads a newly submitted exam needs (the primary, and for a double read the second), due now. */
export async function openReads(trx: Knex.Transaction, exam: { id: string; program_id: string }, kinds: ("primary" | "second")[], priority: number) {
  await trx("assignments").insert(kinds.map((kind) => ({ program_id: exam.program_id, exam_id: exam.id, priority, due_at: trx.fn.now(), kind })));
}

/** Opens the adjudication of a double read that disagreed, scored under the primary's rubric version. */
export async function openAdjudication(trx: Knex.Transaction, exam: { id: string; program_id: string }, rubricId: string) {
  await trx("assignments").insert({
    program_id: exam.program_id,
    exam_id: exam.id,
    kind: "adjudication",
    priority: 0,
    due_at: trx.fn.now(),
    rubric_id: rubricId,
  });
}

/** The exam's adjudication still waiting for its decision, locked. */
export function undecidedAdjudication(trx: Knex.Transaction, programId: string, examId: string) {
  return trx("assignments")
    .where({ exam_id: examId, program_id: programId, kind: "adjudication" })
    .whereIn("state", UNDECIDED)
    .forUpdate()
    .first<AssignmentRecord | undefined>();
}

/** Open adjudications, oldest due first; `assignedTo` keeps only those handed to that reviewer. */
export function listUndecidedAdjudications(db: Q, programId: string, opts: { assignedTo?: string } = {}) {
  const q = db("assignments as a")
    .join("exams as e", "e.id", "a.exam_id")
    .join("applications as ap", "ap.id", "e.application_id")
    .where({ "a.program_id": programId, "a.kind": "adjudication" })
    .whereIn("a.state", UNDECIDED);
  if (opts.assignedTo) q.andWhere("a.assigned_to", opts.assignedTo);
  return q
    .orderBy("a.due_at")
    .select(
      "a.id as assignment_id",
      "a.exam_id",
      "a.rubric_id",
      "a.assigned_to",
      "e.code",
      "e.setting",
      "e.application_id",
      "ap.code as app_code",
      "ap.name as app_name",
    ) as Promise<
    {
      assignment_id: string;
      exam_id: string;
      rubric_id: string;
      assigned_to: string | null;
      code: string;
      setting: string;
      application_id: string;
      app_code: string;
      app_name: string;
    }[]
  >;
}

/** Primary and second reads waiting (open, or a claim that ran out) since before `hours` ago, counted per application name. */
/** Primary and second reads waiting past their target: `clinicalHours` for clinical exams, `hours` for the rest. */
export function overdueReadsByApplication(db: Q, programId: string, hours: number, clinicalHours = hours) {
  return db("assignments as a")
    .join("exams as e", "e.id", "a.exam_id")
    .join("applications as ap", "ap.id", "e.application_id")
    .where("a.program_id", programId)
    .whereIn("a.kind", ["primary", "second"])
    .where((q) => q.where("a.state", "open").orWhere((q2) => q2.where("a.state", "claimed").andWhere("a.lease_expires_at", "<=", db.fn.now())))
    .andWhere("a.due_at", "<", db.raw(`now() - make_interval(hours => CASE WHEN e.setting = 'clinical' THEN ?::int ELSE ?::int END)`, [clinicalHours, hours]))
    .groupBy("ap.name")
    .select("ap.name")
    .count<{ name: string; count: string }[]>("* as count");
}

/** Reads the reviewer could claim now (home). */
export async function countClaimable(db: Q, programId: string, reviewerId: string): Promise<number> {
  const [r] = await claimable(db, programId, reviewerId).count<{ c: string }[]>("* as c");
  return Number(r.c);
}

/** Claims the reviewer holds whose lease has not run out (home). */
export async function countLiveClaims(db: Q, programId: string, reviewerId: string): Promise<number> {
  const [r] = await db("assignments")
    .where({ program_id: programId, reviewer_id: reviewerId, state: "claimed" })
    .andWhere("lease_expires_at", ">", db.fn.now())
    .count<{ c: string }[]>("* as c");
  return Number(r.c);
}

/** Adjudications not decided yet: all of the program's, or only those handed to `assignedTo` (home). */
export async function countUndecidedAdjudications(db: Q, programId: string, opts: { assignedTo?: string } = {}): Promise<number> {
  const q = db("assignments").where({ program_id: programId, kind: "adjudication" }).whereIn("state", ["open", "claimed"]);
  if (opts.assignedTo) q.andWhere("assigned_to", opts.assignedTo);
  const [r] = await q.count<{ c: string }[]>("* as c");
  return Number(r.c);
}
