/// <reference types="vitest/config" />
// Vite builds the client (src/) into dist/; vitest runs unit and API tests.
import { defineConfig } from "vite";
import react from "@vitejs/plugin-react";
import tailwindcss from "@tailwindcss/vite";

export default defineConfig({
  plugins: [react(), tailwindcss()],
  server: {
    proxy: { "/api": "http://127.0.0.1:3000" },
  },
  build: {
    outDir: process.env.CLIENT_DIST ?? "dist",
    sourcemap: false,
    chunkSizeWarningLimit: 600,
  },
  test: {
    include: [
      "shared/**/*.test.ts",
      "server/**/*.test.ts",
      "src/**/*.test.{ts,tsx}",
      "tests/api/**/*.test.ts",
      "tests/lifecycle/**/*.test.ts",
      "tests/lint/**/*.test.ts",
    ],
    exclude: ["tests/browser/**", "node_modules/**"],
    testTimeout: 30_000,
    hookTimeout: 60_000,
  },
});
