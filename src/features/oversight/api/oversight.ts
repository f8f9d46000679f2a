// The QA lead's oversight data: open adjudications with both reads, the decision on one,
// handing one to a third reviewer, and follow-ups of clinically significant disagreements.
import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import type { Exam } from "../../../../shared/schemas/exams";
import type { Adjudicated, Adjudication, Reassigned, adjudicationListSchema } from "../../../../shared/schemas/reviewing";
import type { adjudicateSchema } from "../../../../shared/schemas/reviews";
import type { FollowUp, FollowUpStatus, followUpListSchema, followUpUpdatedSchema, followUpUpdateSchema } from "../../../../shared/schemas/follow-ups";
import type { z } from "zod";
import { api } from "../../../lib/api-client";
import { queryString } from "../../../lib/query-string";
import { queryKeys } from "../../../lib/query-keys";

export type { Adjudication };
export type { FollowUp, FollowUpStatus };

export const oversightKeys = {
  all: ["oversight"] as const,
  adjudications: () => ["oversight", "adjudications"] as const,
  followUps: (status: FollowUpStatus | "all") => ["oversight", "follow-ups", status] as const,
};

export const adjudicationsQuery = queryOptions({
  queryKey: oversightKeys.adjudications(),
  queryFn: ({ signal }) => api<z.infer<typeof adjudicationListSchema>>("/adjudications", { signal }),
});

export const followUpsQuery = (status: FollowUpStatus | "all") =>
  queryOptions({
    queryKey: oversightKeys.followUps(status),
    queryFn: ({ signal }) =>
      api<z.infer<typeof followUpListSchema>>(`/follow-ups${queryString({ status: status === "all" ? undefined : status })}`, { signal }),
  });

/** The sonographer's own reads of an exam (a QA lead may open any exam of the program). */
export const examReadsQuery = (examId: string) =>
  queryOptions({
    queryKey: queryKeys.examDetail(examId),
    queryFn: ({ signal }) => api<{ exam: Exam }>(`/exams/${examId}`, { signal }).then((r) => r.exam),
  });

export function useAdjudications() {
  return useQuery(adjudicationsQuery);
}

function useOversightMutation<TVars, TResult>(fn: (vars: TVars) => Promise<TResult>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSettled: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: oversightKeys.all }),
        queryClient.invalidateQueries({ queryKey: queryKeys.exams }),
        queryClient.invalidateQueries({ queryKey: queryKeys.home }),
      ]),
  });
}

/** What a QA lead decides: the final scores, the final finding reads and a note (as the server reads it). */
export type AdjudicateBody = z.input<typeof adjudicateSchema>;

export function useAdjudicate() {
  return useOversightMutation(({ examId, body }: { examId: string; body: AdjudicateBody }) =>
    api<Adjudicated>(`/exams/${examId}/adjudicate`, { method: "POST", body }),
  );
}

export function useReassign() {
  return useOversightMutation(({ assignmentId, reviewerId }: { assignmentId: string; reviewerId: string }) =>
    api<Reassigned>(`/assignments/${assignmentId}/reassign`, { method: "POST", body: { reviewerId } }),
  );
}

export type FollowUpChange = z.input<typeof followUpUpdateSchema>;

export function useUpdateFollowUp() {
  return useOversightMutation(({ id, ...body }: FollowUpChange & { id: string }) =>
    api<z.infer<typeof followUpUpdatedSchema>>(`/follow-ups/${id}`, { method: "PATCH", body }),
  );
}

export const FOLLOW_UP_WORDS: Record<FollowUpStatus, string> = {
  open: "Open",
  in_progress: "In progress",
  closed: "Closed",
};

/** Opens a follow-up's encounter reference (audited on the server; never cached here). */
export function useRevealEncounterRef() {
  return useMutation({
    mutationFn: (id: string) => api<{ reference: string }>(`/follow-ups/${id}/encounter-reference`, { method: "POST" }).then((r) => r.reference),
  });
}
