// Invitations from the accept page: what one offers, and accepting it. Both are public and
// rate-limited; the token is checked before any password is hashed.
import type { RequestHandler } from "express";
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { acceptInvitationSchema, invitationPreviewSchema, invitationTokenParamsSchema, loginResponseSchema } from "./schema";
import { acceptInvitation, previewInvitation } from "../../services/invitations";

export function registerInvitationRoutes(kit: RouteKit, { db, config }: RouteContext, limits: RequestHandler[]) {
  defineRoute(kit, {
    method: "get",
    path: "/auth/invitations/:token",
    summary: "What an invitation offers, for the accept page",
    tag: "auth",
    access: "public",
    params: invitationTokenParamsSchema,
    before: limits,
    responses: {
      200: { description: "The invitation", schema: invitationPreviewSchema },
      404: { description: "Not valid" },
      429: { description: "Too many attempts" },
    },
    handler: ({ params }) => previewInvitation(db, params.token),
  });

  defineRoute(kit, {
    method: "post",
    path: "/auth/invitations/accept",
    summary: "Accept an invitation: set a password (or confirm your existing one) and join the program",
    tag: "auth",
    access: "public",
    body: acceptInvitationSchema,
    before: limits,
    responses: {
      200: { description: "Joined and signed in", schema: loginResponseSchema },
      404: { description: "Not valid" },
      429: { description: "Too many attempts" },
    },
    handler: ({ req, res, body }) => acceptInvitation(db, config, req, res, body),
  });
}
