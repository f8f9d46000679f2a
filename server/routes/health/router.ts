// Liveness with a database round trip: 503 when PostgreSQL does not answer in time.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { checkHealth } from "../../services/health";
import { healthSchema } from "./schema";

export function registerHealthRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/health",
    summary: "Service and database health",
    tag: "health",
    access: "public",
    responses: { 200: { description: "Up", schema: healthSchema }, 503: { description: "Database down", schema: healthSchema } },
    handler: async ({ res }) => {
      const health = await checkHealth(db);
      res.status(health.ok ? 200 : 503);
      return health;
    },
  });
}
