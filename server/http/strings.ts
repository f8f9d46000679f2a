// Text PostgreSQL cannot store: NUL (U+0000) is refused in every text and jsonb value,
// and jsonb refuses an unpaired UTF-16 surrogate (a "\ud800" escape in a JSON body).
// The parse step of every route walks what it validated and refuses such strings with a
// 400 that names the field, instead of letting the database fail the query (a 500).
import { HttpError } from "./errors";

// A high surrogate not followed by a low one, or a low one not preceded by a high one.
const LONE_SURROGATE = /[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/;

/** Why a string cannot be stored, or null when it can. */
export function unstorableReason(s: string): string | null {
  if (s.includes("\u0000")) return "must not contain the NUL character (U+0000)";
  if (LONE_SURROGATE.test(s)) return "must not contain an unpaired UTF-16 surrogate";
  return null;
}

// Shown in the error message, so the offending character is visible and the message valid.
// eslint-disable-next-line no-control-regex -- NUL is exactly what is being made visible
const escapeKey = (k: string) => k.replace(/[\u0000\ud800-\udfff]/g, (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, "0")}`);

/** Finds the first string (value or object key) that cannot be stored; its path and reason. */
export function findUnstorable(value: unknown, path: (string | number)[] = []): { path: string; reason: string } | null {
  if (typeof value === "string") {
    const reason = unstorableReason(value);
    return reason ? { path: path.join("."), reason } : null;
  }
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const hit = findUnstorable(value[i], [...path, i]);
      if (hit) return hit;
    }
    return null;
  }
  if (value && typeof value === "object" && (Object.getPrototypeOf(value) === Object.prototype || Object.getPrototypeOf(value) === null)) {
    for (const [k, v] of Object.entries(value)) {
      const keyReason = unstorableReason(k);
      if (keyReason) return { path: [...path, escapeKey(k)].join("."), reason: `key ${keyReason}` };
      const hit = findUnstorable(v, [...path, k]);
      if (hit) return hit;
    }
  }
  return null;
}

/** Throws a 400 validation_failed naming the field when `value` holds an unstorable string. */
export function assertStorable(value: unknown, where: "body" | "query" | "params"): void {
  const hit = findUnstorable(value);
  if (!hit) return;
  const field = hit.path || where;
  throw new HttpError(400, "validation_failed", `${field}: ${hit.reason}`, [{ path: field, message: hit.reason }]);
}
