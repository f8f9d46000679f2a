// The reviewer's side of the sonographer's questions: the threads on exams I reviewed, one
// exam as I read it (blinded), its thread, and posting an answer. Every change invalidates
// the ["questions"] prefix and the notifications (opening an exam marks its question read).
import { useEffect } from "react";
import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";
import type { MessageThread, postedMessageSchema } from "../../../../shared/schemas/feedback";
import type { QuestionThread, ReviewedExam, questionThreadListSchema } from "../../../../shared/schemas/reviewing";
import { queryKeys } from "../../../lib/query-keys";

/** A message of GET /api/exams/:id/messages: authors as the server names them ("you", "Sonographer" while blinded, or a name). */
export type ThreadMessage = MessageThread["items"][number];
export type { QuestionThread, ReviewedExam };

export const questionKeys = {
  all: ["questions"] as const,
  list: () => ["questions", "list"] as const,
  exam: (examId: string) => ["questions", "exam", examId] as const,
  thread: (examId: string) => ["questions", "thread", examId] as const,
};

export const questionListQuery = queryOptions({
  queryKey: questionKeys.list(),
  queryFn: ({ signal }) => api<z.infer<typeof questionThreadListSchema>>("/reviews/questions", { signal }),
});

export const reviewedExamQuery = (examId: string) =>
  queryOptions({
    queryKey: questionKeys.exam(examId),
    queryFn: ({ signal }) => api<ReviewedExam>(`/reviews/exams/${examId}`, { signal }),
  });

export const threadQuery = (examId: string) =>
  queryOptions({
    queryKey: questionKeys.thread(examId),
    queryFn: ({ signal }) => api<MessageThread>(`/exams/${examId}/messages`, { signal }),
  });

export function useQuestionList() {
  return useQuery(questionListQuery);
}

/** One exam as I reviewed it. Loading it marks its question notifications read, so the bell is refreshed once it arrives. */
export function useReviewedExam(examId: string) {
  const queryClient = useQueryClient();
  const query = useQuery(reviewedExamQuery(examId));
  const loadedAt = query.dataUpdatedAt;
  useEffect(() => {
    if (loadedAt) void queryClient.invalidateQueries({ queryKey: queryKeys.notifications });
  }, [loadedAt, queryClient]);
  return query;
}

export function useThread(examId: string, enabled = true) {
  return useQuery({ ...threadQuery(examId), enabled });
}

/** The answer box's rule; the server applies the same limits (shared messageInputSchema). */
export const answerSchema = z.object({
  body: z.string().trim().min(1, "Write your answer").max(4000, "Keep the answer under 4,000 characters"),
});

export function usePostAnswer() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ examId, body }: { examId: string; body: string }) =>
      api<z.infer<typeof postedMessageSchema>>(`/exams/${examId}/messages`, { method: "POST", body: { body } }),
    onSettled: () =>
      Promise.all([queryClient.invalidateQueries({ queryKey: questionKeys.all }), queryClient.invalidateQueries({ queryKey: queryKeys.notifications })]),
  });
}

/** How the final result came about, in plain words. */
export const SOURCE_WORDS: Record<NonNullable<ReviewedExam["final"]>["source"], string> = {
  single_read: "One reviewer's read",
  double_read_agreed: "Two independent reads that agreed",
  adjudicated: "Two reads that differed, settled by adjudication",
};
