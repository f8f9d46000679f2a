// Exams and clips of the signed-in sonographer: the list, one exam (polled while clips are
// processing), and the changes to them. Every change invalidates the ["exams"] prefix, so
// the list, the exam and the home counts never disagree for long.
import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient, type QueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import type { Clip, Exam, ExamListQuery, RedactionBox } from "../../../../shared/schemas/exams";
import type { ExamFieldsInput, clipResponseSchema, examListResponseSchema, examResponseSchema } from "../../../../shared/schemas/exams";
import { api } from "../../../lib/api-client";
import { queryString } from "../../../lib/query-string";
import { queryKeys } from "../../../lib/query-keys";

/** How often an exam is re-read while a clip waits for the media worker. */
export const PROCESSING_POLL_MS = 1500;

// The answers, as the server declares them (shared/schemas/exams.ts).
type ExamListAnswer = z.infer<typeof examListResponseSchema>;
type ExamAnswer = z.infer<typeof examResponseSchema>;
type ClipAnswer = z.infer<typeof clipResponseSchema>;

/** The list's filters as the address carries them (the query schema coerces limit and offset from text). */
export type ExamListFilters = Pick<ExamListQuery, "status" | "application" | "from" | "to" | "sort"> & { limit?: number; offset?: number };

export const examKeys = {
  all: queryKeys.exams,
  lists: () => ["exams", "list"] as const,
  list: (filters: ExamListFilters) => ["exams", "list", filters] as const,
  detail: queryKeys.examDetail,
};

export const examListQuery = (filters: ExamListFilters) =>
  queryOptions({
    queryKey: examKeys.list(filters),
    queryFn: ({ signal }) => api<ExamListAnswer>(`/exams${queryString({ ...filters })}`, { signal }),
    placeholderData: keepPreviousData,
  });

/** True while any clip still waits for (or is in) processing. */
export function isProcessing(exam: Pick<Exam, "clips"> | undefined): boolean {
  return !!exam?.clips.some((c) => c.state === "queued" || c.state === "processing");
}

export const examQuery = (id: string) =>
  queryOptions({
    queryKey: examKeys.detail(id),
    queryFn: ({ signal }) => api<ExamAnswer>(`/exams/${id}`, { signal }).then((r) => r.exam),
    // Poll only while the media worker has something of ours; stop once every clip settled.
    refetchInterval: (query) => (isProcessing(query.state.data) ? PROCESSING_POLL_MS : false),
    refetchIntervalInBackground: false,
  });

export function useExamList(filters: ExamListFilters) {
  return useQuery(examListQuery(filters));
}

export function useExam(id: string | undefined) {
  return useQuery({ ...examQuery(id ?? ""), enabled: !!id });
}

/** Puts a clip answer into the cached exam at once, so its new state shows before the next poll. */
export function mergeClip(queryClient: QueryClient, examId: string, clip: Clip) {
  queryClient.setQueryData<Exam>(examKeys.detail(examId), (exam) => {
    if (!exam) return exam;
    const exists = exam.clips.some((c) => c.id === clip.id);
    return { ...exam, clips: exists ? exam.clips.map((c) => (c.id === clip.id ? clip : c)) : [...exam.clips, clip] };
  });
}

function useExamsMutation<TVars, TResult>(fn: (vars: TVars) => Promise<TResult>, onSuccess?: (result: TResult, vars: TVars, qc: QueryClient) => void) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: (result, vars) => onSuccess?.(result, vars, queryClient),
    onSettled: () => Promise.all([queryClient.invalidateQueries({ queryKey: examKeys.all }), queryClient.invalidateQueries({ queryKey: queryKeys.home })]),
  });
}

export type ExamFieldsBody = Omit<ExamFieldsInput, "findings"> & { findings: { key: string; read: "positive" | "negative" | "indeterminate" }[] };

const putExam = (qc: QueryClient, exam: Exam) => qc.setQueryData(examKeys.detail(exam.id), exam);

export function useCreateExam() {
  return useExamsMutation(
    (body: ExamFieldsBody) => api<ExamAnswer>("/exams", { method: "POST", body }).then((r) => r.exam),
    (exam, _vars, qc) => putExam(qc, exam),
  );
}

export function useUpdateExam() {
  return useExamsMutation(
    ({ id, body }: { id: string; body: Partial<ExamFieldsBody> }) => api<ExamAnswer>(`/exams/${id}`, { method: "PATCH", body }).then((r) => r.exam),
    (exam, _vars, qc) => putExam(qc, exam),
  );
}

export function useDeleteExam() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api<void>(`/exams/${id}`, { method: "DELETE" }),
    onSuccess: (_r, id) => queryClient.removeQueries({ queryKey: examKeys.detail(id) }),
    onSettled: () => Promise.all([queryClient.invalidateQueries({ queryKey: examKeys.lists() }), queryClient.invalidateQueries({ queryKey: queryKeys.home })]),
  });
}

export function useSubmitExam() {
  return useExamsMutation(
    (id: string) => api<ExamAnswer>(`/exams/${id}/submit`, { method: "POST", body: { attestNoIdentifiers: true } }).then((r) => r.exam),
    (exam, _vars, qc) => putExam(qc, exam),
  );
}

export function useUpdateClip(examId: string) {
  return useExamsMutation(
    ({ clipId, body }: { clipId: string; body: { view?: string | null; redactions?: RedactionBox[] } }) =>
      api<ClipAnswer>(`/clips/${clipId}`, { method: "PATCH", body }).then((r) => r.clip),
    (clip, _vars, qc) => mergeClip(qc, examId, clip),
  );
}

export function useRetryClip(examId: string) {
  return useExamsMutation(
    (clipId: string) => api<ClipAnswer>(`/clips/${clipId}/retry`, { method: "POST" }).then((r) => r.clip),
    (clip, _vars, qc) => mergeClip(qc, examId, clip),
  );
}

export function useRemoveClip(examId: string) {
  return useExamsMutation(
    (clipId: string) => api<void>(`/clips/${clipId}`, { method: "DELETE" }),
    (_r, clipId, qc) => qc.setQueryData<Exam>(examKeys.detail(examId), (exam) => (exam ? { ...exam, clips: exam.clips.filter((c) => c.id !== clipId) } : exam)),
  );
}
