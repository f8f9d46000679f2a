// The cautions of an exam's application version (Setup → Applications), shown where the
// exam is read: the exam page, the feedback page and the scoring workspace.
import { TriangleAlert } from "lucide-react";

export function ApplicationCautions({ cautions, compact = false }: { cautions: string[]; compact?: boolean }) {
  if (cautions.length === 0) return null;
  return (
    <aside
      aria-label="Cautions for this application"
      className={"rounded-md border border-sand-300 bg-sand-50 text-ink-900 " + (compact ? "px-2.5 py-1.5 text-xs" : "px-4 py-3 text-sm")}
    >
      <p className="flex items-center gap-1.5 font-semibold text-sand-900">
        <TriangleAlert aria-hidden="true" className={compact ? "size-3.5" : "size-4"} />
        Cautions for this application
      </p>
      <ul className="mt-1 list-disc space-y-0.5 pl-5">
        {cautions.map((c) => (
          <li key={c}>{c}</li>
        ))}
      </ul>
    </aside>
  );
}
