// The DICOM inbox (README "Clips and media", DICOM receiver): studies received from
// ultrasound machines, listed for the clinicians they may belong to and for QA leads, claimed
// by hand when no operator name matched, and made into a draft exam in one step.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { actorOf } from "../../services/actor";
import { claimStudy, examFromStudy, inboxPreview, listInbox } from "../../services/dicom-inbox";
import { sendStored } from "../../http/range";
import { presentExamView } from "../../presenters/exam";
import { examCreateSchema, examResponseSchema, idParamsSchema, inboxListSchema, inboxPreviewParamsSchema, inboxStudyResponseSchema } from "./schema";

export function registerDicomInboxRoutes(kit: RouteKit, ctx: RouteContext) {
  const { db, config, storage } = ctx;
  defineRoute(kit, {
    method: "get",
    path: "/dicom-inbox",
    summary: "Received DICOM studies not yet made into exams (a clinician's own matches, claims and unassigned ones; all for a QA lead or admin)",
    tag: "exams",
    access: ["sonographer", "qa_lead", "admin"],
    responses: { 200: { description: "Inbox", schema: inboxListSchema } },
    handler: async ({ user }) => ({ items: await listInbox(db, user) }),
  });

  defineRoute(kit, {
    method: "get",
    path: "/dicom-inbox/:id/objects/:objectId/preview",
    summary: "The preview (middle frame, JPEG) of a received object, made from the de-identified object",
    tag: "exams",
    access: ["sonographer", "qa_lead", "admin"],
    params: inboxPreviewParamsSchema,
    responses: { 200: { description: "The preview", file: "image/jpeg" }, 404: { description: "Not in an inbox study you may see" } },
    handler: async ({ req, res, user, params }) => {
      await sendStored(req, res, storage, await inboxPreview(db, user, params.id, params.objectId), "image/jpeg");
    },
  });

  defineRoute(kit, {
    method: "post",
    path: "/dicom-inbox/:id/claim",
    summary: "Claim a received study as one's own",
    tag: "exams",
    access: ["sonographer"],
    params: idParamsSchema,
    responses: {
      200: { description: "Claimed", schema: inboxStudyResponseSchema },
      404: { description: "No such open study" },
      409: { description: "Claimed by someone else" },
    },
    handler: async ({ req, user, params }) => ({ study: await claimStudy(db, user, actorOf(req, user), params.id) }),
  });

  defineRoute(kit, {
    method: "post",
    path: "/dicom-inbox/:id/exam",
    summary: "Make a draft exam of a received study: the exam's details, and every object as a clip",
    tag: "exams",
    access: ["sonographer"],
    params: idParamsSchema,
    body: examCreateSchema,
    responses: {
      201: { description: "Created", schema: examResponseSchema },
      404: { description: "No such open study" },
      409: { description: "Claimed by someone else" },
    },
    handler: async ({ req, res, user, params, body }) => {
      const deps = { ...ctx, maxClipsPerExam: config.uploads.maxClipsPerExam };
      const exam = presentExamView(await examFromStudy(deps, user, actorOf(req, user), params.id, body));
      res.status(201);
      return { exam };
    },
  });
}
