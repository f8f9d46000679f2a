// Calls for signing in, passwords and invitations, with their query and mutation hooks.
import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import type { InvitationPreview, LoginResponse } from "../../../../shared/schemas/auth";
import { api } from "../../../lib/api-client";
import { sessionKey } from "../../../lib/session";

/** Signs in and stores the user as the session, so guards see it without another request. */
export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: { email: string; password: string }) => api<LoginResponse>("/auth/login", { method: "POST", body, expectUnauthorized: true }),
    onSuccess: ({ user }) => {
      queryClient.removeQueries();
      queryClient.setQueryData(sessionKey, user);
    },
  });
}

export function useForgotPassword() {
  return useMutation({
    mutationFn: (body: { email: string }) => api<void>("/auth/password/forgot", { method: "POST", body }),
  });
}

export function useResetPassword() {
  return useMutation({
    mutationFn: (body: { token: string; password: string }) => api<void>("/auth/password/reset", { method: "POST", body, expectUnauthorized: true }),
  });
}

export function useChangePassword() {
  return useMutation({
    mutationFn: (body: { currentPassword: string; newPassword: string }) => api<void>("/auth/password/change", { method: "POST", body }),
  });
}

export const invitationQuery = (token: string) =>
  queryOptions({
    queryKey: ["invitations", "preview", token],
    queryFn: () => api<InvitationPreview>(`/auth/invitations/${encodeURIComponent(token)}`, { expectUnauthorized: true }),
    staleTime: Infinity,
  });

export function useInvitationPreview(token: string) {
  return useQuery({ ...invitationQuery(token), enabled: token.length > 0 });
}

/** Accepts an invitation; when the answer carries a user, they are signed in. */
export function useAcceptInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: { token: string; name: string; password: string }) =>
      api<LoginResponse>("/auth/invitations/accept", { method: "POST", body, expectUnauthorized: true }),
    onSuccess: (result) => {
      if (result?.user) {
        queryClient.removeQueries();
        queryClient.setQueryData(sessionKey, result.user);
      }
    },
  });
}
