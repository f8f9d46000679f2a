// The one mapping from a refused API call to what the screen shows: the server's error body
// ({ error: { code, message, details } }, shared/schemas/common.ts) becomes an ApiError, and
// an ApiError becomes a message, or field errors from a 400 validation_failed answer.
import type { FieldValues, Path, UseFormSetError } from "react-hook-form";
import type { ApiError as ApiErrorBody } from "../../shared/schemas/common";

/** A failed API call (or a network failure, status 0) with the server's error code. */
export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly details: unknown;

  constructor(status: number, code: string, message: string, details?: unknown) {
    super(message);
    this.name = "ApiError";
    this.status = status;
    this.code = code;
    this.details = details;
  }
}

/** True when the error is an ApiError with the given HTTP status. */
export function isApiError(error: unknown, status?: number): error is ApiError {
  return error instanceof ApiError && (status === undefined || error.status === status);
}

/** What a failure of this HTTP status says when the server sent no message. */
export function defaultMessage(status: number): string {
  if (status === 401) return "Your session has ended. Please sign in again.";
  if (status === 403) return "You do not have access to this.";
  if (status === 404) return "Not found.";
  if (status === 429) return "Too many attempts. Please wait a little and try again.";
  if (status >= 500) return "Something went wrong on the server. Please try again.";
  return "The request could not be completed.";
}

/**
 * The ApiError of a refused answer from its parsed body: the server's code, message and
 * details, else `http_<status>` and `fallback` (by default the status's own message).
 */
export function apiErrorFrom(status: number, body: unknown, fallback: string = defaultMessage(status)): ApiError {
  const err = (body as Partial<ApiErrorBody> | null | undefined)?.error;
  return new ApiError(status, err?.code ?? `http_${status}`, err?.message ?? fallback, err?.details);
}

/** The ApiError of a request that never reached the server. */
export function networkError(message = "The server could not be reached. Check the connection and try again."): ApiError {
  return new ApiError(0, "network_error", message);
}

/** The message to show for a failure: the error's own, else `fallback`. */
export function errorMessage(error: unknown, fallback: string): string {
  return error instanceof Error ? error.message : fallback;
}

/** One problem of a validation answer: the dotted path of the field and its message. */
export interface FieldIssue {
  path: string;
  message: string;
}

/** The issues in a validation answer's details (paths as arrays or dotted strings), in order. */
export function validationIssues(details: unknown, fallback = "Check this field"): FieldIssue[] {
  if (!Array.isArray(details)) return [];
  return (details as { path?: unknown; message?: unknown }[]).map((item) => ({
    path: Array.isArray(item.path) ? item.path.join(".") : String(item.path ?? ""),
    message: typeof item.message === "string" ? item.message : fallback,
  }));
}

/** Field errors from a 400 validation_failed answer, keyed by the dotted path (first message per path). */
export function fieldErrors(error: unknown): Record<string, string> {
  if (!isApiError(error, 400) || error.code !== "validation_failed") return {};
  const out: Record<string, string> = {};
  for (const { path, message } of validationIssues(error.details)) if (path && !(path in out)) out[path] = message;
  return out;
}

/** A server message of the form "field.path: text" split into the first path segment and the text. */
export function splitFieldMessage(message: string): { field: string | null; text: string } {
  const m = /^([A-Za-z][\w.]*): (.+)$/.exec(message);
  if (!m) return { field: null, text: message };
  return { field: m[1].split(".")[0], text: m[2] };
}

/**
 * Puts a server's 400 validation_failed field messages onto react-hook-form fields, so an
 * error the client schema could not foresee still appears next to the right field. Returns
 * true when at least one server field error matched a form field.
 */
export function applyServerFieldErrors<T extends FieldValues>(error: unknown, setError: UseFormSetError<T>, fields: readonly Path<T>[]): boolean {
  const errors = fieldErrors(error);
  let matched = false;
  for (const field of fields) {
    const message = errors[field];
    if (message) {
      setError(field, { type: "server", message }, { shouldFocus: !matched });
      matched = true;
    }
  }
  return matched;
}
