// The signed-in sonographer's progress (GET /api/me/progress) and their credentialing report
// (GET /api/reports/credentialing, own figures only), for the Progress screen.
import { keepPreviousData, queryOptions } from "@tanstack/react-query";
import type { Progress } from "../../../../shared/schemas/progress";
import { api } from "../../../lib/api-client";
import { queryString } from "../../../lib/query-string";
import { apiErrorFrom, networkError } from "../../../lib/api-errors";
import { queryKeys } from "../../../lib/query-keys";

export interface ProgressFilters {
  from?: string;
  to?: string;
  window: number;
}

export const progressKeys = {
  all: queryKeys.progress,
  mine: (filters: ProgressFilters) => ["progress", "me", filters] as const,
};

/** My progress for a range and rolling-mean window; the previous answer stays on screen while the next loads. */
export function myProgressQuery(filters: ProgressFilters) {
  return queryOptions({
    queryKey: progressKeys.mine(filters),
    queryFn: ({ signal }) => api<Progress>(`/me/progress${queryString({ ...filters })}`, { signal }),
    placeholderData: keepPreviousData,
  });
}

/** The report's address (same origin, so the session cookie goes with it). */
export function credentialingReportUrl(format: "pdf" | "csv", range: { userId?: string; from?: string; to?: string }): string {
  return `/api/reports/credentialing${queryString({ format, ...range })}`;
}

/**
 * Fetches my credentialing report and saves it under the server's file name. `userId` is my
 * own id: without it, a person who is also a QA lead would get the whole program's report.
 */
export async function downloadCredentialingReport(format: "pdf" | "csv", range: { userId?: string; from?: string; to?: string }): Promise<void> {
  let res: Response;
  try {
    res = await fetch(credentialingReportUrl(format, range), { credentials: "include" });
  } catch {
    throw networkError();
  }
  if (!res.ok) throw apiErrorFrom(res.status, await res.json().catch(() => null), "The report could not be made. Please try again.");
  const blob = await res.blob();
  const name = /filename="?([^";]+)"?/.exec(res.headers.get("Content-Disposition") ?? "")?.[1] ?? `credentialing-report.${format}`;
  const url = URL.createObjectURL(blob);
  const a = document.createElement("a");
  a.href = url;
  a.download = name;
  document.body.appendChild(a);
  a.click();
  a.remove();
  // Give the browser a moment to start the download before the address is released.
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
