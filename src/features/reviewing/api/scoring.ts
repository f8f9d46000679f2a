// The scoring workspace's calls: read the workspace, autosave the draft (which also extends
// the claim), give the exam back, and submit — after which the next exam is claimed and its
// media fetched ahead. Every change invalidates the ["queue"] prefix and Home.
import { useMutation, useQuery, useQueryClient, type QueryClient } from "@tanstack/react-query";
import type { FindingRead } from "../../../../shared/catalogue";
import type { Scores } from "../../../../shared/rubric/types";
import type { DraftSaved, ReviewSubmitted } from "../../../../shared/schemas/reviewing";
import { api } from "../../../lib/api-client";
import { retryDelayMs, retryTransient } from "../../../lib/retry";
import { claimNext, queueKeys, workspaceQuery, type Workspace } from "./workspace";
import { prefetchWorkspaceMedia } from "./prefetch-media";
import { queryKeys } from "../../../lib/query-keys";

export interface DraftBody {
  scores: Scores;
  reads: { key: string; read: FindingRead }[];
  feedback: string;
  timeSpentSeconds: number;
  /** Technically limited by patient factors: no credit, and not a failure of technique. */
  limited: boolean;
}

export interface SubmitBody extends DraftBody {
  rubricId: string;
  /** "Needs clinical follow-up now", with the reason; null when not flagged. */
  urgent?: { reason: string } | null;
}

const invalidateQueue = (qc: QueryClient) =>
  Promise.all([qc.invalidateQueries({ queryKey: queueKeys.overview() }), qc.invalidateQueries({ queryKey: queryKeys.home })]);

export function useWorkspace(assignmentId: string) {
  return useQuery(workspaceQuery(assignmentId));
}

/** PUT /api/assignments/:id/draft. */
export function saveDraft(assignmentId: string, body: DraftBody) {
  return api<DraftSaved>(`/assignments/${assignmentId}/draft`, { method: "PUT", body });
}

/**
 * Saves the draft while the page is going away (reload, tab closed): a keepalive request
 * outlives the page, where an ordinary fetch would be cancelled.
 */
export function saveDraftOnExit(assignmentId: string, body: DraftBody) {
  void fetch(`/api/assignments/${assignmentId}/draft`, {
    method: "PUT",
    credentials: "include",
    keepalive: true,
    headers: { "Content-Type": "application/json", Accept: "application/json" },
    body: JSON.stringify(body),
  }).catch(() => undefined);
}

export function useReleaseAssignment(assignmentId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => api<void>(`/assignments/${assignmentId}/release`, { method: "POST" }),
    onSettled: () => invalidateQueue(queryClient),
  });
}

/** Forgets a finished workspace (call once its screen has gone, so nothing re-reads it). */
export function forgetWorkspace(queryClient: QueryClient, assignmentId: string) {
  queryClient.removeQueries({ queryKey: queueKeys.workspace(assignmentId) });
}

// Reviews already accepted, per submit call: a retry after a failed claim of the next exam
// must not send the review a second time.
const accepted = new WeakMap<object, ReviewSubmitted>();

/**
 * POST …/review; then claims the next exam (same application filter) and warms its media.
 * While the server is unreachable or answers 503 the call is retried with backoff (the
 * mutation's `failureCount` says it is waiting); a 4xx is final.
 */
export function useSubmitAndNext(assignmentId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (vars: { body: SubmitBody; application: string | null }) => {
      const result = accepted.get(vars) ?? (await api<ReviewSubmitted>(`/assignments/${assignmentId}/review`, { method: "POST", body: vars.body }));
      accepted.set(vars, result);
      const next = await claimNext(vars.application);
      return { result, next };
    },
    retry: retryTransient(),
    retryDelay: (attempt) => retryDelayMs(attempt, 15_000),
    onSuccess: ({ next }) => {
      if (next) {
        queryClient.setQueryData<Workspace>(queueKeys.workspace(next.assignment.id), next);
        prefetchWorkspaceMedia(next);
      }
    },
    onSettled: () => invalidateQueue(queryClient),
  });
}
