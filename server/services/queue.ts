// The review queue's use cases: what a submitted exam needs (a primary read, and for a
// reproducible share a second independent read), what waits and what I hold, claiming the
// next due read atomically as a lease that expires, the scoring workspace, autosave (which
// extends the lease), giving a read back, and a QA lead handing a read to a chosen reviewer.
import crypto from "node:crypto";
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import { HttpError, notFound } from "../http/errors";
import type { Actor } from "./actor";
import { auditAs } from "../repositories/audit";
import {
  claim,
  extendLease,
  findAssignment,
  heldClaims,
  oldestLiveClaim,
  openReads,
  readsExamElsewhere,
  reassign as reassignRead,
  releaseAssignment,
  waitingByApplication,
} from "../repositories/assignments";
import { deleteDraft, deleteDraftOfOthers, findDraft, saveDraft as storeDraft } from "../repositories/reviews";
import { snippetsByAge } from "../repositories/snippets";
import { examDetail, findExam, markExamInReview } from "../repositories/exams";
import { viewsAndFindingsOfExam } from "../repositories/applications";
import { activeRubricFor, getRubric } from "../repositories/rubrics";
import { getSettings } from "../repositories/settings";
import { isActiveReviewer } from "../repositories/members";
import { assertMayOpenWorkspace, assertNotOwnExam, assertOwnClaim, assertReassignable } from "../policies/review";
import { reviewDraftSchema } from "../../shared/schemas/reviews";

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
  await openReads(trx, exam, double ? ["primary", "second"] : ["primary"], priorityOf(exam.setting));
  await markExamInReview(trx, exam.id, double);
  return { double };
}

/** What waits in the queue for the actor (by application and setting) and the claims they hold. */
export async function queueOverview(db: Db, actor: Actor) {
  const [waiting, held, settings] = await Promise.all([
    waitingByApplication(db, actor.programId, actor.userId),
    heldClaims(db, actor.programId, actor.userId),
    getSettings(db, actor.programId),
  ]);
  return { waiting, held, turnaroundHours: settings.turnaroundHours, clinicalTurnaroundHours: settings.clinicalTurnaroundHours };
}

interface ClaimOptions {
  programId: string;
  reviewerId: string;
  leaseMinutes: number;
  application?: string;
}

/**
 * Claims the next due assignment for a reviewer, or returns the one they already hold.
 * Never their own exam, never a second read of an exam they already read.
 */
async function claimIn(trx: Knex.Transaction, o: ClaimOptions) {
  const held = await oldestLiveClaim(trx, o.programId, o.reviewerId);
  if (held) return held;
  const rubric = await activeRubricFor(trx, o.programId);
  const row = await claim(trx, { ...o, rubricId: rubric?.id ?? null });
  // A draft left by a previous holder of an expired claim is theirs, not the new reviewer's.
  if (row) await deleteDraftOfOthers(trx, row.id, o.reviewerId);
  return row;
}

/** "Start next": claims (audited) the next due read, or the one held already, and opens its workspace; undefined when nothing waits. */
export async function startNext(db: Db, actor: Actor, application?: string) {
  const claimed = await db.transaction(async (trx) => {
    const { leaseMinutes } = await getSettings(trx, actor.programId);
    const row = await claimIn(trx, { programId: actor.programId, reviewerId: actor.userId, leaseMinutes, application });
    if (row) await auditAs(trx, actor, { action: "assignment.claimed", entityType: "assignment", entityId: row.id });
    return row;
  });
  return claimed ? openWorkspace(db, actor, claimed.id) : undefined;
}

/** Everything the scoring workspace needs for one assignment the actor holds. */
export async function openWorkspace(db: Db, actor: Actor, assignmentId: string) {
  const a = await findAssignment(db, actor.programId, assignmentId);
  assertMayOpenWorkspace(a, actor.userId);
  const d = await examDetail(db, actor.programId, a.exam_id);
  const [settings, rubric, { views, findings }, draft, snippets] = await Promise.all([
    getSettings(db, actor.programId),
    a.rubric_id ? getRubric(db, actor.programId, a.rubric_id) : undefined,
    viewsAndFindingsOfExam(db, a.exam_id),
    findDraft(db, a.id),
    snippetsByAge(db, actor.programId),
  ]);
  if (!rubric) throw new HttpError(409, "no_rubric", "The program has no published rubric; ask your QA lead to publish one");
  return {
    assignment: a,
    detail: d!,
    views,
    findings,
    blindSonographer: settings.blindSonographer,
    rubric,
    draft: draft ? { ...reviewDraftSchema.parse(draft.data), savedAt: draft.updated_at } : null,
    snippets,
  };
}
export type Workspace = Awaited<ReturnType<typeof openWorkspace>>;

/** Autosave: stores the actor's draft on a claim they hold and extends the lease. */
export async function autosaveDraft(db: Db, actor: Actor, assignmentId: string, draft: Record<string, unknown>) {
  return db.transaction(async (trx) => {
    assertOwnClaim(await findAssignment(trx, actor.programId, assignmentId, { lock: true }), actor.userId);
    const settings = await getSettings(trx, actor.programId);
    await storeDraft(trx, assignmentId, { ...draft, reviewerId: actor.userId });
    const leaseExpiresAt = await extendLease(trx, assignmentId, settings.leaseMinutes);
    return { savedAt: new Date(), leaseExpiresAt };
  });
}

/** Gives the actor's claim back to the queue (its draft goes). */
export async function release(db: Db, actor: Actor, assignmentId: string) {
  await db.transaction(async (trx) => {
    assertOwnClaim(await findAssignment(trx, actor.programId, assignmentId, { lock: true }), actor.userId);
    await releaseAssignment(trx, assignmentId);
    await deleteDraft(trx, assignmentId);
    await auditAs(trx, actor, { action: "assignment.released", entityType: "assignment", entityId: assignmentId });
  });
}

/** A QA lead hands an unsubmitted read to a chosen reviewer: never the exam's sonographer, never a second read by the same reviewer. */
export async function handRead(db: Db, actor: Actor, assignmentId: string, reviewerId: string) {
  return db.transaction(async (trx) => {
    const a = await findAssignment(trx, actor.programId, assignmentId, { lock: true });
    if (!a) throw notFound("Assignment");
    assertReassignable(a);
    if (!(await isActiveReviewer(trx, actor.programId, reviewerId)))
      throw new HttpError(400, "validation_failed", "reviewerId: not an active reviewer of this program");
    const exam = await findExam(trx, actor.programId, a.exam_id);
    assertNotOwnExam(exam!, reviewerId, "assign");
    if (await readsExamElsewhere(trx, a.exam_id, a.id, reviewerId))
      throw new HttpError(409, "already_reading", "reviewerId: this reviewer already reads this exam; reads must be independent");
    await reassignRead(trx, a.id, reviewerId);
    await deleteDraft(trx, a.id);
    await auditAs(trx, actor, {
      action: "assignment.reassigned",
      entityType: "assignment",
      entityId: a.id,
      details: { from: a.reviewer_id ?? a.assigned_to, to: reviewerId },
    });
    return { id: a.id, assignedTo: reviewerId };
  });
}
