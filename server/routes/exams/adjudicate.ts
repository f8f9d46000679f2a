// The decision on an exam in adjudication: the final scores, set by a QA lead or the reviewer
// it was handed to (the list of open adjudications is GET /adjudications).
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { adjudicatedSchema, adjudicateSchema, idParamsSchema } from "./schema";
import { actorOf } from "../../services/actor";
import { adjudicate } from "../../services/reviews";

export function registerAdjudicateRoute(kit: RouteKit, { db, config }: Pick<RouteContext, "db" | "config">) {
  defineRoute(kit, {
    method: "post",
    path: "/exams/:id/adjudicate",
    summary: "Set the final scores of an exam in adjudication (QA lead, or the reviewer it was handed to)",
    tag: "oversight",
    access: ["qa_lead", "reviewer"],
    params: idParamsSchema,
    body: adjudicateSchema,
    responses: { 200: { description: "Final result set", schema: adjudicatedSchema }, 409: { description: "Not in adjudication" } },
    handler: ({ req, user, params, body }) => adjudicate(db, config.appUrl, { ...actorOf(req, user), roles: user.roles }, params.id, body),
  });
}
