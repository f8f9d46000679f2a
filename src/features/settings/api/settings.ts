// Program settings and the reusable feedback snippets, with the rubric criteria a snippet can
// belong to. Every change invalidates its own prefix (["settings"], ["snippets"]).
import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import type { ProgramSettings } from "../../../../shared/schemas/reviews";
import type { rubricAnswerSchema, rubricListSchema } from "../../../../shared/schemas/rubrics";
import type { SettingsAnswer, Snippet, snippetAnswerSchema, snippetListSchema } from "../../../../shared/schemas/settings";
import type { z } from "zod";
import { api } from "../../../lib/api-client";
import { queryKeys } from "../../../lib/query-keys";

export type { Snippet };

export const settingsQuery = queryOptions({
  queryKey: ["settings", "program"],
  queryFn: ({ signal }) => api<SettingsAnswer>("/settings", { signal }).then((r) => r.settings),
});

export const snippetsQuery = queryOptions({
  queryKey: ["snippets", "list"],
  queryFn: ({ signal }) => api<z.infer<typeof snippetListSchema>>("/snippets", { signal }).then((r) => r.snippets),
});

/** The criteria of every published rubric, for naming and choosing a snippet's criterion. */
export const publishedCriteriaQuery = queryOptions({
  queryKey: [...queryKeys.rubrics, "published-criteria"],
  queryFn: async ({ signal }) => {
    const { rubrics } = await api<z.infer<typeof rubricListSchema>>("/rubrics", { signal });
    const published = rubrics.filter((r) => r.status === "published");
    const full = await Promise.all(published.map((r) => api<z.infer<typeof rubricAnswerSchema>>(`/rubrics/${r.id}`, { signal })));
    const seen = new Map<string, string>();
    for (const { rubric } of full) for (const c of rubric.criteria) if (!seen.has(c.key)) seen.set(c.key, c.label);
    return [...seen].map(([key, label]) => ({ key, label }));
  },
});

export function useSettings() {
  return useQuery(settingsQuery);
}

export function useUpdateSettings() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: Partial<ProgramSettings>) => api<SettingsAnswer>("/settings", { method: "PATCH", body }).then((r) => r.settings),
    onSuccess: (settings) => queryClient.setQueryData(settingsQuery.queryKey, settings),
    onSettled: () => queryClient.invalidateQueries({ queryKey: ["settings"] }),
  });
}

function useSnippetMutation<TVars, TResult>(fn: (vars: TVars) => Promise<TResult>) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: fn, onSettled: () => queryClient.invalidateQueries({ queryKey: ["snippets"] }) });
}

export function useAddSnippet() {
  return useSnippetMutation((body: { criterionKey: string | null; text: string }) =>
    api<z.infer<typeof snippetAnswerSchema>>("/snippets", { method: "POST", body }),
  );
}

export function useDeleteSnippet() {
  return useSnippetMutation((id: string) => api<void>(`/snippets/${id}`, { method: "DELETE" }));
}
