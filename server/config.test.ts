// Configuration rules that protect a deployment.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { ConfigError, loadConfig } from "./config";

// The constant development secret that older versions shipped in their source: published,
// so a token signed with it proves nothing.
const RETIRED_DEV_SECRET = ["soundings", "development", "secret", "never", "use", "in", "production"].join("-");

const tmp = fs.mkdtempSync(path.join(os.tmpdir(), "soundings-config-"));
afterAll(() => fs.rmSync(tmp, { recursive: true, force: true }));
const dataDir = (name: string) => path.join(tmp, name);

describe("loadConfig", () => {
  it("refuses to start in production without a JWT secret", () => {
    expect(() => loadConfig({ NODE_ENV: "production" }, { dataDir: dataDir("prod") })).toThrow(ConfigError);
    expect(() => loadConfig({ NODE_ENV: "production", JWT_SECRET: "short" })).toThrow(/JWT_SECRET/);
    expect(loadConfig({ NODE_ENV: "production", JWT_SECRET: "x".repeat(32) }).cookieSecure).toBe(true);
    // Production never falls back to a generated file.
    expect(fs.existsSync(dataDir("prod"))).toBe(false);
  });

  it("refuses the old published development secret, in production and everywhere else", () => {
    expect(RETIRED_DEV_SECRET.length).toBeGreaterThanOrEqual(32); // long enough to pass the length rule alone
    for (const NODE_ENV of ["production", "development", "test"]) {
      expect(() => loadConfig({ NODE_ENV, JWT_SECRET: RETIRED_DEV_SECRET }, { dataDir: dataDir("retired") })).toThrow(/JWT_SECRET/);
    }
  });

  it("makes a random development secret once, keeps it in <data>/jwt-secret with mode 0600 and reuses it", () => {
    const dir = dataDir("dev");
    const first = loadConfig({}, { dataDir: dir }).jwtSecret;
    const file = path.join(dir, "jwt-secret");
    expect(fs.readFileSync(file, "utf8").trim()).toBe(first);
    expect(fs.statSync(file).mode & 0o777).toBe(0o600);
    expect(first.length).toBeGreaterThanOrEqual(32);
    expect(loadConfig({}, { dataDir: dir }).jwtSecret).toBe(first);
    // Another checkout gets another secret.
    expect(loadConfig({}, { dataDir: dataDir("dev-other") }).jwtSecret).not.toBe(first);
    // An explicit secret wins over the file.
    expect(loadConfig({ JWT_SECRET: "y".repeat(40) }, { dataDir: dir }).jwtSecret).toBe("y".repeat(40));
  });

  it("refuses an unusable development secret file, naming it", () => {
    const dir = dataDir("dev-bad");
    fs.mkdirSync(dir);
    fs.writeFileSync(path.join(dir, "jwt-secret"), "tiny\n");
    expect(() => loadConfig({}, { dataDir: dir })).toThrow(/jwt-secret/);
  });

  it("uses a random secret per process in test mode, without writing a file", () => {
    const dir = dataDir("test");
    const a = loadConfig({ NODE_ENV: "test" }, { dataDir: dir }).jwtSecret;
    expect(a.length).toBeGreaterThanOrEqual(32);
    expect(loadConfig({ NODE_ENV: "test" }, { dataDir: dir }).jwtSecret).toBe(a);
    expect(fs.existsSync(dir)).toBe(false);
  });

  it("uses the embedded defaults in development", () => {
    const c = loadConfig({}, { dataDir: dataDir("defaults") });
    expect(c.port).toBe(3000);
    expect(c.databaseUrl).toContain("127.0.0.1");
    expect(c.smtp).toMatchObject({ host: "127.0.0.1", port: 1025 });
    expect(c.cookieSecure).toBe(false);
  });

  it("names the setting that is not a number", () => {
    expect(() => loadConfig({ PORT: "eighty" }, { dataDir: dataDir("port") })).toThrow(/PORT/);
  });
});
