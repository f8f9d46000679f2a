// /snippets: the program's reusable feedback snippets; reviewers read them, a QA lead keeps them.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { idParamsSchema, snippetAnswerSchema, snippetInputSchema, snippetListSchema } from "./schema";
import { actorOf } from "../../services/actor";
import { addSnippet, programSnippets, removeSnippet } from "../../services/snippets";

export function registerSnippetRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/snippets",
    summary: "The program's reusable feedback snippets",
    tag: "oversight",
    access: ["reviewer", "qa_lead"],
    responses: { 200: { description: "Snippets", schema: snippetListSchema } },
    handler: async ({ user }) => ({ snippets: await programSnippets(db, user.programId) }),
  });

  defineRoute(kit, {
    method: "post",
    path: "/snippets",
    summary: "Add a feedback snippet (optionally for one criterion)",
    tag: "oversight",
    access: ["qa_lead"],
    body: snippetInputSchema,
    responses: { 201: { description: "Added", schema: snippetAnswerSchema } },
    handler: async ({ req, res, user, body }) => {
      const snippet = await addSnippet(db, actorOf(req, user), body);
      res.status(201);
      return { snippet };
    },
  });

  defineRoute(kit, {
    method: "delete",
    path: "/snippets/:id",
    summary: "Remove a feedback snippet",
    tag: "oversight",
    access: ["qa_lead"],
    params: idParamsSchema,
    responses: { 204: { description: "Removed" } },
    handler: async ({ req, user, params }) => {
      await removeSnippet(db, actorOf(req, user), params.id);
    },
  });
}
