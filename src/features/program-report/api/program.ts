// The program report (GET /api/reports/program): backlog by age, weekly throughput and
// turnaround, volume per application per week, and reviewer workload.
import { keepPreviousData, queryOptions } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { queryString } from "../../../lib/query-string";

export type BacklogBucket = "under 1 day" | "1–3 days" | "3–7 days" | "over 7 days";

export interface ProgramReport {
  backlog: { bucket: BacklogBucket; count: number }[];
  weekly: { week: string; submitted: number; reviewed: number; turnaroundMedianHours: number | null; turnaroundP90Hours: number | null }[];
  volume: { week: string; application: string; count: number }[];
  reviewers: ReviewerWorkload[];
}

export interface ReviewerWorkload {
  id: string;
  name: string;
  reviews: number;
  medianSeconds: number | null;
  held: number;
}

/** The report for a date range; the previous one stays on screen while the next loads. */
export function programQuery(range: { from: string; to: string }) {
  return queryOptions({
    queryKey: ["reports", "program", range],
    queryFn: ({ signal }) => api<ProgramReport>(`/reports/program${queryString(range)}`, { signal }),
    placeholderData: keepPreviousData,
  });
}
