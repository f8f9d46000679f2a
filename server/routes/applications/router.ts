// The program's application catalogue with views and findings.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { applicationListSchema } from "./schema";
import { programApplications } from "../../services/applications";

export function registerApplicationRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/applications",
    summary: "The program's application catalogue",
    tag: "applications",
    access: "signed_in",
    responses: { 200: { description: "Applications", schema: applicationListSchema } },
    handler: async ({ user }) => ({ applications: await programApplications(db, user.programId) }),
  });
}
