// The QA lead's review oversight: adjudication of disagreeing double reads, follow-ups of
// clinically significant disagreements, feedback snippets, and program settings.
import { z } from "zod";
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { HttpError, notFound } from "../../http/errors";
import { idParamsSchema } from "../../../shared/schemas/common";
import {
  adjudicateSchema,
  followUpUpdateSchema,
  programSettingsSchema,
  programSettingsUpdateSchema,
  snippetInputSchema,
} from "../../../shared/schemas/reviews";
import { disagreements } from "../../../shared/rubric/logic";
import { examContext } from "../../repositories/exams";
import { getRubric } from "../../repositories/rubrics";
import { getSettings, updateSettings } from "../../repositories/settings";
import { audit } from "../../repositories/audit";
import { assertValidReview, settleExam } from "../../services/reviews";
import { feedbackReady } from "../../services/notify";

export function registerOversightRoutes(kit: RouteKit, { db, config }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/adjudications",
    summary: "Exams whose double reads disagree beyond tolerance, with both reads side by side",
    tag: "oversight",
    access: ["qa_lead", "reviewer"],
    responses: { 200: { description: "Open adjudications" } },
    handler: async ({ user }) => {
      const q = db("assignments as a")
        .join("exams as e", "e.id", "a.exam_id")
        .join("applications as ap", "ap.id", "e.application_id")
        .where({ "a.program_id": user.programId, "a.kind": "adjudication" })
        .whereIn("a.state", ["open", "claimed"]);
      // A reviewer sees only the adjudications a QA lead handed to them.
      if (!user.roles.includes("qa_lead")) q.andWhere("a.assigned_to", user.id);
      const rows = await q
        .orderBy("a.due_at")
        .select("a.id as assignment_id", "a.exam_id", "a.rubric_id", "a.assigned_to", "e.code", "e.setting", "ap.code as app_code", "ap.name as app_name");
      const reads = await db("reviews as r")
        .join("assignments as a", "a.id", "r.assignment_id")
        .join("users as u", "u.id", "r.reviewer_id")
        .whereIn(
          "r.exam_id",
          rows.map((r) => r.exam_id),
        )
        .whereIn("a.kind", ["primary", "second"])
        .select("r.exam_id", "a.kind", "u.name as reviewer", "u.id as reviewer_id", "r.scores", "r.reads", "r.feedback", "r.submitted_at");
      const items = [];
      for (const r of rows) {
        const rubric = await getRubric(db, user.programId, r.rubric_id);
        const both = reads.filter((x) => x.exam_id === r.exam_id);
        const primary = both.find((x) => x.kind === "primary");
        const second = both.find((x) => x.kind === "second");
        items.push({
          assignmentId: r.assignment_id,
          examId: r.exam_id,
          examCode: r.code,
          setting: r.setting,
          application: { code: r.app_code, name: r.app_name },
          assignedTo: r.assigned_to,
          rubric: rubric ? { id: rubric.id, version: rubric.version, criteria: rubric.criteria } : null,
          reads: both.map((x) => ({
            kind: x.kind,
            reviewer: x.reviewer,
            reviewerId: x.reviewer_id,
            scores: x.scores,
            reads: x.reads,
            feedback: x.feedback,
            submittedAt: x.submitted_at.toISOString(),
          })),
          disagreements: rubric && primary && second ? disagreements(rubric.criteria, r.app_code, primary, second).map((d) => d.key) : [],
        });
      }
      return { items };
    },
  });

  defineRoute(kit, {
    method: "post",
    path: "/exams/:id/adjudicate",
    summary: "Set the final scores of an exam in adjudication (QA lead, or the reviewer it was handed to)",
    tag: "oversight",
    access: ["qa_lead", "reviewer"],
    params: idParamsSchema,
    body: adjudicateSchema,
    responses: { 200: { description: "Final result set" }, 409: { description: "Not in adjudication" } },
    handler: async ({ req, user, params, body }) => {
      const result = await db.transaction(async (trx) => {
        const a = await trx("assignments")
          .where({ exam_id: params.id, program_id: user.programId, kind: "adjudication" })
          .whereIn("state", ["open", "claimed"])
          .forUpdate()
          .first();
        const exam = await examContext(trx, user.programId, params.id);
        if (!exam) throw notFound("Exam");
        if (!a) throw new HttpError(409, "not_in_adjudication", "This exam is not waiting for adjudication");
        if (!user.roles.includes("qa_lead") && a.assigned_to !== user.id)
          throw new HttpError(403, "forbidden", "Only a QA lead or the reviewer chosen for this adjudication can set the final scores");
        if (exam.sonographer_id === user.id) throw new HttpError(403, "own_exam", "You cannot adjudicate your own exam");
        const rubric = await getRubric(trx, user.programId, a.rubric_id);
        if (!rubric) throw new HttpError(409, "no_rubric", "The rubric of this exam is missing");
        assertValidReview(rubric, exam, body.scores, body.reads);
        const settings = await getSettings(trx, user.programId);
        await trx("assignments").where("id", a.id).update({ state: "submitted", reviewer_id: user.id, submitted_at: trx.fn.now(), lease_expires_at: null });
        const settled = await settleExam(
          trx,
          rubric,
          exam,
          { scores: body.scores, reads: body.reads, source: "adjudicated", decidedBy: user.id, note: body.note },
          settings,
        );
        await audit(trx, {
          programId: user.programId,
          actorUserId: user.id,
          action: "exam.adjudicated",
          entityType: "exam",
          entityId: exam.id,
          ip: req.ip,
          details: { scores: body.scores, note: body.note },
        });
        await feedbackReady(trx, config.appUrl, exam);
        return settled;
      });
      return { examId: params.id, credit: result.credit, significantDisagreement: result.significant };
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/follow-ups",
    summary: "Clinically significant disagreements to follow up (for example a patient callback)",
    tag: "oversight",
    access: ["qa_lead"],
    query: z.object({ status: z.enum(["open", "in_progress", "closed"]).optional() }),
    responses: { 200: { description: "Follow-ups" } },
    handler: async ({ user, query }) => {
      const q = db("follow_ups as f")
        .join("exams as e", "e.id", "f.exam_id")
        .join("applications as ap", "ap.id", "e.application_id")
        .join("users as s", "s.id", "e.sonographer_id")
        .leftJoin("users as c", "c.id", "f.closed_by")
        .where("f.program_id", user.programId);
      if (query.status) q.andWhere("f.status", query.status);
      const rows = await q
        .orderBy("f.created_at", "desc")
        .select("f.*", "e.code", "e.performed_at", "ap.name as application", "s.name as sonographer", "c.name as closed_by_name");
      return {
        items: rows.map((r) => ({
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
        })),
      };
    },
  });

  defineRoute(kit, {
    method: "patch",
    path: "/follow-ups/:id",
    summary: "Update a follow-up's status and note",
    tag: "oversight",
    access: ["qa_lead"],
    params: idParamsSchema,
    body: followUpUpdateSchema,
    responses: { 200: { description: "Updated" } },
    handler: async ({ req, user, params, body }) =>
      db.transaction(async (trx) => {
        const closing = body.status === "closed";
        const [row] = await trx("follow_ups")
          .where({ id: params.id, program_id: user.programId })
          .update({
            status: body.status,
            ...(body.note !== undefined ? { note: body.note } : {}),
            closed_at: closing ? trx.fn.now() : null,
            closed_by: closing ? user.id : null,
          })
          .returning(["id", "status"]);
        if (!row) throw notFound("Follow-up");
        await audit(trx, {
          programId: user.programId,
          actorUserId: user.id,
          action: "follow_up.updated",
          entityType: "follow_up",
          entityId: row.id,
          ip: req.ip,
          details: body,
        });
        return row;
      }),
  });

  defineRoute(kit, {
    method: "get",
    path: "/snippets",
    summary: "The program's reusable feedback snippets",
    tag: "oversight",
    access: ["reviewer", "qa_lead"],
    responses: { 200: { description: "Snippets" } },
    handler: async ({ user }) => ({
      snippets: await db("snippets")
        .where("program_id", user.programId)
        .orderBy(["criterion_key", "created_at"])
        .select("id", "criterion_key as criterionKey", "text"),
    }),
  });

  defineRoute(kit, {
    method: "post",
    path: "/snippets",
    summary: "Add a feedback snippet (optionally for one criterion)",
    tag: "oversight",
    access: ["qa_lead"],
    body: snippetInputSchema,
    responses: { 201: { description: "Added" } },
    handler: async ({ req, res, user, body }) => {
      const [row] = await db("snippets")
        .insert({ program_id: user.programId, criterion_key: body.criterionKey, text: body.text, created_by: user.id })
        .returning(["id", "criterion_key as criterionKey", "text"]);
      await audit(db, { programId: user.programId, actorUserId: user.id, action: "snippet.created", entityType: "snippet", entityId: row.id, ip: req.ip });
      res.status(201).json({ snippet: row });
    },
  });

  defineRoute(kit, {
    method: "delete",
    path: "/snippets/:id",
    summary: "Remove a feedback snippet",
    tag: "oversight",
    access: ["qa_lead"],
    params: idParamsSchema,
    responses: { 204: { description: "Removed" } },
    handler: async ({ req, user, params }) => {
      const n = await db("snippets").where({ id: params.id, program_id: user.programId }).delete();
      if (!n) throw notFound("Snippet");
      await audit(db, { programId: user.programId, actorUserId: user.id, action: "snippet.deleted", entityType: "snippet", entityId: params.id, ip: req.ip });
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/settings",
    summary: "Program settings (double-read share, blinding, turnaround target, lease, credit rule)",
    tag: "oversight",
    access: ["qa_lead", "admin"],
    responses: { 200: { description: "Settings", schema: z.object({ settings: programSettingsSchema }) } },
    handler: async ({ user }) => ({ settings: await getSettings(db, user.programId) }),
  });

  defineRoute(kit, {
    method: "patch",
    path: "/settings",
    summary: "Change program settings",
    tag: "oversight",
    access: ["qa_lead", "admin"],
    body: programSettingsUpdateSchema,
    responses: { 200: { description: "Settings", schema: z.object({ settings: programSettingsSchema }) } },
    handler: async ({ req, user, body }) =>
      db.transaction(async (trx) => {
        const before = await getSettings(trx, user.programId);
        const settings = await updateSettings(trx, user.programId, body);
        await audit(trx, {
          programId: user.programId,
          actorUserId: user.id,
          action: "settings.changed",
          entityType: "program",
          entityId: user.programId,
          ip: req.ip,
          details: { before, after: settings },
        });
        return { settings };
      }),
  });
}
