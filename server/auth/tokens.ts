// Session tokens (JWT, HS256) and one-time e-mail tokens. A JWT names a server-side
// session row, so revoking the row ends the token at once.
import crypto from "node:crypto";
import jwt from "jsonwebtoken";

export const JWT_ISSUER = "soundings";
export const SESSION_COOKIE = "soundings_session";

export interface TokenClaims {
  sub: string;
  sid: string;
  pid: string;
}

/** Signs a session token that expires with its session. */
export function signSessionToken(secret: string, claims: TokenClaims, ttlSeconds: number): string {
  return jwt.sign(claims, secret, { algorithm: "HS256", expiresIn: ttlSeconds, issuer: JWT_ISSUER });
}

/** A random URL-safe token for an e-mail link, and the SHA-256 we store instead of it. */
export function newEmailToken(): { token: string; hash: string } {
  const token = crypto.randomBytes(32).toString("base64url");
  return { token, hash: hashToken(token) };
}

export function hashToken(token: string): string {
  return crypto.createHash("sha256").update(token).digest("hex");
}
