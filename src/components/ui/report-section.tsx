// A titled block of a report screen: heading, a line on method, actions (export) on the right.
import { useId, type ReactNode } from "react";

export function ReportSection({ title, description, actions, children }: { title: string; description?: ReactNode; actions?: ReactNode; children: ReactNode }) {
  const id = useId();
  return (
    <section aria-labelledby={id} className="mb-8">
      <div className="mb-2 flex flex-wrap items-end justify-between gap-3">
        <div>
          <h2 id={id} className="text-lg font-semibold text-ink-950">
            {title}
          </h2>
          {description ? <div className="max-w-prose text-sm text-slate-600">{description}</div> : null}
        </div>
        {actions ? <div className="flex gap-2">{actions}</div> : null}
      </div>
      {children}
    </section>
  );
}

/** Shared class names of report tables, so every table on these screens looks the same. */
export const tableClasses = {
  wrap: "overflow-x-auto rounded-lg border border-slate-200 bg-white",
  table: "w-full text-left text-sm",
  thead: "border-b border-slate-200 bg-paper-200 text-xs uppercase tracking-wide text-slate-700",
  th: "px-3 py-2 font-semibold",
  thNum: "px-3 py-2 text-right font-semibold",
  tbody: "divide-y divide-slate-100",
  td: "px-3 py-2 text-ink-900",
  tdNum: "px-3 py-2 text-right tabular-nums text-ink-900",
};
