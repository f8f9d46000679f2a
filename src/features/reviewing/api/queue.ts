// The Queue screen's data: what waits and what I hold (polled), and "Start next", which
// claims an exam and hands its workspace to the cache so the scoring screen opens at once.
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { claimNext, queueKeys, queueOverviewQuery } from "./workspace";
import { queryKeys } from "../../../lib/query-keys";

export function useQueueOverview() {
  return useQuery(queueOverviewQuery);
}

/** Claims the next exam (optionally of one application); resolves to the workspace or undefined when nothing waits. */
export function useStartNext() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (application: string | null) => claimNext(application),
    onSuccess: (workspace) => {
      if (workspace) queryClient.setQueryData(queueKeys.workspace(workspace.assignment.id), workspace);
    },
    onSettled: () =>
      Promise.all([queryClient.invalidateQueries({ queryKey: queueKeys.overview() }), queryClient.invalidateQueries({ queryKey: queryKeys.home })]),
  });
}
