// Feedback to the sonographer: reviewed exams with the final scores, anchor texts, the
// reviewers' comments and next steps; acknowledgement; questions and answers; notifications.
import { z } from "zod";
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../app";
import { HttpError, notFound } from "../../http/errors";
import { idParamsSchema } from "../../../shared/schemas/common";
import { messageInputSchema } from "../../../shared/schemas/reviews";
import { creditFor, criteriaFor } from "../../../shared/rubric/logic";
import { getRubric } from "../../repositories/rubrics";
import { getSettings } from "../../repositories/settings";
import { audit } from "../../repositories/audit";
import { assertCanView } from "../../policies/exam";
import { replyPosted, runAfterCommit } from "../../services/notify";
import type { AuthUser } from "../../auth/types";
import type { Feedback } from "../../../shared/schemas/feedback";

export function registerFeedbackRoutes(kit: RouteKit, { db, config, mailer, log }: RouteContext) {
  const reviewedOf = (programId: string, sonographerId: string) =>
    db("exams as e")
      .join("applications as ap", "ap.id", "e.application_id")
      .join("exam_results as r", "r.exam_id", "e.id")
      .where({ "e.program_id": programId, "e.sonographer_id": sonographerId, "e.status": "reviewed" });
  const reviewedOwn = (user: AuthUser) => reviewedOf(user.programId, user.id);

  /**
   * One reviewed exam's feedback as its sonographer sees it. `lead` views (a QA lead's page
   * about a sonographer) always carry the reviewers' names.
   */
  async function feedbackDetail(user: AuthUser, examId: string, sonographerId = user.id, lead = false): Promise<Feedback> {
    const row = await reviewedOf(user.programId, sonographerId)
      .where("e.id", examId)
      .first("e.*", "ap.code as app_code", "ap.name as app_name", "r.scores", "r.reads", "r.credit", "r.source", "r.decided_at", "r.rubric_id", "r.note");
    if (!row) throw notFound("Feedback");
    const [rubric, programSettings, reviews, outcomes, snippets, messages] = await Promise.all([
      getRubric(db, user.programId, row.rubric_id),
      getSettings(db, user.programId),
      db("reviews as v")
        .join("users as u", "u.id", "v.reviewer_id")
        .where("v.exam_id", examId)
        .orderBy("v.submitted_at")
        .select("u.name", "v.feedback", "v.submitted_at"),
      db("finding_outcomes as o")
        .join("application_findings as f", function () {
          this.on("f.key", "=", "o.finding_key").andOnVal("f.application_id", "=", row.application_id);
        })
        .where("o.exam_id", examId)
        .select("o.finding_key as key", "f.label", "o.sonographer_read as yourRead", "o.reference_read as referenceRead", "o.outcome"),
      db("snippets").where("program_id", user.programId).select("criterion_key", "text"),
      db("feedback_messages as m")
        .join("users as u", "u.id", "m.author_id")
        .where("m.exam_id", examId)
        .orderBy("m.created_at")
        .select("m.id", "m.body", "m.created_at", "u.name", "m.author_id"),
    ]);
    const settings = lead ? { ...programSettings, showReviewerName: true } : programSettings;
    const criteria = rubric ? criteriaFor(rubric.criteria, row.app_code) : [];
    const significant = row.setting === "clinical" && outcomes.some((o) => o.outcome === "FP" || o.outcome === "FN");
    const creditReasons = rubric ? creditFor(rubric.criteria, row.app_code, row.scores, significant, { minQuality: settings.minQualityForCredit }).reasons : [];
    const scored = criteria.map((c) => {
      const value = row.scores[c.key];
      const level = c.levels.find((l) => l.value === String(value));
      const nextSteps = level && !level.ideal ? [c.help, ...snippets.filter((s) => s.criterion_key === c.key).map((s) => s.text)].filter(Boolean) : [];
      return {
        key: c.key,
        label: c.label,
        value: value ?? null,
        level: level ? { label: level.label, anchor: level.anchor, ideal: level.ideal, fails: level.fails } : null,
        nextSteps,
      };
    });
    return {
      examId: row.id,
      code: row.code,
      application: { code: row.app_code, name: row.app_name },
      performedAt: row.performed_at.toISOString(),
      setting: row.setting,
      reviewedAt: row.decided_at.toISOString(),
      source: row.source,
      credit: row.credit,
      /** Why the exam earned no credit (empty when it did). */
      creditReasons,
      rubricVersion: rubric?.version ?? null,
      criteria: scored,
      findings: outcomes,
      comments: reviews
        .filter((r) => r.feedback)
        .map((r) => ({ reviewer: settings.showReviewerName ? r.name : null, text: r.feedback, at: r.submitted_at.toISOString() })),
      adjudicationNote: row.note || null,
      acknowledgedAt: row.feedback_acknowledged_at?.toISOString() ?? null,
      messages: messages.map((m) => ({
        id: m.id,
        body: m.body,
        at: m.created_at.toISOString(),
        author: m.author_id === user.id ? "you" : settings.showReviewerName ? m.name : "Reviewer",
      })),
    };
  }

  defineRoute(kit, {
    method: "get",
    path: "/me/feedback",
    summary: "My reviewed exams with their final scores and feedback, newest first",
    tag: "feedback",
    access: ["sonographer"],
    responses: { 200: { description: "Feedback" } },
    handler: async ({ user }) => {
      const rows = await reviewedOwn(user).orderBy("r.decided_at", "desc").limit(200).select("e.id");
      const unread = new Set(await db("notifications").where({ user_id: user.id, kind: "feedback_ready" }).whereNull("read_at").pluck("exam_id"));
      const items = [];
      for (const r of rows) items.push({ ...(await feedbackDetail(user, r.id)), unread: unread.has(r.id) });
      return { items };
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/roster/:id/feedback",
    summary: "A sonographer's reviewed exams with their feedback and the reviewers' names (QA lead)",
    tag: "progress",
    access: ["qa_lead"],
    params: idParamsSchema,
    responses: { 200: { description: "Feedback" }, 404: { description: "Not a sonographer of this program" } },
    handler: async ({ user, params }) => {
      const member = await db("memberships").where({ program_id: user.programId, user_id: params.id }).whereRaw(`'sonographer' = ANY(roles)`).first("id");
      if (!member) throw notFound("Sonographer");
      const rows = await reviewedOf(user.programId, params.id).orderBy("r.decided_at", "desc").limit(200).select("e.id");
      const unread = new Set(await db("notifications").where({ user_id: params.id, kind: "feedback_ready" }).whereNull("read_at").pluck("exam_id"));
      const items = [];
      for (const r of rows) items.push({ ...(await feedbackDetail(user, r.id, params.id, true)), unread: unread.has(r.id) });
      return { items };
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/me/feedback/:id",
    summary: "The feedback on one of my exams (marks its notification read)",
    tag: "feedback",
    access: ["sonographer"],
    params: idParamsSchema,
    responses: { 200: { description: "Feedback" }, 404: { description: "Not a reviewed exam of yours" } },
    handler: async ({ user, params }) => {
      const detail = await feedbackDetail(user, params.id);
      await db("notifications").where({ user_id: user.id, exam_id: params.id, kind: "feedback_ready" }).whereNull("read_at").update({ read_at: db.fn.now() });
      return detail;
    },
  });

  defineRoute(kit, {
    method: "post",
    path: "/exams/:id/acknowledge",
    summary: "Acknowledge that I have read the feedback",
    tag: "feedback",
    access: ["sonographer"],
    params: idParamsSchema,
    responses: { 200: { description: "Acknowledged" } },
    handler: async ({ req, user, params }) => {
      const row = await reviewedOwn(user).where("e.id", params.id).first("e.id", "e.feedback_acknowledged_at");
      if (!row) throw notFound("Feedback");
      const at = row.feedback_acknowledged_at ?? new Date();
      if (!row.feedback_acknowledged_at) {
        await db("exams").where("id", row.id).update({ feedback_acknowledged_at: at });
        await audit(db, { programId: user.programId, actorUserId: user.id, action: "feedback.acknowledged", entityType: "exam", entityId: row.id, ip: req.ip });
      }
      return { acknowledgedAt: at.toISOString() };
    },
  });

  defineRoute(kit, {
    method: "post",
    path: "/exams/:id/messages",
    summary: "Ask (sonographer) or answer (a reviewer of the exam, a QA lead) a question about the feedback",
    tag: "feedback",
    access: "signed_in",
    params: idParamsSchema,
    body: messageInputSchema,
    responses: { 201: { description: "Posted" } },
    handler: async ({ req, res, user, params, body }) => {
      const exam = await db("exams").where({ id: params.id, program_id: user.programId }).first("id", "program_id", "sonographer_id", "status", "code");
      const access = await assertCanView(db, user, exam);
      if (exam!.status !== "reviewed") throw new HttpError(409, "not_reviewed", "Questions open once the feedback is final");
      const after = await db.transaction(async (trx) => {
        const [m] = await trx("feedback_messages")
          .insert({ program_id: user.programId, exam_id: exam!.id, author_id: user.id, body: body.body })
          .returning(["id", "created_at"]);
        await audit(trx, {
          programId: user.programId,
          actorUserId: user.id,
          action: "feedback.message_posted",
          entityType: "exam",
          entityId: exam!.id,
          ip: req.ip,
        });
        if (access === "owner") return { id: m.id, task: await replyPosted(trx, mailer, config.appUrl, exam!, body.body) };
        await trx("notifications").insert({
          program_id: user.programId,
          user_id: exam!.sonographer_id,
          kind: "feedback_answer",
          exam_id: exam!.id,
          body: `An answer about exam ${exam!.code}.`,
        });
        return { id: m.id, task: null };
      });
      if (after.task) await runAfterCommit([after.task], log);
      res.status(201).json({ id: after.id });
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/exams/:id/messages",
    summary: "The questions and answers about an exam's feedback (its sonographer, its reviewers, QA leads)",
    tag: "feedback",
    access: "signed_in",
    params: idParamsSchema,
    responses: { 200: { description: "Messages" } },
    handler: async ({ user, params }) => {
      const exam = await db("exams").where({ id: params.id, program_id: user.programId }).first("id", "program_id", "sonographer_id", "status", "code");
      const access = await assertCanView(db, user, exam);
      const settings = await getSettings(db, user.programId);
      const rows = await db("feedback_messages as m")
        .join("users as u", "u.id", "m.author_id")
        .where("m.exam_id", params.id)
        .orderBy("m.created_at")
        .select("m.id", "m.body", "m.created_at", "u.name", "m.author_id");
      // Reviewers see the sonographer only as "Sonographer" while blinding is on.
      const name = (r: { author_id: string; name: string }) =>
        r.author_id === user.id
          ? "you"
          : r.author_id === exam!.sonographer_id
            ? access === "reviewer" && settings.blindSonographer
              ? "Sonographer"
              : r.name
            : access === "owner" && !settings.showReviewerName
              ? "Reviewer"
              : r.name;
      return { examCode: exam!.code, items: rows.map((r) => ({ id: r.id, body: r.body, at: r.created_at.toISOString(), author: name(r) })) };
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/notifications",
    summary: "My notifications, unread first",
    tag: "feedback",
    access: "signed_in",
    responses: { 200: { description: "Notifications" } },
    handler: async ({ user }) => {
      const rows = await db("notifications")
        .where({ user_id: user.id, program_id: user.programId })
        .orderByRaw("read_at IS NOT NULL, created_at DESC")
        .limit(100);
      return {
        items: rows.map((n) => ({ id: n.id, kind: n.kind, examId: n.exam_id, body: n.body, read: n.read_at !== null, createdAt: n.created_at.toISOString() })),
        unread: rows.filter((n) => !n.read_at).length,
      };
    },
  });

  defineRoute(kit, {
    method: "post",
    path: "/notifications/read",
    summary: "Mark notifications read (all when no ids are given)",
    tag: "feedback",
    access: "signed_in",
    body: z.object({ ids: z.array(z.uuid()).max(200).optional() }),
    responses: { 204: { description: "Marked" } },
    handler: async ({ user, body }) => {
      const q = db("notifications").where({ user_id: user.id }).whereNull("read_at");
      if (body.ids) q.whereIn("id", body.ids);
      await q.update({ read_at: db.fn.now() });
    },
  });
}
