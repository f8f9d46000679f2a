// The program's application catalogue with views and findings.
import { z } from "zod";
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { applicationSchema } from "../../../shared/schemas/applications";
import { listApplications } from "../../repositories/applications";

export function registerApplicationRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/applications",
    summary: "The program's application catalogue",
    tag: "applications",
    access: "signed_in",
    responses: { 200: { description: "Applications", schema: z.object({ applications: z.array(applicationSchema) }) } },
    handler: async ({ user }) => ({ applications: await listApplications(db, user.programId) }),
  });
}
