// Liveness with a database round trip: 503 when PostgreSQL does not answer in time.
import { z } from "zod";
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";

const healthSchema = z.object({ ok: z.boolean(), db: z.enum(["up", "down"]) });

export function registerHealthRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/health",
    summary: "Service and database health",
    tag: "health",
    access: "public",
    responses: { 200: { description: "Up", schema: healthSchema }, 503: { description: "Database down", schema: healthSchema } },
    handler: async ({ res }) => {
      const up = await Promise.race([
        db.raw("select 1").then(
          () => true,
          () => false,
        ),
        new Promise<boolean>((r) => setTimeout(() => r(false), 3000).unref()),
      ]);
      res.status(up ? 200 : 503).json({ ok: up, db: up ? "up" : "down" });
    },
  });
}
