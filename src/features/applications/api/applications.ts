// The program's application catalogue: the published versions (the list query lives in lib/
// because the exam form builds on it), one version, its history, and adding or saving an
// application. Saving a changed application answers with its next version (a new id).
// Every change invalidates the ["applications"] prefix.
import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import type { ApplicationAnswer, ApplicationInput, ApplicationVersion, NewApplicationInput } from "../../../../shared/schemas/applications";
import { api } from "../../../lib/api-client";
import { applicationsQuery, applicationVersionQuery } from "../../../lib/catalogue";

export function useApplications() {
  return useQuery(applicationsQuery);
}

export function useApplicationVersion(id: string) {
  return useQuery(applicationVersionQuery(id));
}

export const applicationHistoryQuery = (id: string) =>
  queryOptions({
    queryKey: ["applications", "history", id],
    queryFn: ({ signal }) => api<{ versions: ApplicationVersion[] }>(`/applications/${encodeURIComponent(id)}/versions`, { signal }).then((r) => r.versions),
    enabled: !!id,
  });

/** Adds an application (no id) or saves one (its next version comes back when anything changed). */
export function useSaveApplication() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id?: string; body: ApplicationInput | NewApplicationInput }) =>
      api<ApplicationAnswer>(id ? `/applications/${encodeURIComponent(id)}` : "/applications", { method: id ? "PUT" : "POST", body }).then(
        (r) => r.application,
      ),
    onSuccess: (application) => queryClient.setQueryData(applicationVersionQuery(application.id).queryKey, { application }),
    // The saved version's predecessor is now archived, so its cached status is refreshed too.
    onSettled: () => queryClient.invalidateQueries({ queryKey: ["applications"] }),
  });
}
