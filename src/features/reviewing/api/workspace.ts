// The reviewer's side of the queue API, shared by the Queue screen (which claims the next
// exam) and the scoring workspace (which shows it and claims the one after): the shapes the
// server sends (inferred from shared/schemas/reviewing.ts), one key family for the cache,
// and the claim itself.
import { queryOptions } from "@tanstack/react-query";
import type { QueueOverview, Workspace } from "../../../../shared/schemas/reviewing";
import { api } from "../../../lib/api-client";

export type { BlindedExam, HeldAssignment, ReviewClip, WaitingGroup, Workspace } from "../../../../shared/schemas/reviewing";
export type { Snippet } from "../../../../shared/schemas/settings";

/** Cache keys, generic to specific: everything under ["queue"] changes when a claim does. */
export const queueKeys = {
  all: ["queue"] as const,
  overview: () => ["queue", "overview"] as const,
  workspace: (assignmentId: string) => ["queue", "workspace", assignmentId] as const,
};

export const queueOverviewQuery = queryOptions({
  queryKey: queueKeys.overview(),
  queryFn: ({ signal }) => api<QueueOverview>("/queue", { signal }),
  // Other reviewers take work all the time: keep the counts fresh while the screen is open.
  refetchInterval: 30_000,
});

export const workspaceQuery = (assignmentId: string) =>
  queryOptions({
    queryKey: queueKeys.workspace(assignmentId),
    queryFn: ({ signal }) => api<Workspace>(`/assignments/${assignmentId}`, { signal }),
    // The draft on the server is the truth; re-reading it on focus would overwrite typing.
    staleTime: Infinity,
    refetchOnWindowFocus: false,
  });

/**
 * POST /api/queue/next: claims the oldest due exam (or returns the one I already hold);
 * undefined when nothing waits (204).
 */
export function claimNext(application?: string | null): Promise<Workspace | undefined> {
  return api<Workspace | undefined>("/queue/next", { method: "POST", body: application ? { application } : {} });
}
