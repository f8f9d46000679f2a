// The QA lead's roster (README "Progress and credentialing"): every sonographer of the
// program with progress and flags, and one sonographer's progress and feedback.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { feedbackListSchema, idParamsSchema, progressQuerySchema, progressSchema, rosterSchema } from "./schema";
import { roster, sonographerProgress } from "../../services/progress";
import { sonographerFeedback } from "../../services/feedback";

export function registerRosterRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/roster",
    summary: "Every clinician of the program with progress per application, last activity and flags",
    tag: "progress",
    access: ["qa_lead"],
    responses: { 200: { description: "Roster", schema: rosterSchema } },
    handler: async ({ user }) => ({ items: await roster(db, user.programId) }),
  });

  defineRoute(kit, {
    method: "get",
    path: "/roster/:id/progress",
    summary: "One clinician's progress (QA lead)",
    tag: "progress",
    access: ["qa_lead"],
    params: idParamsSchema,
    query: progressQuerySchema,
    responses: { 200: { description: "Progress", schema: progressSchema }, 404: { description: "Not a clinician of this program" } },
    handler: ({ user, params, query }) => sonographerProgress(db, user.programId, params.id, query),
  });

  defineRoute(kit, {
    method: "get",
    path: "/roster/:id/feedback",
    summary: "A clinician's reviewed exams with their feedback and the reviewers' names (QA lead)",
    tag: "progress",
    access: ["qa_lead"],
    params: idParamsSchema,
    responses: { 200: { description: "Feedback", schema: feedbackListSchema }, 404: { description: "Not a clinician of this program" } },
    handler: ({ user, params }) => sonographerFeedback(db, user, params.id),
  });
}
