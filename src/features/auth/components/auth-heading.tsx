// Heading of a signed-out screen (inside the public panel).
import type { ReactNode } from "react";

export function AuthHeading({ title, children }: { title: string; children?: ReactNode }) {
  return (
    <div className="mb-6">
      <title>{`${title} · Soundings`}</title>
      <h1 tabIndex={-1} className="text-xl font-semibold text-ink-950 focus:outline-none">
        {title}
      </h1>
      {children ? <div className="mt-1 text-sm text-slate-600">{children}</div> : null}
    </div>
  );
}
