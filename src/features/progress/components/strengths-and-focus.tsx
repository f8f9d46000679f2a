// Strengths and focus areas: the criteria a learner meets most reliably and the weakest
// ones, each with its mean attainment over the recent exams and, for focus areas, the
// criterion's help text and the program's advice snippets.
import { useId } from "react";
import { Sparkles, Target } from "lucide-react";
import type { CriterionStanding } from "../../../../shared/schemas/progress";
import { EmptyState } from "../../../components/ui/states";
import { percent } from "../../../lib/stat-format";

function Standing({ s, showAdvice }: { s: CriterionStanding; showAdvice: boolean }) {
  return (
    <li className="rounded-md border border-slate-200 bg-white px-3 py-2">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <span className="font-semibold text-ink-900">{s.label}</span>
        <span className="text-sm tabular-nums text-slate-700">
          {percent(s.mean)} over {s.exams} {s.exams === 1 ? "exam" : "exams"}
        </span>
      </div>
      {showAdvice && s.advice.length > 0 ? (
        <ul className="mt-1 list-disc space-y-0.5 pl-5 text-sm text-slate-700">
          {s.advice.map((a) => (
            <li key={a}>{a}</li>
          ))}
        </ul>
      ) : null}
    </li>
  );
}

/** The strongest and weakest criteria side by side; focus areas carry their advice lines. */
export function StrengthsAndFocus({ strengths, focusAreas, window }: { strengths: CriterionStanding[]; focusAreas: CriterionStanding[]; window?: number }) {
  const id = useId();
  if (strengths.length === 0 && focusAreas.length === 0)
    return <EmptyState title="No reviewed exams yet">Strengths and focus areas appear once reviewers have scored a few exams.</EmptyState>;
  const over = window ? ` (mean over the last ${window} reviewed exams)` : "";
  return (
    <div className="grid gap-4 md:grid-cols-2">
      <section aria-labelledby={`${id}-focus`}>
        <h3 id={`${id}-focus`} className="mb-2 flex items-center gap-1.5 font-semibold text-ink-950">
          <Target aria-hidden="true" className="size-4 text-coral-700" />
          Focus areas
        </h3>
        <p className="mb-2 text-xs text-slate-600">The criteria furthest from the level the program aims for{over}, with advice.</p>
        {focusAreas.length === 0 ? (
          <p className="text-sm text-slate-700">Nothing stands out: every criterion is close to the level aimed for.</p>
        ) : (
          <ul className="space-y-2">
            {focusAreas.map((s) => (
              <Standing key={s.criterionKey} s={s} showAdvice />
            ))}
          </ul>
        )}
      </section>
      <section aria-labelledby={`${id}-strengths`}>
        <h3 id={`${id}-strengths`} className="mb-2 flex items-center gap-1.5 font-semibold text-ink-950">
          <Sparkles aria-hidden="true" className="size-4 text-sea-700" />
          Strengths
        </h3>
        <p className="mb-2 text-xs text-slate-600">The criteria met most reliably{over}.</p>
        {strengths.length === 0 ? (
          <p className="text-sm text-slate-700">None yet — strengths show once a criterion is mostly at the level aimed for.</p>
        ) : (
          <ul className="space-y-2">
            {strengths.map((s) => (
              <Standing key={s.criterionKey} s={s} showAdvice={false} />
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
