// The one mapping from a refused answer to messages and field errors, and the query-string
// helper the api files build addresses with.
import { describe, expect, it } from "vitest";
import { apiErrorFrom, errorMessage, fieldErrors, isApiError, networkError, splitFieldMessage, validationIssues } from "./api-errors";
import { queryString } from "./query-string";

describe("api errors", () => {
  it("takes code, message and details from the server's body, else the status's own", () => {
    const e = apiErrorFrom(409, { error: { code: "claim_expired", message: "Your claim ran out.", details: { a: 1 } } });
    expect([e.status, e.code, e.message, e.details]).toEqual([409, "claim_expired", "Your claim ran out.", { a: 1 }]);
    const bare = apiErrorFrom(403, undefined);
    expect([bare.code, bare.message]).toEqual(["http_403", "You do not have access to this."]);
    expect(apiErrorFrom(500, "not json", "The report could not be made.").message).toBe("The report could not be made.");
    expect(isApiError(bare, 403)).toBe(true);
    expect(isApiError(bare, 404)).toBe(false);
    expect(isApiError(networkError(), 0)).toBe(true);
  });

  it("keys field errors by dotted path, first message per path, only for 400 validation_failed", () => {
    const details = [
      { path: ["exams", 0, "examId"], message: "Pick an exam" },
      { path: "name", message: "Enter a name" },
      { path: ["name"], message: "second message" },
      { path: ["roles"] },
    ];
    expect(fieldErrors(apiErrorFrom(400, { error: { code: "validation_failed", message: "x", details } }))).toEqual({
      "exams.0.examId": "Pick an exam",
      name: "Enter a name",
      roles: "Check this field",
    });
    expect(fieldErrors(apiErrorFrom(409, { error: { code: "validation_failed", message: "x", details } }))).toEqual({});
    expect(fieldErrors(apiErrorFrom(400, { error: { code: "wrong_password", message: "x", details } }))).toEqual({});
    expect(fieldErrors(new Error("x"))).toEqual({});
    expect(validationIssues("not a list")).toEqual([]);
  });

  it("splits a field-prefixed message and falls back for non-errors", () => {
    expect(splitFieldMessage("exams.1: Pick at least two exams")).toEqual({ field: "exams", text: "Pick at least two exams" });
    expect(splitFieldMessage("Something else")).toEqual({ field: null, text: "Something else" });
    expect(errorMessage(new Error("boom"), "fallback")).toBe("boom");
    expect(errorMessage("boom", "fallback")).toBe("fallback");
  });
});

describe("queryString", () => {
  it("encodes the parameters with a value, in order, and is empty without any", () => {
    expect(queryString({ from: "2026-01-01", userId: undefined, to: "", window: 10, status: null, q: "a&b c" })).toBe("?from=2026-01-01&window=10&q=a%26b+c");
    expect(queryString({ offset: 0, open: false })).toBe("?offset=0&open=false");
    expect(queryString({ a: undefined, b: "" })).toBe("");
  });
});
