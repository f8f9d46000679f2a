// Which errors mean "the database is not there right now" (stopped, restarting, unreachable,
// or the pool could not get a connection in time), as opposed to a bad query or a bug.

const CONNECTION_CODES = new Set(["ECONNREFUSED", "ECONNRESET", "EPIPE", "ETIMEDOUT", "ENOTFOUND", "EHOSTUNREACH", "57P01", "57P02", "57P03"]);

/** True for errors that mean the database went away (stopped, restarted, unreachable). */
export function isConnectionLoss(err: unknown): boolean {
  const e = err as { code?: unknown; message?: unknown } | null | undefined;
  if (!e || typeof e !== "object") return false;
  // SQLSTATE class 08 is "connection exception"; 57P01-03 are the server shutting down or
  // not yet accepting connections (PostgreSQL, Appendix A: Error Codes).
  if (typeof e.code === "string" && (CONNECTION_CODES.has(e.code) || e.code.startsWith("08"))) return true;
  return typeof e.message === "string" && /Connection terminated|terminating connection|connection error/i.test(e.message);
}

/** A lost connection, or Knex giving up waiting for a pooled connection. */
export function isDatabaseUnavailable(err: unknown): boolean {
  return isConnectionLoss(err) || (err instanceof Error && err.name === "KnexTimeoutError");
}
