// Lint rules: TypeScript's recommended set, React hooks on the client, no import cycles, and
// the boundaries of the layout (shared/ imports nothing from src/ or server/; the client
// never imports server code; features do not import each other except through a public index.ts).
import js from "@eslint/js";
import tseslint from "typescript-eslint";
import importX from "eslint-plugin-import-x";
import reactHooks from "eslint-plugin-react-hooks";
import globals from "globals";
import { readdirSync } from "node:fs";
import { join } from "node:path";

// Route handlers parse, call one service and present: queries live in server/repositories/
// and transactions in server/services/, with no exception under server/routes/
// (tests/lint/layering.test.ts checks the rule fires).
const NO_QUERIES = "a route handler parses, calls a service and presents: put the query in server/repositories/ and the transaction in server/services/";

// A route folder's schemas are gathered in its schema.ts (server-only ones defined there, the
// client's re-exported from shared/schemas/); its router files import them from ./schema.
const SCHEMAS_IN_FOLDER =
  "a route file takes its schemas from its folder's schema.ts: define a server-only schema there, or re-export the shared one from shared/schemas/";

// Features under src/features/ do not import each other, except another feature's public
// entry (src/features/<f>/index.ts). One zone per folder found there, so a new or renamed
// feature is covered without editing a list; src/app/ may import any feature.
const FEATURE_BOUNDARY =
  "features do not import each other: import another feature only through its public src/features/<feature>/index.ts, or move what both need to src/lib/ or src/components/";

/** The no-restricted-paths zones that keep each of these features to itself and the others' index.ts. */
export function featureZones(features) {
  return features.map((feature) => ({
    target: `./src/features/${feature}`,
    from: "./src/features",
    except: [`./${feature}`, ...features.filter((other) => other !== feature).map((other) => `./${other}/index.ts`)],
    message: FEATURE_BOUNDARY,
  }));
}

const FEATURES = readdirSync(join(import.meta.dirname, "src/features"), { withFileTypes: true })
  .filter((d) => d.isDirectory())
  .map((d) => d.name)
  .sort();

export default tseslint.config(
  { ignores: ["dist/**", "dist-*/**", "node_modules/**", "storage/**", "test-results/**", ".data/**", "playwright-report/**"] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    plugins: { "import-x": importX },
    settings: { "import-x/resolver-next": [importX.createNodeResolver({ extensions: [".ts", ".tsx", ".js", ".json"] })] },
    rules: {
      "import-x/no-cycle": ["error", { maxDepth: 10 }],
      "import-x/no-restricted-paths": [
        "error",
        {
          zones: [
            { target: "./shared", from: "./src", message: "shared/ is used by both sides and imports nothing from src/" },
            { target: "./shared", from: "./server", message: "shared/ is used by both sides and imports nothing from server/" },
            { target: "./src", from: "./server", message: "the client never imports server code" },
            { target: "./server", from: "./src", message: "the server never imports client code" },
            ...featureZones(FEATURES),
          ],
        },
      ],
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_", caughtErrors: "none" }],
      "@typescript-eslint/no-non-null-assertion": "off",
    },
  },
  {
    files: ["server/routes/**/*.ts"],
    rules: {
      "@typescript-eslint/no-restricted-imports": [
        "error",
        {
          paths: [
            { name: "knex", message: NO_QUERIES, allowTypeImports: true },
            { name: "zod", message: SCHEMAS_IN_FOLDER },
          ],
          patterns: [
            { group: ["**/db/knex"], message: NO_QUERIES, allowTypeImports: true },
            { group: ["**/shared/schemas/*", "**/shared/rubric/types"], message: SCHEMAS_IN_FOLDER },
          ],
        },
      ],
      "no-restricted-syntax": [
        "error",
        { selector: "CallExpression[callee.name=/^(db|trx|knex)$/]", message: NO_QUERIES },
        { selector: "CallExpression[callee.type='MemberExpression'][callee.property.name=/^(db|trx)$/]", message: NO_QUERIES },
        { selector: "MemberExpression[property.name=/^(transaction|raw|fn)$/]", message: NO_QUERIES },
      ],
    },
  },
  {
    // schema.ts is where a folder's schemas are written or re-exported.
    files: ["server/routes/*/schema.ts"],
    rules: {
      "@typescript-eslint/no-restricted-imports": [
        "error",
        {
          paths: [{ name: "knex", message: NO_QUERIES, allowTypeImports: true }],
          patterns: [{ group: ["**/db/knex"], message: NO_QUERIES, allowTypeImports: true }],
        },
      ],
    },
  },
  {
    files: ["src/**/*.{ts,tsx}"],
    plugins: { "react-hooks": reactHooks },
    rules: {
      ...reactHooks.configs.recommended.rules,
    },
  },
);
