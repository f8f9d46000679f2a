// The one way the client builds a query string for an API address: every parameter that has
// a value, encoded, in the order given.

export type QueryValue = string | number | boolean | null | undefined;

/** "?a=1&b=x" from the parameters with a value (undefined, null and "" are left out); "" when none has one. */
export function queryString(params: Record<string, QueryValue>): string {
  const search = new URLSearchParams();
  for (const [key, value] of Object.entries(params)) if (value !== undefined && value !== null && value !== "") search.set(key, String(value));
  const s = search.toString();
  return s ? `?${s}` : "";
}
