// Confirmatory results per finding of an exam (README "Progress and credentialing" →
// Accuracy): its sonographer or a QA lead reads and records them. Registered from ./router.ts.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { confirmationsInputSchema, confirmationsSchema, idParamsSchema } from "./schema";
import { actorOf } from "../../services/actor";
import { examConfirmations, saveConfirmations } from "../../services/confirmations";

export function registerConfirmationRoutes(kit: RouteKit, { db }: Pick<RouteContext, "db">) {
  defineRoute(kit, {
    method: "get",
    path: "/exams/:id/confirmations",
    summary: "Confirmatory results (CT, formal echo, surgery, clinical follow-up) for each finding of an exam",
    tag: "progress",
    access: ["sonographer", "qa_lead"],
    params: idParamsSchema,
    responses: { 200: { description: "Confirmations", schema: confirmationsSchema }, 404: { description: "No such exam of yours" } },
    handler: ({ user, params }) => examConfirmations(db, user, params.id),
  });

  defineRoute(kit, {
    method: "put",
    path: "/exams/:id/confirmations",
    summary:
      "Record what confirmatory tests later showed (the exam's clinician or a QA lead); replaces the listed findings' entries, and method null clears one",
    tag: "progress",
    access: ["sonographer", "qa_lead"],
    params: idParamsSchema,
    body: confirmationsInputSchema,
    responses: {
      200: { description: "Confirmations", schema: confirmationsSchema },
      404: { description: "No such exam of yours" },
      409: { description: "The exam is still a draft" },
    },
    handler: ({ req, user, params, body }) => saveConfirmations(db, user, actorOf(req, user), params.id, body),
  });
}
