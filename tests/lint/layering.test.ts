// The layering rules in eslint.config.js fire on the code they forbid and pass the code they
// allow; `npm test` lints the whole tree with them.
import { describe, expect, it } from "vitest";
import { ESLint } from "eslint";

const eslint = new ESLint({ cwd: process.cwd() });

async function ruleHits(code: string, filePath: string) {
  const [result] = await eslint.lintText(code, { filePath });
  return result.messages.filter((m) => m.ruleId === "no-restricted-syntax" || m.ruleId === "@typescript-eslint/no-restricted-imports").map((m) => m.line);
}

describe("no queries in server/routes/", () => {
  const file = "server/routes/lint-probe/router.ts";

  it("refuses a table query, a transaction, raw SQL and a Knex import", async () => {
    const code = [
      'import knex from "knex";',
      "export async function a(db: any) { return db(\"exams\").where({ id: 1 }); }",
      "export async function b(ctx: any) { return ctx.db(\"exams\").first(); }",
      "export async function c(db: any) { return db.transaction(async () => 1); }",
      'export async function d(db: any) { return db.raw("select 1"); }',
      "export const e = knex;",
    ].join("\n");
    expect(await ruleHits(code, file)).toEqual([1, 2, 3, 4, 5]);
  });

  it("allows handing the database to a service and importing its type", async () => {
    const code = [
      'import type { Db } from "../../db/knex";',
      "declare function submitRead(db: Db, id: string): Promise<unknown>;",
      "export async function a(ctx: { db: Db }) { return submitRead(ctx.db, \"x\"); }",
    ].join("\n");
    expect(await ruleHits(code, file)).toEqual([]);
  });

  it("leaves repositories and services free to query", async () => {
    expect(await ruleHits('export const q = (db: any) => db("exams").first();', "server/repositories/lint-probe.ts")).toEqual([]);
  });
});
