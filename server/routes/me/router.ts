// The signed-in sonographer's own records: progress toward credentialing and the feedback on
// their reviewed exams (README "Progress and credentialing", "Review rules" → Feedback).
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { feedbackListSchema, feedbackSchema, idParamsSchema, progressQuerySchema, progressSchema } from "./schema";
import { myProgress } from "../../services/progress";
import { myFeedback, openFeedback } from "../../services/feedback";

export function registerMeRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/me/progress",
    summary: "My progress: counts toward each application's threshold, learning curves, trends, strengths and focus areas, accuracy",
    tag: "progress",
    access: ["sonographer"],
    query: progressQuerySchema,
    responses: { 200: { description: "Progress", schema: progressSchema } },
    handler: ({ user, query }) => myProgress(db, user, query),
  });

  defineRoute(kit, {
    method: "get",
    path: "/me/feedback",
    summary: "My reviewed exams with their final scores and feedback, newest first",
    tag: "feedback",
    access: ["sonographer"],
    responses: { 200: { description: "Feedback", schema: feedbackListSchema } },
    handler: ({ user }) => myFeedback(db, user),
  });

  defineRoute(kit, {
    method: "get",
    path: "/me/feedback/:id",
    summary: "The feedback on one of my exams (marks its notification read)",
    tag: "feedback",
    access: ["sonographer"],
    params: idParamsSchema,
    responses: { 200: { description: "Feedback", schema: feedbackSchema }, 404: { description: "Not a reviewed exam of yours" } },
    handler: ({ user, params }) => openFeedback(db, user, params.id),
  });
}
