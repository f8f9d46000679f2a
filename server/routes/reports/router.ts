// The reports (server/reports/ computes and renders them): reviewer agreement and the
// program's backlog and workload for the QA lead, and the credentialing report as a file
// (README "Progress and credentialing", "Report").
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { agreementReportQuerySchema, agreementReportSchema, credentialingReportQuerySchema, programReportQuerySchema, programReportSchema } from "./schema";
import { actorOf } from "../../services/actor";
import { agreementReport, exportCredentialingReport, programReport } from "../../services/reports";

export function registerReportRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/reports/agreement",
    summary: "Agreement between reviewers per criterion on double-read exams, with intervals and bands",
    tag: "reports",
    access: ["qa_lead", "admin"],
    query: agreementReportQuerySchema,
    responses: { 200: { description: "Agreement report", schema: agreementReportSchema } },
    handler: ({ user, query }) => agreementReport(db, user.programId, query),
  });

  defineRoute(kit, {
    method: "get",
    path: "/reports/program",
    summary: "Backlog by age, weekly turnaround (median, 90th percentile), volume per application, reviewer workload",
    tag: "reports",
    access: ["qa_lead", "admin"],
    query: programReportQuerySchema,
    responses: { 200: { description: "Program report", schema: programReportSchema } },
    handler: ({ user, query }) => programReport(db, user.programId, query),
  });

  defineRoute(kit, {
    method: "get",
    path: "/reports/credentialing",
    summary: "The credentialing report (PDF or CSV) for one clinician or, for a QA lead without userId, the whole program",
    tag: "progress",
    access: ["qa_lead", "sonographer"],
    query: credentialingReportQuerySchema,
    responses: {
      200: { description: "The report as an attachment", file: "application/pdf, text/csv" },
      403: { description: "A clinician asked for someone else's report" },
      404: { description: "Not a clinician of this program" },
    },
    handler: async ({ req, res, user, query }) => {
      const file = await exportCredentialingReport(db, user, actorOf(req, user), query);
      res.status(200).type(file.contentType).attachment(file.fileName).setHeader("Cache-Control", "no-store");
      res.send(file.body);
    },
  });
}
