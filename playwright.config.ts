// Browser tests run in Debian's Chromium (never a downloaded browser) against the app that
// scripts/test-run.ts starts on a throw-away database; BASE_URL tells them where it is.
import { defineConfig } from "@playwright/test";
import { chromiumLaunchOptions } from "./tests/browser/chromium";

export default defineConfig({
  testDir: "tests/browser",
  // A run with its own client build (CLIENT_DIST) keeps its own screenshots too.
  outputDir: process.env.CLIENT_DIST ? `test-results/browser-${process.env.CLIENT_DIST}` : "test-results/browser",
  timeout: 30_000,
  workers: 1,
  reporter: [["list"]],
  use: {
    baseURL: process.env.BASE_URL ?? "http://127.0.0.1:3000",
    screenshot: "only-on-failure",
    trace: "off",
    launchOptions: chromiumLaunchOptions,
  },
});
