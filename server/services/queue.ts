// The review queue's decisions: what a submitted exam needs (a primary read, and for a
// reproducible share a second independent read), and claiming the next due assignment
// atomically with row locks (FOR UPDATE SKIP LOCKED), as a lease that expires.
import crypto from "node:crypto";
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import { activeRubricFor } from "../repositories/rubrics";

/**
 * Whether an exam gets a second read. Reproducible: the same exam id and share always give
 * the same answer (the first 32 bits of SHA-256 of the id, as a fraction of 2^32, below the share).
 */
export function sampledForSecondRead(examId: string, share: number): boolean {
  const h = crypto.createHash("sha256").update(examId).digest().readUInt32BE(0);
  return h / 2 ** 32 < share;
}

/** Clinical exams are read before educational and simulated ones. */
export const priorityOf = (setting: string) => (setting === "clinical" ? 0 : 1);

/** Creates the assignments a newly submitted exam needs, and moves it into review. */
export async function queueSubmittedExam(trx: Knex.Transaction, exam: { id: string; program_id: string; setting: string }, doubleReadShare: number) {
  const double = sampledForSecondRead(exam.id, doubleReadShare);
  const base = { program_id: exam.program_id, exam_id: exam.id, priority: priorityOf(exam.setting), due_at: trx.fn.now() };
  await trx("assignments").insert(
    double
      ? [
          { ...base, kind: "primary" },
          { ...base, kind: "second" },
        ]
      : [{ ...base, kind: "primary" }],
  );
  await trx("exams").where("id", exam.id).update({ status: "in_review", double_read: double });
  return { double };
}

/**
 * The reads a reviewer could claim now (assignments `a` joined to exams `e` and applications
 * `ap`): first or second reads that are open or whose claim ran out, not handed to someone
 * else, not of the reviewer's own exams, and not of an exam the reviewer already reads.
 */
export function claimable(db: Knex | Knex.Transaction, programId: string, reviewerId: string) {
  return (
    db("assignments as a")
      .join("exams as e", "e.id", "a.exam_id")
      .join("applications as ap", "ap.id", "e.application_id")
      .where("a.program_id", programId)
      .whereIn("a.kind", ["primary", "second", "calibration"])
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

export interface ClaimOptions {
  programId: string;
  reviewerId: string;
  leaseMinutes: number;
  application?: string;
}

/**
 * Claims the next due assignment for a reviewer, or returns the one they already hold.
 * Never their own exam, never a second read of an exam they already read.
 */
export async function claimNext(db: Db, o: ClaimOptions): Promise<{ id: string; exam_id: string } | undefined> {
  return db.transaction(async (trx) => {
    const held = await trx("assignments")
      .where({ program_id: o.programId, reviewer_id: o.reviewerId, state: "claimed" })
      .whereIn("kind", ["primary", "second", "calibration"])
      .andWhere("lease_expires_at", ">", trx.fn.now())
      .orderBy("claimed_at")
      .first("id", "exam_id");
    if (held) return held;
    const rubric = await activeRubricFor(trx, o.programId);
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
        lease_expires_at: trx.raw(`now() + make_interval(mins => ?)`, [o.leaseMinutes]),
        rubric_id: rubric?.id ?? null,
      })
      .returning(["id", "exam_id"]);
    // A draft left by a previous holder of an expired claim is theirs, not the new reviewer's.
    if (row) await trx("review_drafts").where("assignment_id", row.id).whereRaw(`data->>'reviewerId' IS DISTINCT FROM ?`, [o.reviewerId]).delete();
    return row;
  });
}
