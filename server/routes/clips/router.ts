// Clips: label and redact, remove, retry after a failure, and the authorized media route
// (with Range) that the players use. Media is never a public folder. Uploads are a
// sub-resource of their exam (routes/exams/clips.ts).
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { sendStored } from "../../http/range";
import { clipMediaParamsSchema, clipResponseSchema, clipUpdateSchema, idParamsSchema } from "./schema";
import { presentClip } from "../../presenters/exam";
import { SERVED_MEDIA_TYPES } from "../../storage/keys";
import { actorOf } from "../../services/actor";
import { clipMedia, removeClip, retryClip, updateClip } from "../../services/clips";

export function registerClipRoutes(kit: RouteKit, ctx: RouteContext) {
  const { db, storage } = ctx;

  defineRoute(kit, {
    method: "patch",
    path: "/clips/:id",
    summary: "Label a clip with its view and set redaction boxes (changing boxes reprocesses the clip)",
    tag: "clips",
    access: ["sonographer"],
    params: idParamsSchema,
    body: clipUpdateSchema,
    responses: { 200: { description: "Updated", schema: clipResponseSchema } },
    handler: async ({ req, user, params, body }) => ({
      clip: presentClip(await updateClip(ctx, user, actorOf(req, user), params.id, body), { forOwner: true }),
    }),
  });

  defineRoute(kit, {
    method: "post",
    path: "/clips/:id/retry",
    summary: "Process a failed clip again",
    tag: "clips",
    access: ["sonographer"],
    params: idParamsSchema,
    responses: { 202: { description: "Queued again", schema: clipResponseSchema }, 409: { description: "The clip has not failed" } },
    handler: async ({ req, res, user, params }) => {
      const row = await retryClip(ctx, user, actorOf(req, user), params.id);
      res.status(202);
      return { clip: presentClip(row, { forOwner: true }) };
    },
  });

  defineRoute(kit, {
    method: "delete",
    path: "/clips/:id",
    summary: "Remove a clip from a draft exam",
    tag: "clips",
    access: ["sonographer"],
    params: idParamsSchema,
    responses: { 204: { description: "Removed" } },
    handler: async ({ req, user, params }) => {
      await removeClip(ctx, user, actorOf(req, user), params.id);
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/clips/:id/media/:variant",
    summary: "A clip's media (video, image, poster, strip, thumb) for those allowed to see the exam; supports Range",
    tag: "clips",
    access: "signed_in",
    params: clipMediaParamsSchema,
    responses: {
      200: { description: "The bytes", file: SERVED_MEDIA_TYPES },
      206: { description: "Part of the bytes", file: SERVED_MEDIA_TYPES },
      404: { description: "Not visible to you, or not processed" },
      416: { description: "Range not satisfiable" },
    },
    handler: async ({ req, res, user, params }) => {
      const { key, type } = await clipMedia(db, user, params.id, params.variant);
      await sendStored(req, res, storage, key, type);
    },
  });
}
