// Runtime configuration from the environment, with the embedded defaults of `npm start`.
// Production refuses to start without a real JWT secret; development keeps a random one
// per checkout in .data/jwt-secret; tests use a random one per process.
import path from "node:path";
import os from "node:os";
import fs from "node:fs";
import crypto from "node:crypto";
import { fileURLToPath } from "node:url";
import type { S3Settings } from "./storage/s3";
import type { OutboxSettings } from "./mail/outbox";

export interface Config {
  env: "development" | "test" | "production";
  port: number;
  /** Address the HTTP server binds: loopback unless HOST says otherwise (e.g. 0.0.0.0). */
  host: string;
  databaseUrl: string;
  jwtSecret: string;
  /**
   * The AES-256 key that seals encounter references at rest (ENCOUNTER_KEY: 32 bytes, base64
   * or hex). Development makes one in the data folder; test uses a fixed one; production has
   * none unless set, and then refuses references.
   */
  encounterKey: Buffer | null;
  /** Lifetime of a session token, in seconds. */
  sessionTtlSeconds: number;
  cookieSecure: boolean;
  appUrl: string;
  smtp: { host: string; port: number; secure: boolean; user?: string; pass?: string; from: string };
  /** How the mail outbox's sender polls and retries. */
  mailOutbox: OutboxSettings;
  storageDir: string;
  storage: { driver: "local" | "s3"; s3?: S3Settings };
  uploads: { maxFileBytes: number; maxClipsPerExam: number; tempDir: string };
  /** What happens to an original upload once its exam is submitted. */
  originalRetention: "delete_on_submit" | "keep";
  jobs: {
    schema: string;
    retryLimit: number;
    retryDelaySeconds: number;
    expireInSeconds: number;
    stuckAfterSeconds: number;
    runWorker: boolean;
    concurrency: number;
  };
  /**
   * Limits of anonymous requests, each per window: `max` failed sign-ins per account and
   * client, `perAccount` failed sign-ins of one account from all clients, `perClient` failed
   * sign-ins of one client over all accounts; `anonymousPerClient` requests of one client to
   * the other public routes that do work (password reset, invitations), `anonymousPerKey`
   * of those per e-mail address or token.
   */
  loginRateLimit: { windowMs: number; max: number; perAccount: number; perClient: number; anonymousPerClient: number; anonymousPerKey: number };
  jsonBodyLimit: string;
  trustProxy: boolean | number;
  /** Check every JSON answer against the schema its route declares (on under NODE_ENV=test; CHECK_RESPONSES=true|false). */
  checkResponses: boolean;
  bcryptRounds: number;
  /** When reviewers get the digest of overdue reads (cron, UTC). */
  digestCron: string;
}

export class ConfigError extends Error {}

/** The checkout's own data folder (PostgreSQL cluster, development JWT secret). */
export const DATA_DIR = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..", ".data");

// SHA-256 of the constant development secret that earlier versions shipped in the code:
// tokens signed with it can be forged by anyone who has read the source.
const RETIRED_SECRET_SHA256 = new Set(["1fd76e323adf66356f0bea4118b7efd7029247bb1da2bc54269d2d4dc6b6abdf"]);
const sha256 = (s: string) => crypto.createHash("sha256").update(s).digest("hex");

// Test runs need no stable secret: each process signs and checks its own tokens.
const TEST_JWT_SECRET = crypto.randomBytes(32).toString("base64url");

/**
 * The development secret: made once per checkout with crypto.randomBytes and kept in
 * `<dataDir>/jwt-secret` (mode 0600), read again on every later start.
 */
export function developmentJwtSecret(dataDir: string = DATA_DIR): string {
  const file = path.join(dataDir, "jwt-secret");
  if (!fs.existsSync(file)) {
    fs.mkdirSync(dataDir, { recursive: true });
    const tmp = `${file}.${process.pid}.${crypto.randomBytes(4).toString("hex")}`;
    fs.writeFileSync(tmp, crypto.randomBytes(48).toString("base64url") + "\n", { mode: 0o600 });
    try {
      // link() fails if another process created the file first; then theirs wins.
      fs.linkSync(tmp, file);
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== "EEXIST") throw err;
    } finally {
      fs.rmSync(tmp, { force: true });
    }
  }
  if (fs.statSync(file).mode & 0o077) fs.chmodSync(file, 0o600);
  const secret = fs.readFileSync(file, "utf8").trim();
  if (secret.length < 32) throw new ConfigError(`${file} holds no usable JWT secret; delete it to have a new one made`);
  return secret;
}

