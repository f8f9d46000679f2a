// Setup → Audit log: the program's events, newest first.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { presentAuditEntry } from "../../presenters/audit";
import { readAuditLog } from "../../services/audit-log";
import { auditPageSchema, auditQuerySchema } from "./schema";

export function registerAuditRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/audit",
    summary: "The program's audit log",
    tag: "audit",
    access: ["admin"],
    query: auditQuerySchema,
    responses: { 200: { description: "Entries", schema: auditPageSchema } },
    handler: async ({ user, query }) => {
      const { rows, total } = await readAuditLog(db, user.programId, query);
      return { total, entries: rows.map(presentAuditEntry) };
    },
  });
}
