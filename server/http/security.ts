// Web hardening that helmet does not decide for us: refusing cross-site state changes made
// with the session cookie, and sending HSTS only where the connection really is HTTPS.
import type { RequestHandler } from "express";
import { HttpError } from "./errors";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * Refuses (403 cross_site_request) a state-changing /api request that a browser made from
 * another site, unless it carries its own `Authorization: Bearer` token (a header another
 * site's page cannot add without a CORS preflight this API never grants). The cookie is
 * ambient, so login (which sets it) and every cookie-authenticated change are covered.
 * Fetch Metadata (`Sec-Fetch-Site`) where the browser sends it; else `Origin`, which must be
 * the app's configured origin or the origin of the request's own Host.
 */
export function sameOriginGuard(appUrl: string): RequestHandler {
  const appOrigin = new URL(appUrl).origin;
  return (req, _res, next) => {
    if (SAFE_METHODS.has(req.method)) return next();
    if (/^Bearer\s/i.test(req.get("authorization") ?? "")) return next();
    const site = req.get("sec-fetch-site");
    const origin = req.get("origin");
    const own = origin === appOrigin || origin === `${req.protocol}://${req.get("host")}`;
    if (site === "cross-site" || (origin !== undefined && !own)) {
      return next(new HttpError(403, "cross_site_request", `Origin: requests from ${origin ?? "another site"} may not change data here; use Soundings itself`));
    }
    next();
  };
}

/** Strict-Transport-Security only on secure requests (req.secure honours trust proxy). */
export const hstsWhenSecure: RequestHandler = (req, res, next) => {
  if (req.secure) res.setHeader("Strict-Transport-Security", "max-age=31536000; includeSubDomains");
  next();
};
