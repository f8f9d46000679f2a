// Setup → Rubrics: versioned rubrics. Saving a published rubric makes its next version (the
// old one is archived); reviews keep the version they were made under, so editing never
// changes a past score.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { idParamsSchema, rubricAnswerSchema, rubricInputSchema, rubricListSchema } from "./schema";
import { actorOf } from "../../services/actor";
import { archiveRubric, createRubric, programRubrics, publishRubric, rubricById, saveRubric } from "../../services/rubrics";

export function registerRubricRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/rubrics",
    summary: "Every rubric version of the program",
    tag: "rubrics",
    access: ["qa_lead", "reviewer"],
    responses: { 200: { description: "Rubric versions", schema: rubricListSchema } },
    handler: async ({ user }) => ({ rubrics: await programRubrics(db, user.programId) }),
  });

  defineRoute(kit, {
    method: "get",
    path: "/rubrics/:id",
    summary: "One rubric version with its criteria",
    tag: "rubrics",
    access: ["qa_lead", "reviewer"],
    params: idParamsSchema,
    responses: { 200: { description: "The rubric", schema: rubricAnswerSchema } },
    handler: async ({ user, params }) => ({ rubric: await rubricById(db, user.programId, params.id) }),
  });

  defineRoute(kit, {
    method: "post",
    path: "/rubrics",
    summary: "Start a new rubric (a draft, version 1)",
    tag: "rubrics",
    access: ["qa_lead"],
    body: rubricInputSchema,
    responses: { 201: { description: "Created", schema: rubricAnswerSchema } },
    handler: async ({ req, res, user, body }) => {
      const rubric = await createRubric(db, actorOf(req, user), body);
      res.status(201);
      return { rubric };
    },
  });

  defineRoute(kit, {
    method: "put",
    path: "/rubrics/:id",
    summary: "Save a rubric: a draft changes in place; a published one gets a new published version",
    tag: "rubrics",
    access: ["qa_lead"],
    params: idParamsSchema,
    body: rubricInputSchema,
    responses: { 200: { description: "Saved (the id may be a new version's)", schema: rubricAnswerSchema }, 409: { description: "Archived" } },
    handler: async ({ req, user, params, body }) => ({ rubric: await saveRubric(db, actorOf(req, user), params.id, body) }),
  });

  for (const action of ["publish", "archive"] as const) {
    defineRoute(kit, {
      method: "post",
      path: `/rubrics/:id/${action}`,
      summary: action === "publish" ? "Publish a draft (the family's published version is archived)" : "Archive a rubric version",
      tag: "rubrics",
      access: ["qa_lead"],
      params: idParamsSchema,
      responses: { 200: { description: "Done", schema: rubricAnswerSchema } },
      handler: async ({ req, user, params }) => ({
        rubric: await (action === "publish" ? publishRubric : archiveRubric)(db, actorOf(req, user), params.id),
      }),
    });
  }
}
