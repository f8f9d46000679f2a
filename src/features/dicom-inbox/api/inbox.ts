// Received DICOM studies (GET /api/dicom-inbox): listing, claiming, and making a draft exam of one.
import { queryOptions, useMutation, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import { api } from "../../../lib/api-client";
import { queryKeys } from "../../../lib/query-keys";
import type { inboxListSchema, InboxStudy } from "../../../../shared/schemas/dicom-inbox";
import type { Exam, examResponseSchema } from "../../../../shared/schemas/exams";
import type { ExamFieldsBody } from "../../exams";

export type { InboxStudy };
type InboxList = z.infer<typeof inboxListSchema>;
type ExamAnswer = z.infer<typeof examResponseSchema>;

export const inboxKey = ["dicom-inbox"] as const;

export const inboxQuery = queryOptions({
  queryKey: inboxKey,
  queryFn: ({ signal }) => api<InboxList>("/dicom-inbox", { signal }).then((r) => r.items),
  // Machines send while people look: refresh now and then.
  refetchInterval: 30_000,
});

export const previewUrl = (studyId: string, objectId: string) => `/api/dicom-inbox/${studyId}/objects/${objectId}/preview`;

export function useClaimStudy() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api<{ study: InboxStudy }>(`/dicom-inbox/${id}/claim`, { method: "POST" }).then((r) => r.study),
    onSettled: () => queryClient.invalidateQueries({ queryKey: inboxKey }),
  });
}

export function useExamFromStudy() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: ExamFieldsBody }): Promise<Exam> =>
      api<ExamAnswer>(`/dicom-inbox/${id}/exam`, { method: "POST", body }).then((r) => r.exam),
    onSettled: () => Promise.all([queryClient.invalidateQueries({ queryKey: inboxKey }), queryClient.invalidateQueries({ queryKey: queryKeys.exams })]),
  });
}
