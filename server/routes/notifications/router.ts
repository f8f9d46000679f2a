// The caller's in-app notifications (feedback ready, questions, answers).
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { markNotificationsReadSchema, notificationsSchema } from "./schema";
import { markRead, myNotifications } from "../../services/notifications";

export function registerNotificationRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/notifications",
    summary: "My notifications, unread first",
    tag: "feedback",
    access: "signed_in",
    responses: { 200: { description: "Notifications", schema: notificationsSchema } },
    handler: ({ user }) => myNotifications(db, user),
  });

  defineRoute(kit, {
    method: "post",
    path: "/notifications/read",
    summary: "Mark notifications read (all when no ids are given)",
    tag: "feedback",
    access: "signed_in",
    body: markNotificationsReadSchema,
    responses: { 204: { description: "Marked" } },
    handler: async ({ user, body }) => {
      await markRead(db, user, body.ids);
    },
  });
}
