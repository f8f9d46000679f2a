// When the client tries a failed request again. A network failure or a 502/503/504 (the
// server said "not now": the database is restarting, a proxy lost the app) is passing, so
// it is retried with a doubling delay; a 4xx is an answer and never retried.
import { isApiError } from "./api-errors";

/** True for failures that say "try again later" rather than "this request is wrong". */
export function isTransientError(error: unknown): boolean {
  return isApiError(error) && (error.status === 0 || error.status === 502 || error.status === 503 || error.status === 504);
}

/** Delay before retry number `attempt` (0-based): 1 s, 2 s, 4 s … at most `maxMs`. */
export function retryDelayMs(attempt: number, maxMs = 30_000): number {
  return Math.min(maxMs, 1000 * 2 ** Math.max(0, attempt));
}

/** The queries' retry rule: passing failures up to 6 times, other server errors twice, 4xx never. */
export function retryQuery(failureCount: number, error: unknown): boolean {
  if (isApiError(error) && error.status >= 400 && error.status < 500) return false;
  return failureCount < (isTransientError(error) ? 6 : 2);
}

/** For mutations that are safe to send again (autosave, submit): only passing failures, up to `max` times. */
export function retryTransient(max = 8) {
  return (failureCount: number, error: Error) => isTransientError(error) && failureCount < max;
}
