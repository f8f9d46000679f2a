// The program's audit log, one page at a time.
import { keepPreviousData, queryOptions, useQuery } from "@tanstack/react-query";
import type { AuditPage } from "../../../../shared/schemas/users";
import { api } from "../../../lib/api-client";
import { queryString } from "../../../lib/query-string";

export const AUDIT_PAGE_SIZE = 50;

export const auditQuery = (page: { limit: number; offset: number }) =>
  queryOptions({
    queryKey: ["audit", "list", page],
    queryFn: ({ signal }) => api<AuditPage>(`/audit${queryString({ limit: page.limit, offset: page.offset })}`, { signal }),
  });

export function useAuditLog(page: { limit: number; offset: number }) {
  // Keep the current page on screen while the next one loads, so the table does not jump.
  return useQuery({ ...auditQuery(page), placeholderData: keepPreviousData });
}
