// Exams: create and edit drafts, list my exams, read one, submit for review, discard. Every
// route under /exams is registered from here; sub-resources have their own file.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import {
  examCreateSchema,
  examListQuerySchema,
  examListResponseSchema,
  examResponseSchema,
  examUpdateSchema,
  idParamsSchema,
  submitExamSchema,
} from "./schema";
import { presentExamListItem, presentExamView } from "../../presenters/exam";
import { actorOf } from "../../services/actor";
import { createExam, discardExam, examForViewer, listMyExams, submitExam, updateExam } from "../../services/exams";
import { registerExamClipRoutes } from "./clips";
import { registerAdjudicateRoute } from "./adjudicate";
import { registerExamFeedbackRoutes } from "./feedback";
import { registerConfirmationRoutes } from "./confirmations";

export function registerExamRoutes(kit: RouteKit, ctx: RouteContext) {
  const { db } = ctx;

  defineRoute(kit, {
    method: "post",
    path: "/exams",
    summary: "Create an exam (a draft) with the clinician's own read of each finding",
    tag: "exams",
    access: ["sonographer"],
    body: examCreateSchema,
    responses: { 201: { description: "Created", schema: examResponseSchema } },
    handler: async ({ req, res, user, body }) => {
      const exam = presentExamView(await createExam(ctx, user, actorOf(req, user), body));
      res.status(201);
      return { exam };
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/exams",
    summary: "My exams, filtered, sorted and paged on the server",
    tag: "exams",
    access: ["sonographer"],
    query: examListQuerySchema,
    responses: { 200: { description: "A page of exams", schema: examListResponseSchema } },
    handler: async ({ user, query }) => {
      const { rows, total } = await listMyExams(db, user, query);
      return { items: rows.map(presentExamListItem), total };
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/exams/:id",
    summary: "One exam with its clips, their processing state and media URLs",
    tag: "exams",
    access: "signed_in",
    params: idParamsSchema,
    responses: { 200: { description: "The exam", schema: examResponseSchema }, 404: { description: "No such exam visible to you" } },
    handler: async ({ user, params }) => ({ exam: presentExamView(await examForViewer(db, user, params.id)) }),
  });

  defineRoute(kit, {
    method: "patch",
    path: "/exams/:id",
    summary: "Edit a draft exam",
    tag: "exams",
    access: ["sonographer"],
    params: idParamsSchema,
    body: examUpdateSchema,
    responses: { 200: { description: "Updated", schema: examResponseSchema }, 409: { description: "Already submitted" } },
    handler: async ({ req, user, params, body }) => ({ exam: presentExamView(await updateExam(ctx, user, actorOf(req, user), params.id, body)) }),
  });

  defineRoute(kit, {
    method: "post",
    path: "/exams/:id/submit",
    summary: "Send a draft to review: needs the attestation and every clip processed (at least one)",
    tag: "exams",
    access: ["sonographer"],
    params: idParamsSchema,
    body: submitExamSchema,
    responses: { 200: { description: "Submitted", schema: examResponseSchema }, 409: { description: "Not ready to submit" } },
    handler: async ({ req, user, params }) => ({ exam: presentExamView(await submitExam(ctx, user, actorOf(req, user), params.id)) }),
  });

  defineRoute(kit, {
    method: "delete",
    path: "/exams/:id",
    summary: "Discard a draft exam and its clips",
    tag: "exams",
    access: ["sonographer"],
    params: idParamsSchema,
    responses: { 204: { description: "Discarded" }, 409: { description: "Already submitted" } },
    handler: async ({ req, user, params }) => {
      await discardExam(ctx, user, actorOf(req, user), params.id);
    },
  });

  // Sub-resources of /exams/:id, one file each.
  registerExamClipRoutes(kit, ctx);
  registerAdjudicateRoute(kit, ctx);
  registerExamFeedbackRoutes(kit, ctx);
  registerConfirmationRoutes(kit, ctx);
}
