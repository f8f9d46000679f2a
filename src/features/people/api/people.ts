// Members and invitations of the program, and the admin's changes to them. Every change
// invalidates the whole ["users"] prefix: lists are small and must not show stale roles.
import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import type { Role } from "../../../../shared/roles";
import type { InvitationAnswer, InvitationList, MemberAnswer } from "../../../../shared/schemas/users";
import { api } from "../../../lib/api-client";
import { membersQuery } from "../../../lib/members";
import { queryKeys } from "../../../lib/query-keys";

export const invitationsQuery = queryOptions({
  queryKey: ["users", "invitations"],
  queryFn: ({ signal }) => api<InvitationList>("/users/invitations", { signal }),
});

export function useMembers() {
  return useQuery(membersQuery);
}

export function useInvitations(enabled: boolean) {
  return useQuery({ ...invitationsQuery, enabled });
}

function useUsersMutation<TVars, TResult>(fn: (vars: TVars) => Promise<TResult>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSettled: () => queryClient.invalidateQueries({ queryKey: queryKeys.users }),
  });
}

export function useInvite() {
  return useUsersMutation((body: { email: string; name?: string; roles: Role[] }) => api<InvitationAnswer>("/users/invitations", { method: "POST", body }));
}

export function useRevokeInvitation() {
  return useUsersMutation((id: string) => api<void>(`/users/invitations/${id}`, { method: "DELETE" }));
}

export function useUpdateRoles() {
  return useUsersMutation(({ id, roles }: { id: string; roles: Role[] }) => api<MemberAnswer>(`/users/${id}/roles`, { method: "PUT", body: { roles } }));
}

export function useSetActive() {
  return useUsersMutation(({ id, active }: { id: string; active: boolean }) =>
    api<MemberAnswer>(`/users/${id}/${active ? "reactivate" : "deactivate"}`, { method: "POST" }),
  );
}

export function useUpdateOperatorNames() {
  return useUsersMutation(({ id, names }: { id: string; names: string[] }) =>
    api<MemberAnswer>(`/users/${id}/dicom-operator-names`, { method: "PUT", body: { names } }),
  );
}
