// The one way the client talks to the server: JSON over fetch with the session cookie,
// and every failure turned into an ApiError carrying the server's { code, message, details }.
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

type UnauthorizedHandler = () => void;
let onUnauthorized: UnauthorizedHandler | null = null;

/** Called on any 401 outside sign-in: the router sends the user to /sign-in. */
export function setUnauthorizedHandler(handler: UnauthorizedHandler | null) {
  onUnauthorized = handler;
}

export interface RequestOptions {
  method?: "GET" | "POST" | "PUT" | "PATCH" | "DELETE";
  body?: unknown;
  signal?: AbortSignal;
  /** A 401 here is an answer (wrong password, no session yet), not "signed out". */
  expectUnauthorized?: boolean;
}

/** Calls /api{path} and returns the parsed JSON body (undefined for 204 and 202 without body). */
export async function api<T>(path: string, options: RequestOptions = {}): Promise<T> {
  const { method = "GET", body, signal, expectUnauthorized = false } = options;
  let response: Response;
  try {
    response = await fetch(`/api${path}`, {
      method,
      credentials: "include",
      signal,
      headers: {
        Accept: "application/json",
        ...(body !== undefined ? { "Content-Type": "application/json" } : {}),
      },
      body: body !== undefined ? JSON.stringify(body) : undefined,
    });
  } catch (error) {
    if (error instanceof DOMException && error.name === "AbortError") throw error;
    throw new ApiError(0, "network_error", "The server could not be reached. Check the connection and try again.");
  }

  const text = response.status === 204 ? "" : await response.text();
  let data: unknown = undefined;
  if (text) {
    try {
      data = JSON.parse(text);
    } catch {
      data = undefined;
    }
  }

  if (!response.ok) {
    const err = (data as Partial<ApiErrorBody> | undefined)?.error;
    const apiError = new ApiError(response.status, err?.code ?? `http_${response.status}`, err?.message ?? defaultMessage(response.status), err?.details);
    if (response.status === 401 && !expectUnauthorized) onUnauthorized?.();
    throw apiError;
  }
  return data as T;
}

function defaultMessage(status: number): string {
  if (status === 401) return "Your session has ended. Please sign in again.";
  if (status === 403) return "You do not have access to this.";
  if (status === 404) return "Not found.";
  if (status === 429) return "Too many attempts. Please wait a little and try again.";
  if (status >= 500) return "Something went wrong on the server. Please try again.";
  return "The request could not be completed.";
}

/** Field errors from a 400 validation_failed answer, keyed by the first path segment. */
export function fieldErrors(error: unknown): Record<string, string> {
  if (!isApiError(error, 400) || error.code !== "validation_failed" || !Array.isArray(error.details)) return {};
  const out: Record<string, string> = {};
  for (const item of error.details as { path?: unknown; message?: unknown }[]) {
    const path = Array.isArray(item.path) ? item.path.join(".") : String(item.path ?? "");
    const message = typeof item.message === "string" ? item.message : "Check this field";
    if (path && !(path in out)) out[path] = message;
  }
  return out;
}
