// The program report (GET /api/reports/program): backlog by age, weekly throughput and
// turnaround, volume per application per week, and reviewer workload.
import { keepPreviousData, queryOptions } from "@tanstack/react-query";
import type { ProgramReport, ReviewerWorkload } from "../../../../shared/schemas/reports";
import { api } from "../../../lib/api-client";
import { queryString } from "../../../lib/query-string";

export type { ProgramReport, ReviewerWorkload };

/** The report for a date range; the previous one stays on screen while the next loads. */
export function programQuery(range: { from: string; to: string }) {
  return queryOptions({
    queryKey: ["reports", "program", range],
    queryFn: ({ signal }) => api<ProgramReport>(`/reports/program${queryString(range)}`, { signal }),
    placeholderData: keepPreviousData,
  });
}
