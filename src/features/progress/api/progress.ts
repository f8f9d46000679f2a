// The signed-in sonographer's progress (GET /api/me/progress) and their credentialing report
// (GET /api/reports/credentialing, own figures only), for the Progress screen.
import { keepPreviousData, queryOptions } from "@tanstack/react-query";
import type { Progress } from "../../../../shared/schemas/progress";
import { ApiError, api } from "../../../lib/api-client";

export interface ProgressFilters {
  from?: string;
  to?: string;
  window: number;
}

function search(params: Record<string, string | number | undefined>): string {
  const s = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) if (v !== undefined && v !== "") s.set(k, String(v));
  return s.toString();
}

export const progressKeys = {
  all: ["progress"] as const,
  mine: (filters: ProgressFilters) => ["progress", "me", filters] as const,
};

/** My progress for a range and rolling-mean window; the previous answer stays on screen while the next loads. */
export function myProgressQuery(filters: ProgressFilters) {
  return queryOptions({
    queryKey: progressKeys.mine(filters),
    queryFn: ({ signal }) => api<Progress>(`/me/progress?${search({ ...filters })}`, { signal }),
    placeholderData: keepPreviousData,
  });
}

/** The report's address (same origin, so the session cookie goes with it). */
export function credentialingReportUrl(format: "pdf" | "csv", range: { userId?: string; from?: string; to?: string }): string {
  return `/api/reports/credentialing?${search({ format, ...range })}`;
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
    throw new ApiError(0, "network_error", "The server could not be reached. Check the connection and try again.");
  }
  if (!res.ok) {
    const body = (await res.json().catch(() => null)) as { error?: { code?: string; message?: string } } | null;
    throw new ApiError(res.status, body?.error?.code ?? `http_${res.status}`, body?.error?.message ?? "The report could not be made. Please try again.");
  }
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
