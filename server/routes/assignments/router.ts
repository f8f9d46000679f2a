// One read a reviewer holds: the scoring workspace's data, autosaved drafts, giving it back,
// submitting the review; and a QA lead handing a read to a chosen reviewer.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import {
  draftSavedSchema,
  idParamsSchema,
  reassignedSchema,
  reassignSchema,
  reviewDraftSchema,
  reviewSubmittedSchema,
  submitReviewSchema,
  workspaceSchema,
} from "./schema";
import { actorOf } from "../../services/actor";
import { autosaveDraft, handRead, openWorkspace, release } from "../../services/queue";
import { submitRead } from "../../services/reviews";
import { presentDraftSaved, presentReviewSubmitted, presentWorkspace } from "../../presenters/reviewing";

export function registerAssignmentRoutes(kit: RouteKit, { db, config }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/assignments/:id",
    summary: "The scoring workspace's data for an assignment I hold (blinded exam, rubric, my draft, snippets)",
    tag: "queue",
    access: ["reviewer"],
    params: idParamsSchema,
    responses: { 200: { description: "Workspace", schema: workspaceSchema } },
    handler: async ({ req, user, params }) => presentWorkspace(await openWorkspace(db, actorOf(req, user), params.id)),
  });

  defineRoute(kit, {
    method: "put",
    path: "/assignments/:id/draft",
    summary: "Autosave my scores so far; also extends the claim",
    tag: "queue",
    access: ["reviewer"],
    params: idParamsSchema,
    body: reviewDraftSchema,
    responses: { 200: { description: "Saved", schema: draftSavedSchema } },
    handler: async ({ req, user, params, body }) => presentDraftSaved(await autosaveDraft(db, actorOf(req, user), params.id, body)),
  });

  defineRoute(kit, {
    method: "post",
    path: "/assignments/:id/release",
    summary: "Give the exam back to the queue",
    tag: "queue",
    access: ["reviewer"],
    params: idParamsSchema,
    responses: { 204: { description: "Released" } },
    handler: ({ req, user, params }) => release(db, actorOf(req, user), params.id),
  });

  defineRoute(kit, {
    method: "post",
    path: "/assignments/:id/review",
    summary: "Submit my scores, my own read of each finding and feedback",
    tag: "queue",
    access: ["reviewer"],
    params: idParamsSchema,
    body: submitReviewSchema,
    responses: {
      201: { description: "Submitted; the exam's state after it", schema: reviewSubmittedSchema },
      409: { description: "Already submitted or no longer held" },
    },
    handler: async ({ req, res, user, params, body }) => {
      const submitted = presentReviewSubmitted(await submitRead(db, config.appUrl, actorOf(req, user), params.id, body));
      res.status(201);
      return submitted;
    },
  });

  defineRoute(kit, {
    method: "post",
    path: "/assignments/:id/reassign",
    summary: "Give an unsubmitted read to a chosen reviewer (QA lead)",
    tag: "queue",
    access: ["qa_lead"],
    params: idParamsSchema,
    body: reassignSchema,
    responses: { 200: { description: "Reassigned", schema: reassignedSchema } },
    handler: ({ req, user, params, body }) => handRead(db, actorOf(req, user), params.id, body.reviewerId),
  });
}
