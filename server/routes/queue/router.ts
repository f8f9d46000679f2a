// The review queue: what waits and what I hold, and claiming the next exam ("Start next").
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { queueNextSchema, queueOverviewSchema, workspaceSchema } from "./schema";
import { actorOf } from "../../services/actor";
import { queueOverview, startNext } from "../../services/queue";
import { presentQueueOverview, presentWorkspace } from "../../presenters/reviewing";

export function registerQueueRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/queue",
    summary: "What waits in the review queue (by application and setting) and what I hold",
    tag: "queue",
    access: ["reviewer"],
    responses: { 200: { description: "Queue overview", schema: queueOverviewSchema } },
    handler: async ({ req, user }) => presentQueueOverview(await queueOverview(db, actorOf(req, user))),
  });

  defineRoute(kit, {
    method: "post",
    path: "/queue/next",
    summary: "Claim the next due exam (oldest first, clinical before educational); 204 when none is waiting",
    tag: "queue",
    access: ["reviewer"],
    body: queueNextSchema,
    responses: {
      200: { description: "The claimed assignment and its blinded exam", schema: workspaceSchema },
      204: { description: "Nothing waiting" },
    },
    handler: async ({ req, user, body }) => {
      const workspace = await startNext(db, actorOf(req, user), body.application);
      return workspace && presentWorkspace(workspace);
    },
  });
}
