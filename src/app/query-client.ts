// The one QueryClient. Client errors (4xx) are answers, not glitches, so they are not retried.
import { QueryClient } from "@tanstack/react-query";
import { isApiError } from "../lib/api-client";

export const queryClient = new QueryClient({
  defaultOptions: {
    queries: {
      staleTime: 30_000,
      retry: (failureCount, error) => {
        if (isApiError(error) && error.status >= 400 && error.status < 500) return false;
        return failureCount < 2;
      },
    },
    mutations: { retry: false },
  },
});
