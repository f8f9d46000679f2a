// The reviewer's work: what waits, claiming the next exam, the scoring workspace's data,
// autosaved drafts, releasing a claim, submitting a review; and a QA lead's reassignment.
import type { Knex } from "knex";
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { HttpError, notFound } from "../../http/errors";
import { idParamsSchema } from "../../../shared/schemas/common";
import { queueNextSchema, reassignSchema, reviewDraftSchema, submitReviewSchema } from "../../../shared/schemas/reviews";
import { claimable, claimNext } from "../../services/queue";
import { assertValidReview, recordReview } from "../../services/reviews";
import { feedbackReady } from "../../services/notify";
import { examContext, examDetail } from "../../repositories/exams";
import { getRubric } from "../../repositories/rubrics";
import { getSettings } from "../../repositories/settings";
import { audit } from "../../repositories/audit";
import { presentAssignment, presentBlindedExam, presentRubricFor, type AssignmentRow } from "../../presenters/assignment";
import type { AuthUser } from "../../auth/types";
import type { Db } from "../../db/knex";

/** The caller's own claim on an assignment (or 404/403/409 saying why not). */
async function ownClaim(db: Db | Knex.Transaction, user: AuthUser, id: string, lock = false) {
  const q = db("assignments").where({ id, program_id: user.programId }).first(withLease(db));
  if (lock) q.forUpdate();
  const a = await q;
  if (!a || (a.reviewer_id !== user.id && a.assigned_to !== user.id)) throw notFound("Assignment");
  if (a.state === "submitted") throw new HttpError(409, "already_submitted", "This review has already been submitted");
  if (a.state !== "claimed" || a.reviewer_id !== user.id)
    throw new HttpError(409, "not_claimed", "You no longer hold this exam: the claim expired and it went back to the queue");
  // README "Review rules": when the lease runs out the read goes back to the queue, so the holder lost it
  // even while nobody has claimed it again (claim it anew with "Start next").
  if (claimExpired(a)) throw claimExpiredError();
  return a;
}

/** An assignment row with `lease_over` computed by the database clock (the one the queue uses). */
const withLease = (db: Db | Knex.Transaction) => ["*", db.raw("(lease_expires_at IS NULL OR lease_expires_at <= now()) AS lease_over")];
const claimExpired = (a: { state: string; lease_over: boolean }) => a.state === "claimed" && a.lease_over;
const claimExpiredError = () =>
  new HttpError(409, "claim_expired", "Your claim on this exam ran out and the read went back to the queue; start the next exam to claim it again");

