// The server's one logger (pino, JSON lines on stdout). Nothing secret reaches a log line:
// pino's `redact` removes the known secret fields (passwords, tokens, authorization and cookie
// headers, set-cookie, S3 and SMTP secrets), and every logged value is scrubbed first: any key
// that names a secret is replaced wherever it sits (an error carrying a request, a nested body),
// and e-mail addresses inside any string (messages, stacks, details) are masked as a***@domain.
import pino, { type DestinationStream, type Logger } from "pino";

/** Secret fields pino removes by path (a second line of defence after `scrub`). */
export const REDACT_PATHS = [
  "password",
  "newPassword",
  "currentPassword",
  "token",
  "secret",
  "*.password",
  "*.newPassword",
  "*.currentPassword",
  "*.token",
  "*.secret",
  "*.secretAccessKey",
  "*.pass",
  "req.body.password",
  "req.body.newPassword",
  "req.body.token",
  "req.headers.authorization",
  "req.headers.cookie",
  'res.headers["set-cookie"]',
  "*.headers.authorization",
  "*.headers.cookie",
  '*.headers["set-cookie"]',
  "err.req.headers.authorization",
  "err.req.headers.cookie",
  "err.req.body.password",
];

const REDACTED = "[Redacted]";
// Keys whose values are secrets wherever they appear (password, newPassword, token, jwtSecret,
// authorization, cookie, set-cookie, SMTP pass, S3 secretAccessKey, apiKey, credentials).
const SECRET_KEY = /password|passwd|^pass$|token|secret|authorization|cookie|api[-_]?key|credential/i;
const EMAIL = /([A-Za-z0-9._%+-])[A-Za-z0-9._%+-]*@([A-Za-z0-9-]+(?:\.[A-Za-z0-9-]+)*\.[A-Za-z]{2,})/g;
// Bearer tokens and JWTs written into free text (an error message quoting a header).
const BEARER = /\b(Bearer\s+)[A-Za-z0-9._~+/=-]+/gi;
const JWT = /\beyJ[A-Za-z0-9_-]+\.[A-Za-z0-9_-]+\.[A-Za-z0-9_-]+/g;

/** Masks e-mail addresses (`ada@host.example` → `a***@host.example`) and bearer tokens in a string. */
export function maskSecrets(s: string): string {
  return s.replace(EMAIL, "$1***@$2").replace(BEARER, `$1${REDACTED}`).replace(JWT, REDACTED);
}

const isPlain = (v: object) => {
  const proto = Object.getPrototypeOf(v);
  return proto === Object.prototype || proto === null;
};

/** A copy of `value` fit for a log line: secret keys redacted, e-mails masked in every string. */
export function scrub(value: unknown, seen = new WeakSet<object>(), depth = 0): unknown {
  if (typeof value === "string") return maskSecrets(value);
  if (value === null || typeof value !== "object") return value;
  if (seen.has(value)) return "[Circular]";
  if (depth > 8) return "[Deep]";
  seen.add(value);
  if (value instanceof Date) return value.toISOString();
  if (Buffer.isBuffer(value)) return `[Buffer ${value.length} bytes]`;
  if (Array.isArray(value)) return value.slice(0, 100).map((v) => scrub(v, seen, depth + 1));
  let source: Record<string, unknown>;
  if (value instanceof Error) {
    // type, message, stack, cause and the error's own fields (code, detail, a request...).
    source = pino.stdSerializers.err(value) as unknown as Record<string, unknown>;
  } else if (isPlain(value)) {
    source = value as Record<string, unknown>;
  } else if ("headers" in value && ("method" in value || "statusCode" in value)) {
    // A live request or response: only the parts that explain it.
    const r = value as Record<string, unknown>;
    source = { method: r.method, url: r.originalUrl ?? r.url, statusCode: r.statusCode, headers: r.headers, body: r.body };
  } else {
    source = { ...(value as Record<string, unknown>) };
  }
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(source)) {
    if (v === undefined) continue;
    out[k] = SECRET_KEY.test(k) && v !== null && v !== "" ? REDACTED : scrub(v, seen, depth + 1);
  }
  return out;
}

const LEVELS = [...Object.keys(pino.levels.values), "silent"];

/** The level from LOG_LEVEL; `info` by default, `silent` under NODE_ENV=test (tests pass their own). */
export function logLevel(env: NodeJS.ProcessEnv = process.env): string {
  const level = env.LOG_LEVEL?.trim().toLowerCase() || (env.NODE_ENV === "test" ? "silent" : "info");
  if (!LEVELS.includes(level)) throw new Error(`LOG_LEVEL: "${env.LOG_LEVEL}" is not one of ${LEVELS.join(", ")}`);
  return level;
}

/** A redacting pino logger; `destination` lets tests read what would be written. */
export function createLogger(opts: { level?: string; destination?: DestinationStream } = {}): Logger {
  return pino(
    {
      level: opts.level ?? logLevel(),
      base: { service: "soundings" },
      redact: { paths: REDACT_PATHS, censor: REDACTED },
      hooks: {
        // Every argument is scrubbed before pino sees it: merged objects, errors and the message.
        logMethod(args, method) {
          const [first, ...rest] = args as unknown[];
          if (first instanceof Error) {
            return method.apply(this, [{ err: scrub(first) }, maskSecrets(typeof rest[0] === "string" ? rest[0] : first.message)] as never);
          }
          return method.apply(this, [scrub(first), ...rest.map((a) => scrub(a))] as never);
        },
      },
    },
    opts.destination,
  );
}

/** The app's `log(value)`: errors and objects at level error, plain text at warn. */
export type LogFn = (msg: unknown) => void;

/** Adapts a logger to the `log(value)` the app, the job queue and the mail sender take. */
export function logFnFor(logger: Logger): LogFn {
  return (msg) => {
    if (msg instanceof Error) logger.error(msg);
    else if (typeof msg === "string") logger.warn(msg);
    else logger.error({ detail: msg }, "logged value");
  };
}

/** The process's logger and its `log` function. */
export const logger = createLogger();
export const log: LogFn = logFnFor(logger);
