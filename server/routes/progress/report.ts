// GET /api/reports/credentialing (README "Progress and credentialing", "Report"): the credentialing report as PDF or CSV, for
// one sonographer or the whole program, over a date range. A QA lead may export anyone in
// the program; a sonographer only themself.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { HttpError, forbidden, notFound } from "../../http/errors";
import { credentialingReportQuerySchema } from "../../../shared/schemas/progress";
import { computeProgress, programSonographers } from "../../services/progress";
import { audit } from "../../repositories/audit";
import { credentialingFileName, renderCredentialingCsv, renderCredentialingPdf, type CredentialingReportData } from "../../reports/credentialing";

export function registerCredentialingReportRoute(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/reports/credentialing",
    summary: "The credentialing report (PDF or CSV) for one sonographer or, for a QA lead without userId, the whole program",
    tag: "progress",
    access: ["qa_lead", "sonographer"],
    query: credentialingReportQuerySchema,
    responses: {
      200: { description: "application/pdf or text/csv, as an attachment" },
      403: { description: "A sonographer asked for someone else's report" },
      404: { description: "Not a sonographer of this program" },
    },
    handler: async ({ req, res, user, query }) => {
      if (query.from && query.to && query.from > query.to)
        throw new HttpError(400, "validation_failed", "to: must not be before from", [{ path: "to", message: "must not be before from" }]);
      const lead = user.roles.includes("qa_lead");
      let ids: string[];
      if (!lead) {
        if (query.userId && query.userId !== user.id) throw forbidden("A sonographer may export only their own report");
        ids = [user.id];
      } else if (query.userId) {
        const member = await db("memberships").where({ program_id: user.programId, user_id: query.userId }).whereRaw(`'sonographer' = ANY(roles)`).first("id");
        if (!member) throw notFound("Sonographer");
        ids = [query.userId];
      } else {
        ids = (await programSonographers(db, user.programId)).map((p) => p.id);
      }
      const program = await db("programs").where("id", user.programId).first("name");
      const data: CredentialingReportData = {
        programName: program.name,
        generatedAt: new Date(),
        range: { from: query.from ?? null, to: query.to ?? null },
        scope: lead && !query.userId ? "program" : "sonographer",
        sonographers: await computeProgress(db, user.programId, ids, { from: query.from, to: query.to, window: 10 }),
      };
      const body = query.format === "pdf" ? await renderCredentialingPdf(data) : Buffer.from(renderCredentialingCsv(data), "utf8");
      await audit(db, {
        programId: user.programId,
        actorUserId: user.id,
        action: "report.credentialing_exported",
        entityType: "program",
        entityId: user.programId,
        ip: req.ip,
        details: { format: query.format, userId: query.userId ?? (lead ? null : user.id), from: query.from ?? null, to: query.to ?? null },
      });
      res
        .status(200)
        .type(query.format === "pdf" ? "application/pdf" : "text/csv; charset=utf-8")
        .attachment(credentialingFileName(data, query.format))
        .setHeader("Cache-Control", "no-store");
      res.send(body);
    },
  });
}
