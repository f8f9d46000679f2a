// The one QueryClient. Client errors (4xx) are answers, not glitches, so they are not
// retried; a network failure or a 503 (the database restarting) is retried with backoff.
// Mutations are not retried by default: only those safe to send again opt in.
import { QueryClient } from "@tanstack/react-query";
import { retryDelayMs, retryQuery } from "../lib/retry";

export const queryClient = new QueryClient({
  defaultOptions: {
    queries: {
      staleTime: 30_000,
      retry: retryQuery,
      retryDelay: (attempt) => retryDelayMs(attempt),
    },
    mutations: { retry: false },
  },
});
