// Lint rules: TypeScript's recommended set, React hooks on the client, no import cycles, and
// the boundaries of the layout (shared/ imports nothing from src/ or server/; the client
// never imports server code; features do not import each other).
import js from "@eslint/js";
import tseslint from "typescript-eslint";
import importX from "eslint-plugin-import-x";
import reactHooks from "eslint-plugin-react-hooks";
import globals from "globals";

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
          ],
        },
      ],
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_", caughtErrors: "none" }],
      "@typescript-eslint/no-non-null-assertion": "off",
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
