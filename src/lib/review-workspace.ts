// The reviewer's side of the queue API, shared by the Queue screen (which claims the next
// exam) and the scoring workspace (which shows it and claims the one after): the shapes the
// server sends, one key family for the cache, and the claim itself.
import { queryOptions } from "@tanstack/react-query";
import type { Criterion } from "../../shared/rubric/types";
import type { FindingRead } from "../../shared/catalogue";
import type { Clip } from "../../shared/schemas/exams";
import { api } from "./api-client";

export interface WaitingGroup {
  application: { code: string; name: string };
  setting: "clinical" | "educational" | "simulated";
  count: number;
  oldestWaitingSeconds: number;
}

export interface Assignment {
  id: string;
  kind: "primary" | "second" | "adjudication";
  state: string;
  claimedAt: string | null;
  leaseExpiresAt: string | null;
  dueAt: string;
}

export interface HeldAssignment extends Assignment {
  examCode: string;
  /** The application's name. */
  application: string;
}

export interface QueueOverview {
  waiting: WaitingGroup[];
  held: HeldAssignment[];
}

/** A clip as a reviewer receives it (no file name; only ready clips). */
export type ReviewClip = Pick<Clip, "id" | "view" | "kind" | "state" | "width" | "height" | "seconds" | "fps" | "frames" | "precheck" | "media">;

export interface BlindedExam {
  id: string;
  code: string;
  application: { code: string; name: string };
  performedAt: string;
  setting: "clinical" | "educational" | "simulated";
  transducer: "linear" | "curvilinear" | "phased" | "endocavitary";
  preset: string;
  indication: string;
  views: { key: string; label: string }[];
  findings: { key: string; label: string }[];
  /** Null while the program keeps sonographers blinded (the default). */
  sonographer: { name: string } | null;
  clips: ReviewClip[];
}

export interface ReviewDraft {
  scores: Record<string, string | number>;
  reads: { key: string; read: FindingRead }[];
  feedback: string;
  timeSpentSeconds: number;
  savedAt: string;
}

export interface Snippet {
  id: string;
  criterionKey: string | null;
  text: string;
}

/** Everything the scoring workspace needs for one assignment. */
export interface Workspace {
  assignment: Assignment;
  exam: BlindedExam;
  rubric: { id: string; name: string; version: number; criteria: Criterion[] };
  draft: ReviewDraft | null;
  snippets: Snippet[];
}

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
