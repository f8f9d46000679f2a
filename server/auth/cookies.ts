// The session cookie: httpOnly, SameSite=Strict, Secure in production.
import type { Response } from "express";
import type { Config } from "../config";
import { SESSION_COOKIE } from "./tokens";

export function setSessionCookie(res: Response, config: Config, token: string) {
  res.cookie(SESSION_COOKIE, token, {
    httpOnly: true,
    sameSite: "strict",
    secure: config.cookieSecure,
    path: "/",
    maxAge: config.sessionTtlSeconds * 1000,
  });
}

export function clearSessionCookie(res: Response, config: Config) {
  res.clearCookie(SESSION_COOKIE, { httpOnly: true, sameSite: "strict", secure: config.cookieSecure, path: "/" });
}
