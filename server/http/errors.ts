// One error type for every refusal the API makes, and the middleware that turns errors
// (ours, zod's, the JSON body parser's) into `{ error: { code, message, details? } }`.
import type { ErrorRequestHandler, RequestHandler } from "express";
import { ZodError } from "zod";
import { isDatabaseUnavailable } from "../db/connection-errors";

export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
  }
}

export const notFound = (what = "Resource") => new HttpError(404, "not_found", `${what} not found`);
export const forbidden = (message = "You do not have permission to do this") => new HttpError(403, "forbidden", message);
export const unauthorized = (message = "Sign in to continue") => new HttpError(401, "unauthorized", message);

/** Turns a ZodError into a 400 whose message names the first offending field. */
export function validationError(err: ZodError, where: "body" | "query" | "params"): HttpError {
  const details = err.issues.map((i) => ({ path: i.path.join(".") || where, message: i.message }));
  const first = details[0];
  const field = first?.path ?? where;
  return new HttpError(400, "validation_failed", `${field}: ${first?.message ?? "invalid value"}`, details);
}

/** Answers 404 for any /api path no route claimed. */
export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(new HttpError(404, "route_not_found", `No API route for ${req.method} ${req.originalUrl.split("?")[0]}`));
};

/** What a 503 for an unreachable database asks the client to wait before trying again. */
export const RETRY_AFTER_SECONDS = 5;

type BodyParserError = Error & { type?: string; status?: number; limit?: number };

export function errorHandler(log: (err: unknown) => void): ErrorRequestHandler {
  return (err, _req, res, _next) => {
    let e: HttpError;
    const bp = err as BodyParserError;
    if (err instanceof HttpError) e = err;
    else if (err instanceof ZodError) e = validationError(err, "body");
    else if (bp?.type === "entity.parse.failed") e = new HttpError(400, "invalid_json", "The request body is not valid JSON");
    else if (bp?.type === "entity.too.large") e = new HttpError(413, "payload_too_large", `The request body is larger than the limit of ${bp.limit} bytes`);
    else if (bp?.type === "encoding.unsupported" || bp?.type === "charset.unsupported") e = new HttpError(415, "unsupported_encoding", bp.message);
    else if (typeof bp?.status === "number" && bp.status >= 400 && bp.status < 500) e = new HttpError(bp.status, "bad_request", bp.message);
    else if (isDatabaseUnavailable(err)) {
      // Stopped, restarting or unreachable: nothing was saved, and the same request can be sent again.
      res.set("Retry-After", String(RETRY_AFTER_SECONDS));
      e = new HttpError(503, "database_unavailable", "The database is not reachable right now; nothing was saved, try again in a few seconds");
    } else {
      log(err);
      e = new HttpError(500, "internal_error", "Something went wrong on the server; the error was logged");
    }
    if (res.headersSent) return;
    res.status(e.status).json({ error: { code: e.code, message: e.message, ...(e.details !== undefined ? { details: e.details } : {}) } });
  };
}
