// The QA lead's roster (GET /api/roster), one sonographer's progress and reviewed exams
// (GET /api/roster/:userId/progress and /feedback). The credentialing report is downloaded
// through the progress feature's useReportDownload.
import { keepPreviousData, queryOptions } from "@tanstack/react-query";
import type { Progress, Roster } from "../../../../shared/schemas/progress";
import { api } from "../../../lib/api-client";
import { queryString } from "../../../lib/query-string";
import type { FeedbackList, FeedbackListItem } from "../../../../shared/schemas/feedback";
import { queryKeys } from "../../../lib/query-keys";

/** A reviewed exam on the QA lead's page of a sonographer: the learner's feedback with reviewers named. */
export type FeedbackDetail = FeedbackListItem;

export interface ProgressRange {
  from?: string;
  to?: string;
  /** Rolling-mean window in exams (server default 10). */
  window?: string;
}

export const rosterKeys = {
  all: queryKeys.roster,
  list: () => ["roster", "list"] as const,
  progress: (userId: string, range: ProgressRange) => ["roster", "progress", userId, range] as const,
  feedback: (userId: string) => ["roster", "feedback", userId] as const,
};

export const rosterQuery = queryOptions({
  queryKey: rosterKeys.list(),
  queryFn: ({ signal }) => api<Roster>("/roster", { signal }).then((r) => r.items),
});

/** One sonographer's progress for a range; the previous range stays on screen while the next loads. */
export const sonographerProgressQuery = (userId: string, range: ProgressRange) =>
  queryOptions({
    queryKey: rosterKeys.progress(userId, range),
    queryFn: ({ signal }) => api<Progress>(`/roster/${encodeURIComponent(userId)}/progress${queryString({ ...range })}`, { signal }),
    placeholderData: keepPreviousData,
  });

export const sonographerFeedbackQuery = (userId: string) =>
  queryOptions({
    queryKey: rosterKeys.feedback(userId),
    queryFn: ({ signal }) => api<FeedbackList>(`/roster/${encodeURIComponent(userId)}/feedback`, { signal }).then((r) => r.items),
  });
