// The signed-in sonographer's feedback: reviewed exams (newest first), one exam's feedback,
// acknowledging it and asking a question. Every change invalidates the ["feedback"] prefix
// and the notifications, since reading feedback marks its notification read.
import { useEffect } from "react";
import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import type { Acknowledgement, Feedback, FeedbackList, Outcome, postedMessageSchema } from "../../../../shared/schemas/feedback";
import type { z } from "zod";
import { queryKeys } from "../../../lib/query-keys";
export type { Feedback, FeedbackCriterion, FeedbackListItem, Outcome } from "../../../../shared/schemas/feedback";

export const feedbackKeys = {
  all: queryKeys.feedback,
  list: () => ["feedback", "list"] as const,
  detail: (examId: string) => ["feedback", "detail", examId] as const,
};

export const feedbackListQuery = queryOptions({
  queryKey: feedbackKeys.list(),
  queryFn: ({ signal }) => api<FeedbackList>("/me/feedback", { signal }),
});

export const feedbackQuery = (examId: string) =>
  queryOptions({
    queryKey: feedbackKeys.detail(examId),
    queryFn: ({ signal }) => api<Feedback>(`/me/feedback/${examId}`, { signal }),
  });

export function useFeedbackList() {
  return useQuery(feedbackListQuery);
}

/** One exam's feedback. Reading it marks its notification read, so the bell is refreshed once it arrives. */
export function useFeedback(examId: string) {
  const queryClient = useQueryClient();
  const query = useQuery(feedbackQuery(examId));
  const loadedAt = query.dataUpdatedAt;
  useEffect(() => {
    if (loadedAt) void queryClient.invalidateQueries({ queryKey: queryKeys.notifications });
  }, [loadedAt, queryClient]);
  return query;
}

function useFeedbackMutation<TVars, TResult>(fn: (vars: TVars) => Promise<TResult>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSettled: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: feedbackKeys.all }),
        queryClient.invalidateQueries({ queryKey: queryKeys.notifications }),
        queryClient.invalidateQueries({ queryKey: queryKeys.home }),
      ]),
  });
}

export function useAcknowledge() {
  return useFeedbackMutation((examId: string) => api<Acknowledgement>(`/exams/${examId}/acknowledge`, { method: "POST" }));
}

export function usePostQuestion() {
  return useFeedbackMutation(({ examId, body }: { examId: string; body: string }) =>
    api<z.infer<typeof postedMessageSchema>>(`/exams/${examId}/messages`, { method: "POST", body: { body } }),
  );
}

/** The outcome of a finding in plain words. */
export const OUTCOME_WORDS: Record<Outcome, string> = {
  TP: "True positive",
  FP: "False positive",
  TN: "True negative",
  FN: "False negative",
  indeterminate: "Indeterminate",
};

/** How the final result came about, in plain words. */
export const SOURCE_WORDS: Record<Feedback["source"], string> = {
  single_read: "One reviewer's read",
  double_read_agreed: "Two independent reads that agreed",
  adjudicated: "Two reads that differed, settled by adjudication",
};

/**
 * Why an exam earned no credit, as far as the feedback shows it: a failing level, a
 * definite disagreement on a clinical exam, or (otherwise) the image quality rule.
 */
export function noCreditReasons(fb: Feedback): string[] {
  const reasons: string[] = [];
  for (const c of fb.criteria) if (c.level?.fails) reasons.push(`${c.label}: ${c.level.label}`);
  const missed = fb.findings.filter((f) => f.outcome === "FN" || f.outcome === "FP");
  if (fb.setting === "clinical" && missed.length) reasons.push(`The interpretation differs on a clinical exam (${missed.map((f) => f.label).join(", ")})`);
  const quality = fb.criteria.find((c) => c.key === "quality");
  if (!reasons.length && quality?.level) reasons.push(`Overall image quality "${quality.level.label}" is below the program's minimum for credit`);
  if (!reasons.length) reasons.push("The program's credit rule was not met");
  return reasons;
}
