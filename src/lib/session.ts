// The signed-in user, read from GET /api/auth/me. Kept in the query cache under one key so
// the layout, route guards and the sign-in screen agree on who is signed in.
import { queryOptions } from "@tanstack/react-query";
import type { MeResponse, SessionUser } from "../../shared/schemas/auth";
import { api } from "./api-client";
import { isApiError } from "./api-errors";

export const sessionKey = ["session"] as const;

async function fetchSession(): Promise<SessionUser | null> {
  try {
    const { user } = await api<MeResponse>("/auth/me", { expectUnauthorized: true });
    return user;
  } catch (error) {
    if (isApiError(error, 401)) return null;
    throw error;
  }
}

/** The session query: the user, or null when signed out. */
export const sessionQuery = queryOptions({
  queryKey: sessionKey,
  queryFn: fetchSession,
  staleTime: 5 * 60_000,
  retry: false,
});

/** Ends the session on the server. The caller clears the cache and navigates. */
export async function signOut(): Promise<void> {
  await api<void>("/auth/logout", { method: "POST", expectUnauthorized: true });
}

/** Whether the user holds at least one of the roles. A convenience for hiding links only: the server decides. */
export function hasAnyRole(user: Pick<SessionUser, "roles"> | null | undefined, roles: readonly SessionUser["roles"][number][]): boolean {
  return !!user && user.roles.some((r) => roles.includes(r));
}
