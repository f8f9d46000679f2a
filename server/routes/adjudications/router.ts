// The adjudication list: exams whose double reads disagree beyond tolerance (the decision on
// one is POST /exams/:id/adjudicate, in routes/exams/adjudicate.ts).
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { adjudicationListSchema } from "./schema";
import { openAdjudications } from "../../services/adjudications";
import { presentAdjudication } from "../../presenters/reviewing";

export function registerAdjudicationRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/adjudications",
    summary: "Exams whose double reads disagree beyond tolerance, with both reads side by side",
    tag: "oversight",
    access: ["qa_lead", "reviewer"],
    responses: { 200: { description: "Open adjudications", schema: adjudicationListSchema } },
    handler: async ({ user }) => ({ items: (await openAdjudications(db, user)).map(presentAdjudication) }),
  });
}
