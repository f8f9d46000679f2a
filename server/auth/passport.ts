// passport-jwt reads the token from the Authorization header or the session cookie, then
// the session row decides: revoked, expired, deactivated or role-less means 401.
import passport from "passport";
import { ExtractJwt, Strategy as JwtStrategy } from "passport-jwt";
import type { Request, RequestHandler } from "express";
import type { Db } from "../db/knex";
import { JWT_ISSUER, SESSION_COOKIE, type TokenClaims } from "./tokens";
import { HttpError } from "../http/errors";
import { loadSessionUser } from "../repositories/sessions";

const fromCookie = (req: Request): string | null => (req.cookies?.[SESSION_COOKIE] as string | undefined) ?? null;

/** Builds the `authenticate` middleware for one app instance. */
export function createAuthenticate(db: Db, secret: string): RequestHandler {
  const p = new passport.Passport();
  p.use(
    new JwtStrategy(
      {
        jwtFromRequest: ExtractJwt.fromExtractors([ExtractJwt.fromAuthHeaderAsBearerToken(), fromCookie]),
        secretOrKey: secret,
        issuer: JWT_ISSUER,
        algorithms: ["HS256"],
      },
      (claims: TokenClaims, done: (err: unknown, user?: Express.User | false) => void) => {
        if (!claims?.sid || !claims.sub || !claims.pid) return done(null, false);
        loadSessionUser(db, claims)
          .then((user) => done(null, user ?? false))
          .catch((err) => done(err));
      },
    ),
  );
  const initialize = p.initialize();
  return (req, res, next) => {
    initialize(req, res, () => {
      p.authenticate("jwt", { session: false }, (err: unknown, user: Express.User | false, info: unknown) => {
        if (err) return next(err);
        if (!user) {
          const expired = info instanceof Error && info.name === "TokenExpiredError";
          return next(
            new HttpError(401, expired ? "session_expired" : "unauthorized", expired ? "Your session has expired; sign in again" : "Sign in to continue"),
          );
        }
        req.user = user;
        next();
      })(req, res, next);
    });
  };
}
