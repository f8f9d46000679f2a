// The sonographer's acknowledgement of an exam's feedback and the question thread about it
// (README "Review rules" → Feedback). Registered from ./router.ts.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { acknowledgementSchema, idParamsSchema, messageInputSchema, messageThreadSchema, postedMessageSchema } from "./schema";
import { actorOf } from "../../services/actor";
import { acknowledgeFeedback } from "../../services/feedback";
import { messageThread, postMessage } from "../../services/messages";

export function registerExamFeedbackRoutes(kit: RouteKit, { db, config }: Pick<RouteContext, "db" | "config">) {
  defineRoute(kit, {
    method: "post",
    path: "/exams/:id/acknowledge",
    summary: "Acknowledge that I have read the feedback",
    tag: "feedback",
    access: ["sonographer"],
    params: idParamsSchema,
    responses: { 200: { description: "Acknowledged", schema: acknowledgementSchema } },
    handler: ({ req, user, params }) => acknowledgeFeedback(db, actorOf(req, user), params.id),
  });

  defineRoute(kit, {
    method: "post",
    path: "/exams/:id/messages",
    summary: "Ask (clinician) or answer (a reviewer of the exam, a QA lead) a question about the feedback",
    tag: "feedback",
    access: "signed_in",
    params: idParamsSchema,
    body: messageInputSchema,
    responses: { 201: { description: "Posted", schema: postedMessageSchema } },
    handler: async ({ req, res, user, params, body }) => {
      const posted = await postMessage(db, config.appUrl, user, actorOf(req, user), params.id, body.body);
      res.status(201);
      return posted;
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/exams/:id/messages",
    summary: "The questions and answers about an exam's feedback (its clinician, its reviewers, QA leads)",
    tag: "feedback",
    access: "signed_in",
    params: idParamsSchema,
    responses: { 200: { description: "Messages", schema: messageThreadSchema } },
    handler: ({ user, params }) => messageThread(db, user, params.id),
  });
}
