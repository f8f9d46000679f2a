// The QA lead's roster (GET /api/roster), one sonographer's progress and reviewed exams
// (GET /api/roster/:userId/progress and /feedback), and the credentialing report download
// (GET /api/reports/credentialing), which answers with a file rather than JSON.
import { keepPreviousData, queryOptions } from "@tanstack/react-query";
import type { Progress, RosterRow } from "../../../../shared/schemas/progress";
import { api } from "../../../lib/api-client";
import { queryString } from "../../../lib/query-string";
import { apiErrorFrom, networkError } from "../../../lib/api-errors";
import type { FeedbackListItem } from "../../../../shared/schemas/feedback";
import { queryKeys } from "../../../lib/query-keys";

/** One reviewed exam as the QA lead sees it: the learner's feedback with reviewer names. */
/** A reviewed exam on the QA lead's page of a sonographer: the learner's feedback with reviewers named. */
export type FeedbackDetail = FeedbackListItem;

export interface ProgressRange {
  from?: string;
  to?: string;
  /** Rolling-mean window in exams (server default 10). */
  window?: string;
}

export const rosterKeys = {
  all: queryKeys.roster,
  list: () => ["roster", "list"] as const,
  progress: (userId: string, range: ProgressRange) => ["roster", "progress", userId, range] as const,
  feedback: (userId: string) => ["roster", "feedback", userId] as const,
};

export const rosterQuery = queryOptions({
  queryKey: rosterKeys.list(),
  queryFn: ({ signal }) => api<{ items: RosterRow[] }>("/roster", { signal }).then((r) => r.items),
});

/** One sonographer's progress for a range; the previous range stays on screen while the next loads. */
export const sonographerProgressQuery = (userId: string, range: ProgressRange) =>
  queryOptions({
    queryKey: rosterKeys.progress(userId, range),
    queryFn: ({ signal }) => api<Progress>(`/roster/${encodeURIComponent(userId)}/progress${queryString({ ...range })}`, { signal }),
    placeholderData: keepPreviousData,
  });

export const sonographerFeedbackQuery = (userId: string) =>
  queryOptions({
    queryKey: rosterKeys.feedback(userId),
    queryFn: ({ signal }) => api<{ items: FeedbackDetail[] }>(`/roster/${encodeURIComponent(userId)}/feedback`, { signal }).then((r) => r.items),
  });

export type ReportFormat = "pdf" | "csv";

export interface ReportRequest {
  format: ReportFormat;
  /** One sonographer; absent for the whole program. */
  userId?: string;
  from?: string;
  to?: string;
}

/** The file name from a Content-Disposition header (RFC 6266: filename* wins over filename). */
export function fileNameFrom(disposition: string | null, fallback: string): string {
  if (!disposition) return fallback;
  const star = /filename\*\s*=\s*(?:UTF-8|utf-8)''([^;]+)/.exec(disposition);
  if (star) {
    try {
      return decodeURIComponent(star[1].trim());
    } catch {
      // Malformed escapes: fall through to the plain name.
    }
  }
  const plain = /filename\s*=\s*(?:"((?:\\.|[^"\\])*)"|([^;]+))/.exec(disposition);
  const name = plain ? (plain[1] ?? plain[2]).replace(/\\(.)/g, "$1").trim() : "";
  // Only a bare file name is ever used, whatever the header says.
  return name.replace(/[/\\]/g, "_") || fallback;
}

/**
 * Fetches the credentialing report and saves it under the server's file name. Failures
 * become ApiErrors with the server's message (the error body is JSON even for a file route).
 */
export async function downloadCredentialingReport(req: ReportRequest, signal?: AbortSignal): Promise<string> {
  const path = `/api/reports/credentialing${queryString({ format: req.format, userId: req.userId, from: req.from, to: req.to })}`;
  let response: Response;
  try {
    response = await fetch(path, { credentials: "include", signal, headers: { Accept: req.format === "pdf" ? "application/pdf" : "text/csv" } });
  } catch (error) {
    if (error instanceof DOMException && error.name === "AbortError") throw error;
    throw networkError();
  }
  if (!response.ok) {
    const body: unknown = await response.json().catch(() => undefined);
    throw apiErrorFrom(
      response.status,
      body,
      response.status === 403 ? "You do not have access to this report." : "The report could not be prepared. Please try again.",
    );
  }
  const blob = await response.blob();
  const fallback = `credentialing-report.${req.format}`;
  const name = fileNameFrom(response.headers.get("Content-Disposition"), fallback);
  const url = URL.createObjectURL(blob);
  const a = document.createElement("a");
  a.href = url;
  a.download = name;
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
  return name;
}
