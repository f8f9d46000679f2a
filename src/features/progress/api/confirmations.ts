// Confirmatory results of one exam (GET/PUT /api/exams/:id/confirmations), shared by the
// sonographer's exam page and the QA lead's page of a sonographer. Saving refreshes every
// progress figure that may count them (the learner's ["progress"] and the lead's ["roster"]).
import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import type { Confirmations, ConfirmationsInput } from "../../../../shared/schemas/progress";
import { api } from "../../../lib/api-client";
import { isApiError } from "../../../lib/api-errors";
import { queryKeys } from "../../../lib/query-keys";

export const confirmationKeys = {
  all: ["confirmations"] as const,
  exam: (examId: string) => ["confirmations", examId] as const,
};

/**
 * A refusal that is an answer, not a hiccup to retry: 403/404 (not the exam's sonographer nor
 * a QA lead, or no such exam), 409 (the exam is still a draft). The form then stays away.
 */
export function isConfirmationsRefusal(error: unknown): boolean {
  return isApiError(error) && [403, 404, 409].includes(error.status);
}

/** One exam's confirmatory results: one item per finding of its application. */
export const confirmationsQuery = (examId: string) =>
  queryOptions({
    queryKey: confirmationKeys.exam(examId),
    queryFn: ({ signal }) => api<Confirmations>(`/exams/${examId}/confirmations`, { signal }),
    retry: (count, error) => count < 2 && !isConfirmationsRefusal(error),
  });

export function useConfirmations(examId: string, enabled = true) {
  return useQuery({ ...confirmationsQuery(examId), enabled: enabled && !!examId });
}

/** Replaces the exam's confirmatory results with the entered ones. */
export function useSaveConfirmations(examId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: ConfirmationsInput) => api<Confirmations>(`/exams/${examId}/confirmations`, { method: "PUT", body }),
    onSuccess: (result) => queryClient.setQueryData(confirmationKeys.exam(examId), result),
    onSettled: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: confirmationKeys.exam(examId) }),
        queryClient.invalidateQueries({ queryKey: queryKeys.progress }),
        queryClient.invalidateQueries({ queryKey: queryKeys.roster }),
      ]),
  });
}
