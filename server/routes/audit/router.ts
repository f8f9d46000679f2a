// Setup → Audit log: the program's events, newest first.
import { z } from "zod";
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { presentAuditEntry } from "../../presenters/audit";
import { auditEntrySchema, auditQuerySchema } from "../../../shared/schemas/users";

export function registerAuditRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/audit",
    summary: "The program's audit log",
    tag: "audit",
    access: ["admin"],
    query: auditQuerySchema,
    responses: { 200: { description: "Entries", schema: z.object({ entries: z.array(auditEntrySchema), total: z.number() }) } },
    handler: async ({ user, query }) => {
      const base = db("audit_log as a").where("a.program_id", user.programId);
      if (query.action) base.andWhere("a.action", query.action);
      const [rows, [{ count }]] = await Promise.all([
        base
          .clone()
          .leftJoin("users as u", "u.id", "a.actor_user_id")
          .orderBy("a.id", "desc")
          .limit(query.limit)
          .offset(query.offset)
          .select("a.*", "u.name as actor_name"),
        base.clone().count<{ count: string }[]>("* as count"),
      ]);
      return {
        total: Number(count),
        entries: rows.map(presentAuditEntry),
      };
    },
  });
}
