// Setup → Applications: the program's catalogue of exam types. Every member reads the
// published versions; a QA lead or admin adds and edits them. Saving a changed application
// publishes its next version and archives the old one; exams keep the version they were
// recorded under, so their views and findings keep their labels.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import {
  applicationAnswerSchema,
  applicationInputSchema,
  applicationListSchema,
  applicationVersionListSchema,
  idParamsSchema,
  newApplicationSchema,
} from "./schema";
import { actorOf } from "../../services/actor";
import { applicationById, applicationVersions, createApplication, programApplications, saveApplication } from "../../services/applications";

const EDITORS = ["qa_lead", "admin"] as const;

export function registerApplicationRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/applications",
    summary: "The program's application catalogue (the published version of each application)",
    tag: "applications",
    access: "signed_in",
    responses: { 200: { description: "Applications", schema: applicationListSchema } },
    handler: async ({ user }) => ({ applications: await programApplications(db, user.programId) }),
  });

  defineRoute(kit, {
    method: "get",
    path: "/applications/:id",
    summary: "One version of an application, published or archived",
    tag: "applications",
    access: "signed_in",
    params: idParamsSchema,
    responses: { 200: { description: "The application version", schema: applicationAnswerSchema } },
    handler: async ({ user, params }) => ({ application: await applicationById(db, user.programId, params.id) }),
  });

  defineRoute(kit, {
    method: "get",
    path: "/applications/:id/versions",
    summary: "Every version of the application, newest first, with the exams recorded under each",
    tag: "applications",
    access: "signed_in",
    params: idParamsSchema,
    responses: { 200: { description: "Versions", schema: applicationVersionListSchema } },
    handler: async ({ user, params }) => ({ versions: await applicationVersions(db, user.programId, params.id) }),
  });

  defineRoute(kit, {
    method: "post",
    path: "/applications",
    summary: "Add an application (version 1)",
    tag: "applications",
    access: EDITORS,
    body: newApplicationSchema,
    responses: { 201: { description: "Added", schema: applicationAnswerSchema }, 409: { description: "The code is taken" } },
    handler: async ({ req, res, user, body }) => {
      const application = await createApplication(db, actorOf(req, user), body);
      res.status(201);
      return { application };
    },
  });

  defineRoute(kit, {
    method: "put",
    path: "/applications/:id",
    summary: "Save an application: when anything changed, its next version is published and this one archived",
    tag: "applications",
    access: EDITORS,
    params: idParamsSchema,
    body: applicationInputSchema,
    responses: { 200: { description: "Saved (the id is the new version's)", schema: applicationAnswerSchema }, 409: { description: "Archived" } },
    handler: async ({ req, user, params, body }) => ({ application: await saveApplication(db, actorOf(req, user), params.id, body) }),
  });
}
