// Feedback to the sonographer: reviewed exams with the final scores, anchor texts, the
// reviewers' comments and next steps; acknowledgement; questions and answers; notifications.
import { z } from "zod";
import type { Knex } from "knex";
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { HttpError, notFound } from "../../http/errors";
import { idParamsSchema } from "../../../shared/schemas/common";
import { messageInputSchema } from "../../../shared/schemas/reviews";
import { creditFor, criteriaFor } from "../../../shared/rubric/logic";
import { getRubric } from "../../repositories/rubrics";
import { getSettings } from "../../repositories/settings";
import { audit } from "../../repositories/audit";
import { assertCanView, DECIDING_READS } from "../../policies/exam";
import { replyPosted } from "../../services/notify";
import type { AuthUser } from "../../auth/types";
import type { Feedback } from "../../../shared/schemas/feedback";

export function registerFeedbackRoutes(kit: RouteKit, { db, config }: RouteContext) {
  const reviewedOf = (programId: string, sonographerId: string) =>
    db("exams as e")
      .join("applications as ap", "ap.id", "e.application_id")
      .join("exam_results as r", "r.exam_id", "e.id")
      .where({ "e.program_id": programId, "e.sonographer_id": sonographerId, "e.status": "reviewed" });
  const reviewedOwn = (user: AuthUser) => reviewedOf(user.programId, user.id);

  /**
   * Reviewed exams' feedback as their sonographer sees it, in the order `pick` gives, built
   * with one query per kind of row for the whole list. `lead` views (a QA lead's page about
   * a sonographer) always carry the reviewers' names.
   */
  async function feedbackItems(user: AuthUser, sonographerId: string, pick: (q: Knex.QueryBuilder) => Knex.QueryBuilder, lead = false): Promise<Feedback[]> {
    // eslint-disable-next-line @typescript-eslint/no-explicit-any -- a joined row of exams, applications and exam_results
    const rows: any[] = await pick(reviewedOf(user.programId, sonographerId)).select(
      "e.*",
      "ap.code as app_code",
      "ap.name as app_name",
      "r.scores",
      "r.reads",
      "r.credit",
      "r.source",
      "r.decided_at",
      "r.rubric_id",
      "r.note",
    );
    if (rows.length === 0) return [];
    const ids: string[] = rows.map((r) => r.id);
    const [rubrics, programSettings, reviews, outcomes, snippets, messages] = await Promise.all([
      Promise.all([...new Set<string>(rows.map((r) => r.rubric_id))].map((id) => getRubric(db, user.programId, id))),
      getSettings(db, user.programId),
      // A calibration read's comment is for the QA lead's calibration, not the learner.
      db("reviews as v")
        .join("users as u", "u.id", "v.reviewer_id")
        .join("assignments as va", "va.id", "v.assignment_id")
        .whereIn("va.kind", DECIDING_READS)
        .whereIn("v.exam_id", ids)
        .orderBy("v.submitted_at")
        .select("v.exam_id", "u.name", "v.feedback", "v.submitted_at"),
      db("finding_outcomes as o")
        .join("exams as x", "x.id", "o.exam_id")
        .join("application_findings as f", function () {
          this.on("f.key", "=", "o.finding_key").andOn("f.application_id", "=", "x.application_id");
        })
        .whereIn("o.exam_id", ids)
        .orderBy("f.position")
        .select("o.exam_id", "o.finding_key as key", "f.label", "o.sonographer_read as yourRead", "o.reference_read as referenceRead", "o.outcome"),
      db("snippets").where("program_id", user.programId).select("criterion_key", "text"),
      db("feedback_messages as m")
        .join("users as u", "u.id", "m.author_id")
        .whereIn("m.exam_id", ids)
        .orderBy("m.created_at")
        .select("m.exam_id", "m.id", "m.body", "m.created_at", "u.name", "m.author_id"),
    ]);
    const settings = lead ? { ...programSettings, showReviewerName: true } : programSettings;
    const of = <T extends { exam_id: string }>(list: T[], examId: string) => list.filter((x) => x.exam_id === examId);
    return rows.map((row) => {
      const rubric = rubrics.find((r) => r?.id === row.rubric_id);
      const findings = of(outcomes, row.id).map(({ exam_id: _, ...o }) => o);
      const criteria = rubric ? criteriaFor(rubric.criteria, row.app_code) : [];
      const significant = row.setting === "clinical" && findings.some((o) => o.outcome === "FP" || o.outcome === "FN");
      const creditReasons = rubric
        ? creditFor(rubric.criteria, row.app_code, row.scores, significant, { minQuality: settings.minQualityForCredit }).reasons
        : [];
      const scored = criteria.map((c) => {
        const value = row.scores[c.key];
        const level = c.levels.find((l) => l.value === String(value));
        const nextSteps = level && !level.ideal ? [c.help, ...snippets.filter((sn) => sn.criterion_key === c.key).map((sn) => sn.text)].filter(Boolean) : [];
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
        creditReasons,
        rubricVersion: rubric?.version ?? null,
        criteria: scored,
        findings,
        comments: of(reviews, row.id)
          .filter((r) => r.feedback)
          .map((r) => ({ reviewer: settings.showReviewerName ? r.name : null, text: r.feedback, at: r.submitted_at.toISOString() })),
        adjudicationNote: row.note || null,
        acknowledgedAt: row.feedback_acknowledged_at?.toISOString() ?? null,
        messages: of(messages, row.id).map((m) => ({
          id: m.id,
          body: m.body,
          at: m.created_at.toISOString(),
          author: m.author_id === user.id ? "you" : settings.showReviewerName ? m.name : "Reviewer",
        })),
      };
    });
  }

  async function feedbackDetail(user: AuthUser, examId: string): Promise<Feedback> {
    const [item] = await feedbackItems(user, user.id, (q) => q.where("e.id", examId));
    if (!item) throw notFound("Feedback");
    return item;
  }

  defineRoute(kit, {
    method: "get",
    path: "/me/feedback",
    summary: "My reviewed exams with their final scores and feedback, newest first",
    tag: "feedback",
    access: ["sonographer"],
    responses: { 200: { description: "Feedback" } },
    handler: async ({ user }) => {
      const items = await feedbackItems(user, user.id, (q) => q.orderBy("r.decided_at", "desc").limit(200));
      const unread = new Set(await db("notifications").where({ user_id: user.id, kind: "feedback_ready" }).whereNull("read_at").pluck("exam_id"));
      return { items: items.map((f) => ({ ...f, unread: unread.has(f.examId) })) };
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
      const items = await feedbackItems(user, params.id, (q) => q.orderBy("r.decided_at", "desc").limit(200), true);
      const unread = new Set(await db("notifications").where({ user_id: params.id, kind: "feedback_ready" }).whereNull("read_at").pluck("exam_id"));
      return { items: items.map((f) => ({ ...f, unread: unread.has(f.examId) })) };
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
      const access = await assertCanView(db, user, exam, "thread");
      if (exam!.status !== "reviewed") throw new HttpError(409, "not_reviewed", "Questions open once the feedback is final");
      const posted = await db.transaction(async (trx) => {
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
        if (access === "owner") {
          await replyPosted(trx, config.appUrl, exam!, body.body);
          return { id: m.id };
        }
        await trx("notifications").insert({
          program_id: user.programId,
          user_id: exam!.sonographer_id,
          kind: "feedback_answer",
          exam_id: exam!.id,
          body: `An answer about exam ${exam!.code}.`,
        });
        return { id: m.id };
      });
      res.status(201).json({ id: posted.id });
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
      const access = await assertCanView(db, user, exam, "thread");
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