export function registerQueueRoutes(kit: RouteKit, { db, config }: RouteContext) {
  /** Everything the scoring workspace needs for one assignment. */
  async function workspace(user: AuthUser, assignmentId: string) {
    const a = await db("assignments").where({ id: assignmentId, program_id: user.programId }).first(withLease(db));
    if (!a || a.reviewer_id !== user.id) throw notFound("Assignment");
    if (claimExpired(a)) throw claimExpiredError();
    const d = await examDetail(db, user.programId, a.exam_id);
    const [settings, rubric, views, findings, draft, snippets] = await Promise.all([
      getSettings(db, user.programId),
      a.rubric_id ? getRubric(db, user.programId, a.rubric_id) : undefined,
      db("application_views as v")
        .join("exams as e", "e.application_id", "v.application_id")
        .where("e.id", a.exam_id)
        .orderBy("v.position")
        .select("v.key", "v.label"),
      db("application_findings as f")
        .join("exams as e", "e.application_id", "f.application_id")
        .where("e.id", a.exam_id)
        .orderBy("f.position")
        .select("f.key", "f.label"),
      db("review_drafts").where("assignment_id", a.id).first("data", "updated_at"),
      db("snippets").where("program_id", user.programId).orderBy("created_at").select("id", "criterion_key as criterionKey", "text"),
    ]);
    if (!rubric) throw new HttpError(409, "no_rubric", "The program has no published rubric; ask your QA lead to publish one");
    const exam = d!.exam as unknown as Parameters<typeof presentBlindedExam>[0]["exam"];
    return {
      assignment: presentAssignment(a as AssignmentRow),
      exam: presentBlindedExam({ exam, clips: d!.clips, views, findings, blindSonographer: settings.blindSonographer }),
      rubric: presentRubricFor(rubric, d!.exam.app_code),
      draft: draft ? { ...reviewDraftSchema.parse(draft.data), savedAt: draft.updated_at.toISOString() } : null,
      snippets,
    };
  }

  defineRoute(kit, {
    method: "get",
    path: "/queue",
    summary: "What waits in the review queue (by application and setting) and what I hold",
    tag: "queue",
    access: ["reviewer"],
    responses: { 200: { description: "Queue overview" } },
    handler: async ({ user }) => {
      const waitingBase = claimable(db, user.programId, user.id);
      const [waiting, held] = await Promise.all([
        waitingBase
          .clone()
          .groupBy("ap.code", "ap.name", "e.setting")
          .select(
            "ap.code",
            "ap.name",
            "e.setting",
            db.raw("count(*)::int as count"),
            db.raw("extract(epoch from now() - min(a.due_at))::int as oldest_seconds"),
          ),
        db("assignments as a")
          .join("exams as e", "e.id", "a.exam_id")
          .join("applications as ap", "ap.id", "e.application_id")
          .where({ "a.program_id": user.programId, "a.reviewer_id": user.id, "a.state": "claimed" })
          .andWhere("a.lease_expires_at", ">", db.fn.now())
          .select("a.id", "a.kind", "a.claimed_at", "a.lease_expires_at", "a.due_at", "e.code", "ap.name as application", "ap.code as application_code"),
      ]);
      const { turnaroundHours } = await getSettings(db, user.programId);
      return {
        waiting: waiting.map((w) => ({
          application: { code: w.code, name: w.name },
          setting: w.setting,
          count: w.count,
          oldestWaitingSeconds: w.oldest_seconds,
          /** The oldest has waited past the program's turnaround target. */
          overdue: w.oldest_seconds > turnaroundHours * 3600,
        })),
        held: held.map((h) => ({
          ...presentAssignment(h as AssignmentRow),
          examCode: h.code,
          application: h.application,
          applicationCode: h.application_code,
        })),
      };
    },
  });

  defineRoute(kit, {
    method: "post",
    path: "/queue/next",
    summary: "Claim the next due exam (oldest first, clinical before educational); 204 when none is waiting",
    tag: "queue",
    access: ["reviewer"],
    body: queueNextSchema,
    responses: { 200: { description: "The claimed assignment and its blinded exam" }, 204: { description: "Nothing waiting" } },
    handler: async ({ req, res, user, body }) => {
      const settings = await getSettings(db, user.programId);
      const claimed = await claimNext(db, {
        programId: user.programId,
        reviewerId: user.id,
        leaseMinutes: settings.leaseMinutes,
        application: body.application,
      });
      if (!claimed) return void res.status(204).end();
      await audit(db, {
        programId: user.programId,
        actorUserId: user.id,
        action: "assignment.claimed",
        entityType: "assignment",
        entityId: claimed.id,
        ip: req.ip,
      });
      return workspace(user, claimed.id);
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/assignments/:id",
    summary: "The scoring workspace's data for an assignment I hold (blinded exam, rubric, my draft, snippets)",
    tag: "queue",
    access: ["reviewer"],
    params: idParamsSchema,
    responses: { 200: { description: "Workspace" } },
    handler: ({ user, params }) => workspace(user, params.id),
  });

  defineRoute(kit, {
    method: "put",
    path: "/assignments/:id/draft",
    summary: "Autosave my scores so far; also extends the claim",
    tag: "queue",
    access: ["reviewer"],
    params: idParamsSchema,
    body: reviewDraftSchema,
    responses: { 200: { description: "Saved" } },
    handler: async ({ user, params, body }) =>
      db.transaction(async (trx) => {
        await ownClaim(trx, user, params.id, true);
        const settings = await getSettings(trx, user.programId);
        await trx("review_drafts")
          .insert({ assignment_id: params.id, data: JSON.stringify({ ...body, reviewerId: user.id }), updated_at: trx.fn.now() })
          .onConflict("assignment_id")
          .merge();
        const [a] = await trx("assignments")
          .where("id", params.id)
          .update({ lease_expires_at: trx.raw(`now() + make_interval(mins => ?)`, [settings.leaseMinutes]) })
          .returning("lease_expires_at");
        return { savedAt: new Date().toISOString(), leaseExpiresAt: a.lease_expires_at.toISOString() };
      }),
  });

  defineRoute(kit, {
    method: "post",
    path: "/assignments/:id/release",
    summary: "Give the exam back to the queue",
    tag: "queue",
    access: ["reviewer"],
    params: idParamsSchema,
    responses: { 204: { description: "Released" } },
    handler: async ({ req, user, params }) => {
      await db.transaction(async (trx) => {
        await ownClaim(trx, user, params.id, true);
        await trx("assignments").where("id", params.id).update({ state: "open", reviewer_id: null, claimed_at: null, lease_expires_at: null });
        await trx("review_drafts").where("assignment_id", params.id).delete();
        await audit(trx, {
          programId: user.programId,
          actorUserId: user.id,
          action: "assignment.released",
          entityType: "assignment",
          entityId: params.id,
          ip: req.ip,
        });
      });
    },
  });

  defineRoute(kit, {
    method: "post",
    path: "/assignments/:id/review",
    summary: "Submit my scores, my own read of each finding and feedback",
    tag: "queue",
    access: ["reviewer"],
    params: idParamsSchema,
    body: submitReviewSchema,
    responses: { 201: { description: "Submitted; the exam's state after it" }, 409: { description: "Already submitted or no longer held" } },
    handler: async ({ req, res, user, params, body }) => {
      const result = await db.transaction(async (trx) => {
        const a = await ownClaim(trx, user, params.id, true);
        if (a.kind === "adjudication") throw new HttpError(409, "use_adjudication", "Set the final scores of an adjudication from the adjudication screen");
        const exam = await examContext(trx, user.programId, a.exam_id);
        if (!exam) throw notFound("Exam");
        if (exam.sonographer_id === user.id) throw new HttpError(403, "own_exam", "You cannot review your own exam");
        const rubric = await getRubric(trx, user.programId, a.rubric_id);
        if (!rubric) throw new HttpError(409, "no_rubric", "The rubric of this assignment is missing");
        if (body.rubricId && body.rubricId !== rubric.id) {
          throw new HttpError(
            400,
            "validation_failed",
            `rubricId: these scores were made under another rubric version; this exam is scored under version ${rubric.version}`,
            [{ path: "rubricId", message: "Another rubric version" }],
          );
        }
        assertValidReview(rubric, exam, body.scores, body.reads);
        const settings = await getSettings(trx, user.programId);
        const { review, examState } = await recordReview(trx, { reviewerId: user.id, assignment: a, exam, rubric, body, settings, ip: req.ip });
        if (examState === "final") await feedbackReady(trx, config.appUrl, exam);
        return { review: { id: review.id, submittedAt: review.submitted_at.toISOString(), credit: review.credit }, examState };
      });
      res.status(201).json(result);
    },
  });

  defineRoute(kit, {
    method: "post",
    path: "/assignments/:id/reassign",
    summary: "Give an unsubmitted read to a chosen reviewer (QA lead)",
    tag: "queue",
    access: ["qa_lead"],
    params: idParamsSchema,
    body: reassignSchema,
    responses: { 200: { description: "Reassigned" } },
    handler: async ({ req, user, params, body }) =>
      db.transaction(async (trx) => {
        const a = await trx("assignments").where({ id: params.id, program_id: user.programId }).forUpdate().first();
        if (!a) throw notFound("Assignment");
        if (a.state === "submitted" || a.state === "cancelled") throw new HttpError(409, "not_open", `This read is ${a.state}`);
        const reviewer = await trx("memberships")
          .where({ user_id: body.reviewerId, program_id: user.programId })
          .whereNull("deactivated_at")
          .whereRaw(`'reviewer' = ANY(roles)`)
          .first("user_id");
        if (!reviewer) throw new HttpError(400, "validation_failed", "reviewerId: not an active reviewer of this program");
        const exam = await trx("exams").where("id", a.exam_id).first("sonographer_id");
        if (exam.sonographer_id === body.reviewerId) throw new HttpError(409, "own_exam", "reviewerId: a reviewer never reads their own exam");
        const other = await trx("assignments")
          .where("exam_id", a.exam_id)
          .whereNot("id", a.id)
          .whereNot("state", "cancelled")
          .where((q) => q.where("reviewer_id", body.reviewerId).orWhere("assigned_to", body.reviewerId))
          .first("id");
        if (other) throw new HttpError(409, "already_reading", "reviewerId: this reviewer already reads this exam; reads must be independent");
        await trx("assignments")
          .where("id", a.id)
          .update({ state: "open", reviewer_id: null, claimed_at: null, lease_expires_at: null, assigned_to: body.reviewerId });
        await trx("review_drafts").where("assignment_id", a.id).delete();
        await audit(trx, {
          programId: user.programId,
          actorUserId: user.id,
          action: "assignment.reassigned",
          entityType: "assignment",
          entityId: a.id,
          ip: req.ip,
          details: { from: a.reviewer_id ?? a.assigned_to, to: body.reviewerId },
        });
        return { id: a.id, assignedTo: body.reviewerId };
      }),
  });
}
