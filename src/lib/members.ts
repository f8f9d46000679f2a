// The program's members (GET /api/users), shown by Setup → People, the calibration set's
// reviewer picker and the adjudication hand-over: one query, one cache entry.
import { queryOptions } from "@tanstack/react-query";
import type { MemberList } from "../../shared/schemas/users";
import { api } from "./api-client";
import { queryKeys } from "./query-keys";

export const membersQuery = queryOptions({
  queryKey: queryKeys.members,
  queryFn: ({ signal }) => api<MemberList>("/users", { signal }),
});
