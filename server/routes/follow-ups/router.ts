// /follow-ups: clinically significant disagreements the QA lead follows up (for example a
// patient callback), and moving one on with a note.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { encounterRefSchema, followUpListQuerySchema, followUpListSchema, followUpUpdatedSchema, followUpUpdateSchema, idParamsSchema } from "./schema";
import { actorOf } from "../../services/actor";
import { programFollowUps, revealEncounterRef, updateFollowUp } from "../../services/follow-ups";

export function registerFollowUpRoutes(kit: RouteKit, { db, config }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/follow-ups",
    summary: "Clinically significant disagreements to follow up (for example a patient callback)",
    tag: "oversight",
    access: ["qa_lead"],
    query: followUpListQuerySchema,
    responses: { 200: { description: "Follow-ups", schema: followUpListSchema } },
    handler: async ({ user, query }) => ({ items: await programFollowUps(db, user.programId, query.status) }),
  });

  defineRoute(kit, {
    method: "patch",
    path: "/follow-ups/:id",
    summary: "Update a follow-up's status and note",
    tag: "oversight",
    access: ["qa_lead"],
    params: idParamsSchema,
    body: followUpUpdateSchema,
    responses: { 200: { description: "Updated", schema: followUpUpdatedSchema } },
    handler: async ({ req, user, params, body }) => updateFollowUp(db, actorOf(req, user), params.id, body),
  });

  defineRoute(kit, {
    method: "post",
    path: "/follow-ups/:id/encounter-reference",
    summary: "Open the encounter reference the clinician gave, for the callback (QA lead; every reveal is audited)",
    tag: "oversight",
    access: ["qa_lead"],
    params: idParamsSchema,
    responses: {
      200: { description: "The reference", schema: encounterRefSchema },
      404: { description: "No such follow-up, or no reference" },
      503: { description: "No key on this server" },
    },
    handler: ({ req, user, params }) => revealEncounterRef(db, config.encounterKey, actorOf(req, user), params.id),
  });
}
