// The client's retry rules (RFC 9110 §15.6.4: 503 means a temporary overload or maintenance,
// "likely be alleviated after some delay"; §15.5: 4xx means the client's request is at fault).
import { describe, expect, it } from "vitest";
import { ApiError } from "./api-errors";
import { isTransientError, retryDelayMs, retryQuery, retryTransient } from "./retry";

const err = (status: number, code = `http_${status}`) => new ApiError(status, code, "x");

describe("retry rules", () => {
  it("treats network failures, 502, 503 and 504 as passing, everything else not", () => {
    expect([0, 502, 503, 504].map((s) => isTransientError(err(s)))).toEqual([true, true, true, true]);
    expect([400, 401, 403, 404, 409, 413, 429, 500].map((s) => isTransientError(err(s)))).toEqual(Array(8).fill(false));
    expect(isTransientError(new Error("boom"))).toBe(false);
  });

  it("retries queries on a 503 or a network failure with backoff, never on 4xx", () => {
    expect(retryQuery(0, err(503, "database_unavailable"))).toBe(true);
    expect(retryQuery(5, err(0, "network_error"))).toBe(true);
    expect(retryQuery(6, err(503))).toBe(false);
    expect(retryQuery(0, err(404))).toBe(false);
    expect(retryQuery(0, err(401))).toBe(false);
    expect(retryQuery(1, err(500))).toBe(true);
    expect(retryQuery(2, err(500))).toBe(false);
  });

  it("retries the scoring mutations only on passing failures", () => {
    const retry = retryTransient(3);
    expect(retry(0, err(503, "database_unavailable"))).toBe(true);
    expect(retry(2, err(0))).toBe(true);
    expect(retry(3, err(503))).toBe(false);
    for (const s of [400, 403, 409, 500]) expect(retry(0, err(s))).toBe(false);
  });

  it("doubles the delay and caps it", () => {
    expect([0, 1, 2, 3, 4, 5, 6].map((a) => retryDelayMs(a))).toEqual([1000, 2000, 4000, 8000, 16000, 30000, 30000]);
  });
});
