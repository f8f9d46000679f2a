// The heading block of a screen. The h1 takes focus after client-side navigation (see
// the app layout) so screen-reader users land on the new page's title.
import type { ReactNode } from "react";

export function PageHeader({ title, eyebrow, description, actions }: { title: string; eyebrow?: string; description?: ReactNode; actions?: ReactNode }) {
  return (
    <div className="mb-6 flex flex-wrap items-end justify-between gap-4 border-b border-slate-200 pb-4">
      {/* React 19 hoists <title> into the head: each screen names the browser tab (WCAG 2.4.2). */}
      <title>{`${title} · Soundings`}</title>
      <div>
        {eyebrow ? <p className="text-sm font-semibold uppercase tracking-wide text-sea-700">{eyebrow}</p> : null}
        <h1 tabIndex={-1} className="text-2xl font-semibold text-ink-950 focus:outline-none">
          {title}
        </h1>
        {description ? <div className="mt-1 max-w-prose text-sm text-slate-600">{description}</div> : null}
      </div>
      {actions ? <div className="flex gap-2">{actions}</div> : null}
    </div>
  );
}
