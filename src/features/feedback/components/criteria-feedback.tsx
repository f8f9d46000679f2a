// Every criterion of the feedback: its label, the chosen level's label and anchor text, and
// next steps where the level was not the one the program aims for.
import { CircleAlert, CircleCheck, Circle } from "lucide-react";
import type { FeedbackCriterion } from "../api/feedback";

function LevelMark({ level }: { level: FeedbackCriterion["level"] }) {
  if (!level) return <span className="text-slate-600">Not scored</span>;
  if (level.fails)
    return (
      <span className="inline-flex items-center gap-1 font-semibold text-coral-700">
        <CircleAlert aria-hidden="true" className="size-4" />
        Blocks credit
      </span>
    );
  if (level.ideal)
    return (
      <span className="inline-flex items-center gap-1 font-semibold text-sea-700">
        <CircleCheck aria-hidden="true" className="size-4" />
        On target
      </span>
    );
  return (
    <span className="inline-flex items-center gap-1 text-sand-800">
      <Circle aria-hidden="true" className="size-4" />
      Room to improve
    </span>
  );
}

export function CriteriaFeedback({ criteria }: { criteria: FeedbackCriterion[] }) {
  if (criteria.length === 0) return <p className="text-sm text-slate-600">No criteria were scored.</p>;
  return (
    <ol className="divide-y divide-slate-100">
      {criteria.map((c) => (
        <li key={c.key} className="py-3 first:pt-0 last:pb-0">
          <div className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1">
            <h3 className="font-semibold text-ink-950">{c.label}</h3>
            <LevelMark level={c.level} />
          </div>
          <p className="mt-1 text-sm text-ink-900">
            <span className="text-slate-600">Scored: </span>
            <span className="font-semibold">{c.level?.label ?? (c.value === null ? "—" : String(c.value))}</span>
          </p>
          {c.level?.anchor ? <p className="mt-1 border-l-2 border-slate-200 pl-3 text-sm text-slate-700">{c.level.anchor}</p> : null}
          {c.nextSteps.length > 0 ? (
            <div className="mt-2 rounded-md bg-sand-50 px-3 py-2 text-sm">
              <p className="font-semibold text-sand-900">Next steps</p>
              <ul className="mt-1 list-disc space-y-0.5 pl-5 text-ink-900">
                {c.nextSteps.map((s, i) => (
                  <li key={i}>{s}</li>
                ))}
              </ul>
            </div>
          ) : null}
        </li>
      ))}
    </ol>
  );
}
