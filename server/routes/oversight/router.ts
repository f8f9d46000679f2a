// The QA lead's review oversight: adjudication of disagreeing double reads. (Follow-ups,
// snippets and settings have their own folders: routes/follow-ups, snippets, settings.)
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { HttpError, notFound } from "../../http/errors";
import { idParamsSchema } from "../../../shared/schemas/common";
import { adjudicateSchema } from "../../../shared/schemas/reviews";
import { disagreements } from "../../../shared/rubric/logic";
import { examContext } from "../../repositories/exams";
import { getRubric } from "../../repositories/rubrics";
import { getSettings } from "../../repositories/settings";
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
}