function jwtSecretFor(mode: Config["env"], env: NodeJS.ProcessEnv, dataDir?: string): string {
  const given = env.JWT_SECRET ?? "";
  if (given && RETIRED_SECRET_SHA256.has(sha256(given))) {
    throw new ConfigError("JWT_SECRET is the old published development secret; set a new random one (e.g. `openssl rand -base64 48`)");
  }
  if (mode === "production") {
    if (given.length < 32) throw new ConfigError("JWT_SECRET must be set to at least 32 characters in production");
    return given;
  }
  if (given) return given;
  return mode === "test" ? TEST_JWT_SECRET : developmentJwtSecret(dataDir);
}

/** A 32-byte key from base64 or hex, or a ConfigError naming the variable. */
export function parseKey(value: string, name: string): Buffer {
  const v = value.trim();
  const key = /^[0-9a-fA-F]{64}$/.test(v) ? Buffer.from(v, "hex") : Buffer.from(v, "base64");
  if (key.length !== 32) throw new ConfigError(`${name} must be 32 bytes, as base64 or hex (e.g. \`openssl rand -base64 32\`)`);
  return key;
}

function encounterKeyFor(mode: Config["env"], env: NodeJS.ProcessEnv, dataDir: string = DATA_DIR): Buffer | null {
  if (env.ENCOUNTER_KEY) return parseKey(env.ENCOUNTER_KEY, "ENCOUNTER_KEY");
  if (mode === "production") return null;
  // Tests share one fixed key across processes; it protects nothing and is used nowhere else.
  if (mode === "test") return crypto.createHash("sha256").update("soundings test encounter key").digest();
  const file = path.join(dataDir, "encounter-key");
  if (!fs.existsSync(file)) {
    fs.mkdirSync(dataDir, { recursive: true });
    try {
      fs.writeFileSync(file, crypto.randomBytes(32).toString("base64") + "\n", { mode: 0o600, flag: "wx" });
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== "EEXIST") throw err;
    }
  }
  return parseKey(fs.readFileSync(file, "utf8"), file);
}

function int(value: string | undefined, fallback: number, name: string): number {
  if (value === undefined || value === "") return fallback;
  const n = Number(value);
  if (!Number.isInteger(n) || n < 0) throw new ConfigError(`${name} must be a whole number, got "${value}"`);
  return n;
}

function storageSettings(env: NodeJS.ProcessEnv): Config["storage"] {
  if ((env.STORAGE_DRIVER ?? "local") === "local") return { driver: "local" };
  if (env.STORAGE_DRIVER !== "s3") throw new ConfigError(`STORAGE_DRIVER must be "local" or "s3", got "${env.STORAGE_DRIVER}"`);
  for (const name of ["S3_BUCKET", "S3_ACCESS_KEY_ID", "S3_SECRET_ACCESS_KEY"]) {
    if (!env[name]) throw new ConfigError(`${name} must be set when STORAGE_DRIVER=s3`);
  }
  return {
    driver: "s3",
    s3: {
      endpoint: env.S3_ENDPOINT || undefined,
      region: env.S3_REGION ?? "us-east-1",
      bucket: env.S3_BUCKET!,
      accessKeyId: env.S3_ACCESS_KEY_ID!,
      secretAccessKey: env.S3_SECRET_ACCESS_KEY!,
      forcePathStyle: env.S3_FORCE_PATH_STYLE !== "false",
    },
  };
}

function rateLimits(env: NodeJS.ProcessEnv): Config["loginRateLimit"] {
  const max = int(env.LOGIN_RATE_MAX, 10, "LOGIN_RATE_MAX");
  // The wider limits follow LOGIN_RATE_MAX unless set on their own.
  return {
    windowMs: int(env.LOGIN_RATE_WINDOW_MS, 15 * 60_000, "LOGIN_RATE_WINDOW_MS"),
    max,
    perAccount: int(env.LOGIN_RATE_MAX_PER_ACCOUNT, 3 * max, "LOGIN_RATE_MAX_PER_ACCOUNT"),
    perClient: int(env.LOGIN_RATE_MAX_PER_CLIENT, 5 * max, "LOGIN_RATE_MAX_PER_CLIENT"),
    anonymousPerClient: int(env.ANON_RATE_MAX_PER_CLIENT, 5 * max, "ANON_RATE_MAX_PER_CLIENT"),
    anonymousPerKey: int(env.ANON_RATE_MAX_PER_KEY, max, "ANON_RATE_MAX_PER_KEY"),
  };
}

