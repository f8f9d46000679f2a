// /home: "what needs me now", per role the caller holds (services/home.ts).
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { homeSchema } from "./schema";
import { homeOf } from "../../services/home";

export function registerHomeRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/home",
    summary: "Counts of what waits for the caller, per role",
    tag: "home",
    access: "signed_in",
    responses: { 200: { description: "Home sections", schema: homeSchema } },
    handler: ({ user }) => homeOf(db, user),
  });
}
