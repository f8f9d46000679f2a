// The wire contract: every API route declares the schema of its answers (or names the file
// types it sends), and, because makeKit builds the app with checkResponses on, every answer
// any API test receives was checked against that schema (server/http/route.ts).
import { afterAll, describe, expect, it } from "vitest";
import { makeKit } from "./helpers";

const kit = makeKit();
afterAll(() => kit.close());

describe("declared responses", () => {
  const undeclared = kit.routes
    .filter((r) => r.path !== "/openapi.json")
    .filter((r) => !Object.entries(r.responses).some(([status, kind]) => Number(status) < 300 && (kind !== "none" || status === "204")))
    .map((r) => `${r.method} ${r.path}`)
    .sort();

  it("every route declares a schema, a file type or 204 for its success answer", () => {
    expect(undeclared).toEqual([]);
  });

  it("the test kit checks answers", () => {
    expect(kit.config.checkResponses).toBe(true);
  });
});
