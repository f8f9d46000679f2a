// The one way the client talks to the server: JSON over fetch with the session cookie,
// and every failure turned into an ApiError (src/lib/api-errors.ts) carrying the server's
// { code, message, details }.
import { apiErrorFrom, networkError } from "./api-errors";

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
    throw networkError();
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
    const apiError = apiErrorFrom(response.status, data);
    if (response.status === 401 && !expectUnauthorized) onUnauthorized?.();
    throw apiError;
  }
  return data as T;
}
