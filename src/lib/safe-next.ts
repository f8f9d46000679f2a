// Where to go after signing in. Only same-site paths are followed, so a crafted
// "?next=" link cannot send someone to another site.

/** The path to continue to, or "/" when the value is missing or unsafe. */
export function safeNext(value: string | null): string {
  if (!value || !value.startsWith("/") || value.startsWith("//") || value.startsWith("/\\") || value.startsWith("/sign-in")) return "/";
  return value;
}
