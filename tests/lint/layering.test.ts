// The layering rules in eslint.config.js fire on the code they forbid and pass the code they
// allow; `npm test` lints the whole tree with them.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ESLint } from "eslint";
import importX from "eslint-plugin-import-x";
import tseslint from "typescript-eslint";
import { mkdirSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { featureZones } from "../../eslint.config.js";

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
      'export async function a(db: any) { return db("exams").where({ id: 1 }); }',
      'export async function b(ctx: any) { return ctx.db("exams").first(); }',
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
      'export async function a(ctx: { db: Db }) { return submitRead(ctx.db, "x"); }',
    ].join("\n");
    expect(await ruleHits(code, file)).toEqual([]);
  });

  it("leaves repositories and services free to query", async () => {
    expect(await ruleHits('export const q = (db: any) => db("exams").first();', "server/repositories/lint-probe.ts")).toEqual([]);
  });
});

describe("a route folder's schemas live in its schema.ts", () => {
  it("refuses zod and shared schemas in a router file", async () => {
    const code = [
      'import { z } from "zod";',
      'import { idParamsSchema } from "../../../shared/schemas/common";',
      'import { rubricInputSchema } from "../../../shared/rubric/types";',
      "export const a = [z, idParamsSchema, rubricInputSchema];",
    ].join("\n");
    expect(await ruleHits(code, "server/routes/lint-probe/router.ts")).toEqual([1, 2, 3]);
  });

  it("lets schema.ts define and re-export them, and the router import ./schema", async () => {
    const schema = ['import { z } from "zod";', 'export { idParamsSchema } from "../../../shared/schemas/common";', "export const q = z.object({});"].join(
      "\n",
    );
    expect(await ruleHits(schema, "server/routes/lint-probe/schema.ts")).toEqual([]);
    expect(await ruleHits('import { q } from "./schema";\nexport const a = q;', "server/routes/lint-probe/router.ts")).toEqual([]);
  });

  it("every route folder has its router.ts and schema.ts", () => {
    const folders = readdirSync("server/routes", { withFileTypes: true }).filter((d) => d.isDirectory());
    expect(folders.length).toBeGreaterThan(10);
    for (const folder of folders) {
      const files = readdirSync(join("server/routes", folder.name));
      expect({ folder: folder.name, router: files.includes("router.ts"), schema: files.includes("schema.ts") }).toEqual({
        folder: folder.name,
        router: true,
        schema: true,
      });
    }
  });
});

describe("features do not import each other", () => {
  const BOUNDARY = "import-x/no-restricted-paths";
  const boundaryHits = async (lint: ESLint, code: string, filePath: string) => {
    const [result] = await lint.lintText(code, { filePath });
    return result.messages.filter((m) => m.ruleId === BOUNDARY).map((m) => m.line);
  };

  describe("in this tree (eslint.config.js)", () => {
    it("refuses importing another feature's files and allows the feature's own", async () => {
      const code = [
        'import { rosterQuery } from "../../roster/api/roster";',
        'import { examKeys } from "../api/exams";',
        "export const a = [rosterQuery, examKeys];",
      ].join("\n");
      expect(await boundaryHits(eslint, code, "src/features/exams/routes/lint-probe.tsx")).toEqual([1]);
    });

    it("lets src/app/ import any feature", async () => {
      const code = ['import { rosterQuery } from "../features/roster/api/roster";', "export const a = rosterQuery;"].join("\n");
      expect(await boundaryHits(eslint, code, "src/app/lint-probe.tsx")).toEqual([]);
    });

    it("has one zone per folder in src/features", async () => {
      const folders = readdirSync("src/features", { withFileTypes: true })
        .filter((d) => d.isDirectory())
        .map((d) => d.name);
      const config = (await eslint.calculateConfigForFile("src/features/exams/routes/lint-probe.tsx")) as {
        rules: Record<string, [unknown, { zones: unknown[] }]>;
      };
      const zones = config.rules[BOUNDARY][1].zones;
      expect(folders.length).toBeGreaterThan(1);
      for (const zone of featureZones(folders)) expect(zones).toContainEqual(zone);
    });
  });

  describe("zones computed from the feature folders", () => {
    // A tree of two features: beta has a public index.ts, alpha does not.
    let root: string;
    let lint: ESLint;
    const files: Record<string, string> = {
      "src/features/alpha/api/alpha.ts": "export const alpha = 1;\n",
      "src/features/beta/index.ts": 'export { beta } from "./api/beta";\n',
      "src/features/beta/api/beta.ts": "export const beta = 2;\n",
    };

    beforeAll(() => {
      root = mkdtempSync(join(tmpdir(), "soundings-lint-"));
      for (const [path, text] of Object.entries(files)) {
        mkdirSync(dirname(join(root, path)), { recursive: true });
        writeFileSync(join(root, path), text);
      }
      lint = new ESLint({
        cwd: root,
        overrideConfigFile: true,
        overrideConfig: [
          {
            files: ["**/*.ts", "**/*.tsx"],
            languageOptions: { parser: tseslint.parser },
            plugins: { "import-x": importX },
            settings: { "import-x/resolver-next": [importX.createNodeResolver({ extensions: [".ts", ".tsx", ".js"] })] },
            rules: { [BOUNDARY]: ["error", { basePath: root, zones: featureZones(readdirSync(join(root, "src/features"))) }] },
          },
        ],
      });
    });
    afterAll(() => rmSync(root, { recursive: true, force: true }));

    it("refuses a feature's inner files from another feature, either way", async () => {
      expect(await boundaryHits(lint, 'export { beta } from "../../beta/api/beta";', "src/features/alpha/routes/probe.ts")).toEqual([1]);
      expect(await boundaryHits(lint, 'export { alpha } from "../../alpha/api/alpha";', "src/features/beta/routes/probe.ts")).toEqual([1]);
    });

    it("allows another feature's public index.ts, by folder or by file", async () => {
      const code = ['export { beta } from "../../beta";', 'export { beta as b } from "../../beta/index";'].join("\n");
      expect(await boundaryHits(lint, code, "src/features/alpha/routes/probe.ts")).toEqual([]);
    });

    it("allows a feature's own files", async () => {
      expect(await boundaryHits(lint, 'export { alpha } from "../api/alpha";', "src/features/alpha/routes/probe.ts")).toEqual([]);
    });
  });
});
