// The QA lead's oversight data: open adjudications with both reads, the decision on one,
// handing one to a third reviewer, and follow-ups of clinically significant disagreements.
import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import type { ExamSetting, FindingRead } from "../../../../shared/catalogue";
import type { Criterion, ScoreValue } from "../../../../shared/rubric/types";
import type { Role } from "../../../../shared/roles";
import type { FollowUp, FollowUpStatus, followUpListSchema, followUpUpdatedSchema } from "../../../../shared/schemas/follow-ups";
import type { z } from "zod";
import { api } from "../../../lib/api-client";
import { queryString } from "../../../lib/query-string";
import { queryKeys } from "../../../lib/query-keys";

export interface ReadOfReviewer {
  kind: "primary" | "second";
  reviewer: string;
  scores: Record<string, ScoreValue>;
  reads: { key: string; read: FindingRead }[];
  feedback: string;
  submittedAt: string;
}

export interface Adjudication {
  assignmentId: string;
  examId: string;
  examCode: string;
  setting: ExamSetting;
  application: { code: string; name: string };
  assignedTo: string | null;
  rubric: { id: string; version: number; criteria: Criterion[] } | null;
  reads: ReadOfReviewer[];
  disagreements: string[];
}

export type { FollowUp, FollowUpStatus };

export interface ProgramMember {
  id: string;
  name: string;
  email: string;
  roles: Role[];
  active: boolean;
}

export const oversightKeys = {
  all: ["oversight"] as const,
  adjudications: () => ["oversight", "adjudications"] as const,
  followUps: (status: FollowUpStatus | "all") => ["oversight", "follow-ups", status] as const,
};

export const adjudicationsQuery = queryOptions({
  queryKey: oversightKeys.adjudications(),
  queryFn: ({ signal }) => api<{ items: Adjudication[] }>("/adjudications", { signal }),
});

export const followUpsQuery = (status: FollowUpStatus | "all") =>
  queryOptions({
    queryKey: oversightKeys.followUps(status),
    queryFn: ({ signal }) =>
      api<z.infer<typeof followUpListSchema>>(`/follow-ups${queryString({ status: status === "all" ? undefined : status })}`, { signal }),
  });

/** The program's members (same cache entry as Setup → People). */
export const membersQuery = queryOptions({
  queryKey: queryKeys.members,
  queryFn: ({ signal }) => api<{ members: ProgramMember[] }>("/users", { signal }),
});

/** The sonographer's own reads of an exam (a QA lead may open any exam of the program). */
export const examReadsQuery = (examId: string) =>
  queryOptions({
    queryKey: queryKeys.examDetail(examId),
    queryFn: ({ signal }) => api<{ exam: { id: string; findings: { key: string; read: FindingRead }[] } }>(`/exams/${examId}`, { signal }).then((r) => r.exam),
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

export interface AdjudicateBody {
  scores: Record<string, ScoreValue>;
  reads: { key: string; read: FindingRead }[];
  note: string;
}

export function useAdjudicate() {
  return useOversightMutation(({ examId, body }: { examId: string; body: AdjudicateBody }) =>
    api<{ examId: string; credit: boolean; significantDisagreement: string[] }>(`/exams/${examId}/adjudicate`, { method: "POST", body }),
  );
}

export function useReassign() {
  return useOversightMutation(({ assignmentId, reviewerId }: { assignmentId: string; reviewerId: string }) =>
    api<{ id: string; assignedTo: string }>(`/assignments/${assignmentId}/reassign`, { method: "POST", body: { reviewerId } }),
  );
}

export function useUpdateFollowUp() {
  return useOversightMutation(({ id, status, note }: { id: string; status: FollowUpStatus; note?: string }) =>
    api<z.infer<typeof followUpUpdatedSchema>>(`/follow-ups/${id}`, { method: "PATCH", body: { status, note } }),
  );
}

export const FOLLOW_UP_WORDS: Record<FollowUpStatus, string> = {
  open: "Open",
  in_progress: "In progress",
  closed: "Closed",
};
