// In-app notifications of the signed-in user, polled every minute for the header bell.
import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import type { Notification as AppNotification, Notifications } from "../../../../shared/schemas/feedback";
import { api } from "../../../lib/api-client";
import { queryKeys } from "../../../lib/query-keys";

/** One notification (named apart from the browser's own Notification). */
export type { AppNotification };

/** How often the bell asks for new notifications. */
export const NOTIFICATIONS_POLL_MS = 60_000;

export const notificationKeys = {
  all: queryKeys.notifications,
  list: () => ["notifications", "list"] as const,
};

export const notificationsQuery = queryOptions({
  queryKey: notificationKeys.list(),
  queryFn: ({ signal }) => api<Notifications>("/notifications", { signal }),
  refetchInterval: NOTIFICATIONS_POLL_MS,
  refetchIntervalInBackground: false,
});

export function useNotifications() {
  return useQuery(notificationsQuery);
}

/** Marks the given notifications read, or all of them when no ids are given. */
export function useMarkRead() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (ids?: string[]) => api<void>("/notifications/read", { method: "POST", body: ids ? { ids } : {} }),
    onSettled: () =>
      Promise.all([queryClient.invalidateQueries({ queryKey: notificationKeys.all }), queryClient.invalidateQueries({ queryKey: queryKeys.feedback })]),
  });
}

/** Where a notification leads, or null when it has no screen of its own. */
export function notificationTarget(n: AppNotification): string | null {
  if (!n.examId) return null;
  if (n.kind === "feedback_ready" || n.kind === "feedback_answer") return `/feedback/${n.examId}`;
  if (n.kind === "feedback_reply") return `/reviews/exams/${n.examId}`;
  if (n.kind === "urgent_follow_up") return "/oversight/follow-ups";
  return null;
}