/**
 * Reads the configuration; throws ConfigError when a setting is unusable. `dataDir` is where
 * a development run keeps its generated JWT secret (the checkout's .data by default).
 */
export function loadConfig(env: NodeJS.ProcessEnv = process.env, opts: { dataDir?: string } = {}): Config {
  const mode = (env.NODE_ENV === "production" ? "production" : env.NODE_ENV === "test" ? "test" : "development") as Config["env"];
  const jwtSecret = jwtSecretFor(mode, env, opts.dataDir);
  const port = int(env.PORT, 3000, "PORT");
  return {
    env: mode,
    port,
    host: env.HOST || "127.0.0.1",
    databaseUrl: env.DATABASE_URL ?? "postgres://postgres@127.0.0.1:54329/soundings",
    jwtSecret,
    encounterKey: encounterKeyFor(mode, env, opts.dataDir),
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
    mailOutbox: {
      pollMs: int(env.MAIL_POLL_MS, 2000, "MAIL_POLL_MS"),
      retryBaseSeconds: int(env.MAIL_RETRY_BASE_SECONDS, 30, "MAIL_RETRY_BASE_SECONDS"),
      retryMaxSeconds: int(env.MAIL_RETRY_MAX_SECONDS, 3600, "MAIL_RETRY_MAX_SECONDS"),
      maxAttempts: int(env.MAIL_MAX_ATTEMPTS, 25, "MAIL_MAX_ATTEMPTS"),
      leaseSeconds: 120,
    },
    storageDir: path.resolve(env.STORAGE_DIR ?? "storage"),
    storage: storageSettings(env),
    uploads: {
      maxFileBytes: int(env.MAX_UPLOAD_MB, 500, "MAX_UPLOAD_MB") * 1024 * 1024,
      maxClipsPerExam: int(env.MAX_CLIPS_PER_EXAM, 20, "MAX_CLIPS_PER_EXAM"),
      tempDir: path.resolve(env.UPLOAD_TMP_DIR ?? path.join(os.tmpdir(), "soundings-uploads")),
    },
    originalRetention: env.ORIGINAL_RETENTION === "keep" ? "keep" : "delete_on_submit",
    jobs: {
      // Workers and API servers that share a schema must share storage too.
      schema: env.JOB_SCHEMA ?? "pgboss",
      retryLimit: int(env.JOB_RETRY_LIMIT, 3, "JOB_RETRY_LIMIT"),
      retryDelaySeconds: int(env.JOB_RETRY_DELAY_SECONDS, 5, "JOB_RETRY_DELAY_SECONDS"),
      expireInSeconds: int(env.JOB_EXPIRE_SECONDS, 15 * 60, "JOB_EXPIRE_SECONDS"),
      stuckAfterSeconds: int(env.JOB_STUCK_AFTER_SECONDS, 20 * 60, "JOB_STUCK_AFTER_SECONDS"),
      runWorker: env.RUN_WORKER !== "false",
      // Clip jobs one worker process runs at once (ffmpeg runs are short and use a core each).
      concurrency: Math.max(1, int(env.JOB_CONCURRENCY, 2, "JOB_CONCURRENCY")),
    },
    loginRateLimit: rateLimits(env),
    jsonBodyLimit: env.JSON_BODY_LIMIT ?? "1mb",
    trustProxy: env.TRUST_PROXY ? (/^\d+$/.test(env.TRUST_PROXY) ? Number(env.TRUST_PROXY) : env.TRUST_PROXY === "true") : false,
    checkResponses: env.CHECK_RESPONSES ? env.CHECK_RESPONSES === "true" : mode === "test",
    digestCron: env.DIGEST_CRON ?? "0 7 * * *",
    bcryptRounds: int(env.BCRYPT_ROUNDS, mode === "test" ? 4 : 12, "BCRYPT_ROUNDS"),
  };
}
