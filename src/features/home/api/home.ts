// "What needs me now": the per-role counts behind the home page.
import { queryOptions, useQuery } from "@tanstack/react-query";
import type { Home } from "../../../../shared/schemas/home";
import { api } from "../../../lib/api-client";
import { queryKeys } from "../../../lib/query-keys";

export const homeQuery = queryOptions({
  queryKey: queryKeys.home,
  queryFn: ({ signal }) => api<Home>("/home", { signal }),
});

export function useHome() {
  return useQuery(homeQuery);
}
