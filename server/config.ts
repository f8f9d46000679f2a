// Runtime configuration from the environment, with the embedded defaults of `npm start`.
// Production refuses to start without a real JWT secret.
import path from "node:path";

export interface Config {
  env: "development" | "test" | "production";
  port: number;
  databaseUrl: string;
  jwtSecret: string;
  /** Lifetime of a session token, in seconds. */
  sessionTtlSeconds: number;
  cookieSecure: boolean;
  appUrl: string;
  smtp: { host: string; port: number; secure: boolean; user?: string; pass?: string; from: string };
  storageDir: string;
  loginRateLimit: { windowMs: number; max: number };
  jsonBodyLimit: string;
  trustProxy: boolean | number;
  bcryptRounds: number;
}

const DEV_JWT_SECRET = "soundings-development-secret-never-use-in-production";

export class ConfigError extends Error {}

function int(value: string | undefined, fallback: number, name: string): number {
  if (value === undefined || value === "") return fallback;
  const n = Number(value);
  if (!Number.isInteger(n) || n < 0) throw new ConfigError(`${name} must be a whole number, got "${value}"`);
  return n;
}

/** Reads the configuration; throws ConfigError when a setting is unusable. */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const mode = (env.NODE_ENV === "production" ? "production" : env.NODE_ENV === "test" ? "test" : "development") as Config["env"];
  const jwtSecret = env.JWT_SECRET ?? "";
  if (mode === "production" && jwtSecret.length < 32) {
    throw new ConfigError("JWT_SECRET must be set to at least 32 characters in production");
  }
  const port = int(env.PORT, 3000, "PORT");
  return {
    env: mode,
    port,
    databaseUrl: env.DATABASE_URL ?? "postgres://postgres@127.0.0.1:54329/soundings",
    jwtSecret: jwtSecret || DEV_JWT_SECRET,
    sessionTtlSeconds: int(env.SESSION_TTL_SECONDS, 12 * 3600, "SESSION_TTL_SECONDS"),
    cookieSecure: env.COOKIE_SECURE ? env.COOKIE_SECURE === "true" : mode === "production",
    appUrl: (env.APP_URL ?? `http://127.0.0.1:${port}`).replace(/\/$/, ""),
    smtp: {
      host: env.SMTP_HOST ?? "127.0.0.1",
      port: int(env.SMTP_PORT, 1025, "SMTP_PORT"),
      secure: env.SMTP_SECURE === "true",
      user: env.SMTP_USER || undefined,
      pass: env.SMTP_PASS || undefined,
      from: env.MAIL_FROM ?? "Soundings <no-reply@soundings.example>",
    },
    storageDir: path.resolve(env.STORAGE_DIR ?? "storage"),
    loginRateLimit: {
      windowMs: int(env.LOGIN_RATE_WINDOW_MS, 15 * 60_000, "LOGIN_RATE_WINDOW_MS"),
      max: int(env.LOGIN_RATE_MAX, 10, "LOGIN_RATE_MAX"),
    },
    jsonBodyLimit: env.JSON_BODY_LIMIT ?? "1mb",
    trustProxy: env.TRUST_PROXY ? (/^\d+$/.test(env.TRUST_PROXY) ? Number(env.TRUST_PROXY) : env.TRUST_PROXY === "true") : false,
    bcryptRounds: int(env.BCRYPT_ROUNDS, mode === "test" ? 4 : 12, "BCRYPT_ROUNDS"),
  };
}
