// Rubric versions of the program: the list, one version, saving (a draft in place; a
// published version into the next version), publishing and archiving. Every change
// invalidates the ["rubrics"] prefix.
import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import type { Rubric, RubricInput } from "../../../../shared/rubric/types";
import type { RubricListItem, rubricAnswerSchema, rubricListSchema } from "../../../../shared/schemas/rubrics";
import type { z } from "zod";
import { api } from "../../../lib/api-client";
import { queryKeys } from "../../../lib/query-keys";

export type { RubricListItem };
type RubricAnswer = z.infer<typeof rubricAnswerSchema>;

export const rubricKeys = {
  all: queryKeys.rubrics,
  list: () => ["rubrics", "list"] as const,
  detail: (id: string) => ["rubrics", "detail", id] as const,
};

export const rubricListQuery = queryOptions({
  queryKey: rubricKeys.list(),
  queryFn: ({ signal }) => api<z.infer<typeof rubricListSchema>>("/rubrics", { signal }).then((r) => r.rubrics),
});

export const rubricQuery = (id: string) =>
  queryOptions({
    queryKey: rubricKeys.detail(id),
    queryFn: ({ signal }) => api<RubricAnswer>(`/rubrics/${id}`, { signal }).then((r) => r.rubric),
  });

export function useRubricList() {
  return useQuery(rubricListQuery);
}

function useRubricMutation<TVars>(fn: (vars: TVars) => Promise<Rubric>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: (rubric) => queryClient.setQueryData(rubricKeys.detail(rubric.id), rubric),
    onSettled: () => queryClient.invalidateQueries({ queryKey: rubricKeys.all }),
  });
}

/** Creates a draft (no id) or saves one: a published rubric comes back as its next version, with a new id. */
export function useSaveRubric() {
  return useRubricMutation(({ id, body }: { id?: string; body: RubricInput }) =>
    api<RubricAnswer>(id ? `/rubrics/${id}` : "/rubrics", { method: id ? "PUT" : "POST", body }).then((r) => r.rubric),
  );
}

export function useRubricAction() {
  return useRubricMutation(({ id, action }: { id: string; action: "publish" | "archive" }) =>
    api<RubricAnswer>(`/rubrics/${id}/${action}`, { method: "POST" }).then((r) => r.rubric),
  );
}

export const STATUS_WORDS: Record<Rubric["status"], string> = { draft: "Draft", published: "In use", archived: "Archived" };
