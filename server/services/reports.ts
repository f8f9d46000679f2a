// The QA lead's reports and the credentialing export (README "Progress and credentialing",
// "Report"): each gathers its rows from the repositories and hands them to its report in
// server/reports/, which computes and renders it. Exporting the credentialing report is
// recorded in the audit log.
import { followUpReport } from "../repositories/follow-ups";
import type { Db } from "../db/knex";
import type { AuthUser } from "../auth/types";
import type { Actor } from "./actor";
import { HttpError } from "../http/errors";
import { activeRubricFor } from "../repositories/rubrics";
import { disagreementsOn, lastCriterionDefinition, pairCounts, userNames } from "../repositories/agreement";
import { programReportRows } from "../repositories/program-report";
import { programName, programSonographers } from "../repositories/progress";
import { auditAs } from "../repositories/audit";
import { credentialingReportSubject } from "../policies/progress";
import { computeProgress } from "./progress";
import { agreementReport as computeAgreementReport, countsByKey } from "../reports/agreement";
import { programReport as computeProgramReport } from "../reports/program";
import { credentialingFileName, renderCredentialingCsv, renderCredentialingPdf, type CredentialingReportData } from "../reports/credentialing";
import type { Criterion } from "../../shared/rubric/types";
import type { z } from "zod";
import type { AgreementReport, agreementReportQuerySchema, ProgramReport, programReportQuerySchema } from "../../shared/schemas/reports";
import type { credentialingReportQuerySchema } from "../../shared/schemas/progress";

/** Agreement between reviewers per criterion on double-read exams, for the chosen criterion (default overall quality) in detail. */
export async function agreementReport(db: Db, programId: string, query: z.output<typeof agreementReportQuerySchema>): Promise<AgreementReport> {
  const f = { programId, from: query.from, to: query.to, application: query.application };
  const chosenKey = query.criterion ?? "quality";
  const [rubric, counts, disagreements] = await Promise.all([activeRubricFor(db, programId), pairCounts(db, f), disagreementsOn(db, f, chosenKey)]);
  const criteria: Criterion[] = [...(rubric?.criteria ?? [])];
  // Criteria of older versions that no longer exist still count, by their last known definition.
  for (const key of countsByKey(counts).keys()) {
    if (key !== "read" && !criteria.some((c) => c.key === key)) {
      const def = await lastCriterionDefinition(db, programId, key);
      if (def) criteria.push(def);
    }
  }
  const names = await userNames(db, [...new Set(counts.flatMap((c) => [c.ra, c.rb]))]);
  return computeAgreementReport({ query, chosenKey, criteria, counts, names, disagreements });
}

/** The program's backlog, turnaround, volume and workload; the range defaults to the last 12 weeks. */
export async function programReport(db: Db, programId: string, query: z.output<typeof programReportQuerySchema>): Promise<ProgramReport> {
  const from = query.from ?? new Date(Date.now() - 84 * 86400_000).toISOString().slice(0, 10);
  const to = query.to ?? new Date().toISOString().slice(0, 10);
  const report = computeProgramReport(from, to, await programReportRows(db, programId, from, to));
  const followUps = await followUpReport(db, programId, { from: new Date(`${from}T00:00:00Z`), to: new Date(Date.parse(`${to}T00:00:00Z`) + 86400_000) });
  const round = (x: number | null) => (x === null ? null : Math.round(x * 10) / 10);
  return { ...report, followUps: { ...followUps, medianHoursToClose: round(followUps.medianHoursToClose), p90HoursToClose: round(followUps.p90HoursToClose) } };
}

export interface ReportFile {
  body: Buffer;
  contentType: string;
  fileName: string;
}

/** The credentialing report as PDF or CSV for one sonographer or (a QA lead without userId) the whole program; the export is audited. */
export async function exportCredentialingReport(
  db: Db,
  user: AuthUser,
  actor: Actor,
  query: z.output<typeof credentialingReportQuerySchema>,
): Promise<ReportFile> {
  if (query.from && query.to && query.from > query.to)
    throw new HttpError(400, "validation_failed", "to: must not be before from", [{ path: "to", message: "must not be before from" }]);
  const subject = await credentialingReportSubject(db, user, query.userId);
  const ids = subject ? [subject] : (await programSonographers(db, user.programId)).map((p) => p.id);
  const data: CredentialingReportData = {
    programName: await programName(db, user.programId),
    generatedAt: new Date(),
    range: { from: query.from ?? null, to: query.to ?? null },
    scope: subject ? "sonographer" : "program",
    sonographers: await computeProgress(db, user.programId, ids, { from: query.from, to: query.to, window: 10 }),
  };
  const body = query.format === "pdf" ? await renderCredentialingPdf(data) : Buffer.from(renderCredentialingCsv(data), "utf8");
  await auditAs(db, actor, {
    action: "report.credentialing_exported",
    entityType: "program",
    entityId: user.programId,
    details: { format: query.format, userId: subject, from: query.from ?? null, to: query.to ?? null },
  });
  return {
    body,
    contentType: query.format === "pdf" ? "application/pdf" : "text/csv; charset=utf-8",
    fileName: credentialingFileName(data, query.format),
  };
}
