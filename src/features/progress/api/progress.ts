// The signed-in sonographer's progress (GET /api/me/progress), for the Progress screen (their
// credentialing report is downloaded through api/credentialing-report.ts).
import { keepPreviousData, queryOptions } from "@tanstack/react-query";
import type { Progress } from "../../../../shared/schemas/progress";
import { api } from "../../../lib/api-client";
import { queryString } from "../../../lib/query-string";
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
