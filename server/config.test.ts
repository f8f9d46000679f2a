// Configuration rules that protect a deployment.
import { describe, expect, it } from "vitest";
import { ConfigError, loadConfig } from "./config";

describe("loadConfig", () => {
  it("refuses to start in production without a JWT secret", () => {
    expect(() => loadConfig({ NODE_ENV: "production" })).toThrow(ConfigError);
    expect(() => loadConfig({ NODE_ENV: "production", JWT_SECRET: "short" })).toThrow(/JWT_SECRET/);
    expect(loadConfig({ NODE_ENV: "production", JWT_SECRET: "x".repeat(32) }).cookieSecure).toBe(true);
  });

  it("uses the embedded defaults in development", () => {
    const c = loadConfig({});
    expect(c.port).toBe(3000);
    expect(c.databaseUrl).toContain("127.0.0.1");
    expect(c.smtp).toMatchObject({ host: "127.0.0.1", port: 1025 });
    expect(c.cookieSecure).toBe(false);
  });

  it("names the setting that is not a number", () => {
    expect(() => loadConfig({ PORT: "eighty" })).toThrow(/PORT/);
  });
});
