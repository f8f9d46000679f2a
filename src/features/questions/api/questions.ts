// The reviewer's side of the sonographer's questions: the threads on exams I reviewed, one
// exam as I read it (blinded), its thread, and posting an answer. Every change invalidates
// the ["questions"] prefix and the notifications (opening an exam marks its question read).
import { useEffect } from "react";
import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";
import type { ExamSetting, FindingRead } from "../../../../shared/catalogue";
import { queryKeys } from "../../../lib/query-keys";

/** One thread in GET /api/reviews/questions. */
export interface QuestionThreadItem {
  examId: string;
  code: string;
  application: { code: string; name: string };
  lastMessageAt: string;
  /** The last word is the sonographer's: the thread waits for an answer. */
  lastFromSonographer: boolean;
  messages: number;
}

/** GET /api/reviews/exams/:id: the exam (never its sonographer), my review and the final result. */
export interface ReviewedExam {
  exam: {
    id: string;
    code: string;
    application: { code: string; name: string };
    performedAt: string;
    setting: ExamSetting;
    status: string;
  };
  /** Null for a QA lead who did not read the exam. */
  myReview: {
    submittedAt: string;
    feedback: string;
    criteria: { key: string; label: string; value: string | number | null; levelLabel: string | null }[];
    reads: { key: string; label: string; read: FindingRead }[];
  } | null;
  final: { credit: boolean; source: "single_read" | "double_read_agreed" | "adjudicated"; decidedAt: string } | null;
}

/** GET /api/exams/:id/messages: authors as the server names them ("you", "Sonographer" while blinded, or a name). */
export interface ThreadMessage {
  id: string;
  body: string;
  at: string;
  author: string;
}

export const questionKeys = {
  all: ["questions"] as const,
  list: () => ["questions", "list"] as const,
  exam: (examId: string) => ["questions", "exam", examId] as const,
  thread: (examId: string) => ["questions", "thread", examId] as const,
};

export const questionListQuery = queryOptions({
  queryKey: questionKeys.list(),
  queryFn: ({ signal }) => api<{ items: QuestionThreadItem[] }>("/reviews/questions", { signal }),
});

export const reviewedExamQuery = (examId: string) =>
  queryOptions({
    queryKey: questionKeys.exam(examId),
    queryFn: ({ signal }) => api<ReviewedExam>(`/reviews/exams/${examId}`, { signal }),
  });

export const threadQuery = (examId: string) =>
  queryOptions({
    queryKey: questionKeys.thread(examId),
    queryFn: ({ signal }) => api<{ examCode: string; items: ThreadMessage[] }>(`/exams/${examId}/messages`, { signal }),
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
    mutationFn: ({ examId, body }: { examId: string; body: string }) => api<{ id: string }>(`/exams/${examId}/messages`, { method: "POST", body: { body } }),
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
