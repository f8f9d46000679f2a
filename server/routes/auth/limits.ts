// Rate limits of the anonymous auth routes (express-rate-limit, memory store per app).
// Sign-in counts failures only, three ways: per account and client, per account from all
// clients, per client over all accounts. The other public routes that do work (password
// reset, invitations) count every request per client and per e-mail address or token.
import { rateLimit, ipKeyGenerator } from "express-rate-limit";
import type { Request, RequestHandler } from "express";
import type { Config } from "../../config";
import { HttpError } from "../../http/errors";
import { hashToken } from "../../auth/tokens";

type Key = (req: Request) => string;

function limiter(name: string, windowMs: number, limit: number, key: Key, failuresOnly = false): RequestHandler {
  return rateLimit({
    windowMs,
    limit,
    standardHeaders: "draft-8",
    legacyHeaders: false,
    // A right password (any answer below 400) gives its count back.
    skipSuccessfulRequests: failuresOnly,
    keyGenerator: (req) => `${name}|${key(req)}`,
    handler: (_req, _res, next) => next(new HttpError(429, "rate_limited", "Too many attempts; wait a few minutes and try again")),
  });
}

const client: Key = (req) => ipKeyGenerator(req.ip ?? "unknown");

const bodyEmail: Key = (req) => (typeof req.body?.email === "string" ? req.body.email.trim().toLowerCase() : "");

// Tokens are keyed by their hash so the limiter's memory holds no usable link.
const token: Key = (req) => {
  const t = req.params?.token ?? req.body?.token;
  return typeof t === "string" ? hashToken(t) : "";
};

export function authLimiters(limits: Config["loginRateLimit"]) {
  const w = limits.windowMs;
  // One budget per client across all the non-sign-in public routes.
  const anonymousClient = limiter("anon-client", w, limits.anonymousPerClient, client);
  return {
    login: [
      limiter("login-client-account", w, limits.max, (req) => `${client(req)}|${bodyEmail(req)}`, true),
      // Guessing one account's password from many addresses…
      limiter("login-account", w, limits.perAccount, bodyEmail, true),
      // …and one address trying a password on many accounts.
      limiter("login-client", w, limits.perClient, client, true),
    ],
    forgot: [anonymousClient, limiter("forgot-email", w, limits.anonymousPerKey, bodyEmail)],
    byToken: [anonymousClient, limiter("token", w, limits.anonymousPerKey, token)],
  };
}
