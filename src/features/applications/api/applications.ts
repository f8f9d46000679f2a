// The program's application catalogue (exam types), read-only for now.
import { queryOptions, useQuery } from "@tanstack/react-query";
import type { Application } from "../../../../shared/schemas/applications";
import { api } from "../../../lib/api-client";

export const applicationsQuery = queryOptions({
  queryKey: ["applications", "list"],
  queryFn: ({ signal }) => api<{ applications: Application[] }>("/applications", { signal }),
  staleTime: 5 * 60_000,
});

export function useApplications() {
  return useQuery(applicationsQuery);
}
