// How the criteria will look to a reviewer before saving: each criterion with its help, the
// levels numbered as the digit keys that pick them, and every anchor text.
import type { RubricInput } from "../../../../shared/rubric/types";

export function RubricPreview({ value }: { value: RubricInput }) {
  return (
    <div className="rounded-lg bg-ink-950 p-4 text-ink-50">
      <p className="text-xs font-semibold uppercase tracking-wide text-ink-300">Reviewer&apos;s view · {value.name || "Untitled rubric"}</p>
      <ol className="mt-3 space-y-4">
        {value.criteria.map((c, i) => (
          <li key={i} className="rounded-md border border-ink-700 bg-ink-900 p-3">
            <p className="font-semibold">
              {c.label || "Unnamed criterion"}
              {c.required !== false ? <span className="ml-2 text-xs font-normal text-sea-200">Required</span> : null}
              {c.critical ? <span className="ml-2 text-xs font-normal text-coral-200">Critical</span> : null}
            </p>
            {c.help ? <p className="mt-0.5 text-sm text-ink-200">{c.help}</p> : null}
            {c.kind === "number" ? (
              <p className="mt-2 text-sm text-ink-200">
                A number{c.min !== null && c.min !== undefined ? ` from ${c.min}` : ""}
                {c.max !== null && c.max !== undefined ? ` up to ${c.max}` : ""}
              </p>
            ) : (
              <ul className="mt-2 space-y-1">
                {(c.levels ?? []).map((l, j) => (
                  <li key={j} className="flex gap-2 text-sm">
                    <kbd className="grid size-5 shrink-0 place-items-center rounded border border-ink-500 text-xs">{j + 1}</kbd>
                    <span>
                      <span className="font-semibold">{l.label || "—"}</span>
                      {l.fails ? <span className="ml-1 text-xs text-coral-200">(blocks credit)</span> : null}
                      {l.anchor ? <span className="block text-ink-200">{l.anchor}</span> : null}
                    </span>
                  </li>
                ))}
              </ul>
            )}
          </li>
        ))}
      </ol>
    </div>
  );
}
