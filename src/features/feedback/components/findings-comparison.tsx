// The sonographer's read of each finding against the reference read, with the outcome in
// words ("False negative") and agreement marked by an icon and a word, never colour alone.
import { CircleAlert, CircleCheck, CircleHelp } from "lucide-react";
import { READ_LABELS } from "../../../lib/catalogue";
import { OUTCOME_WORDS, type Feedback } from "../api/feedback";

export function FindingsComparison({ findings }: { findings: Feedback["findings"] }) {
  if (findings.length === 0) return <p className="text-sm text-slate-600">This application asks about no findings.</p>;
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left text-sm">
        <caption className="sr-only">Your read of each finding against the reference read</caption>
        <thead className="border-b border-slate-200 text-xs uppercase tracking-wide text-slate-700">
          <tr>
            <th scope="col" className="py-2 pr-3 font-semibold">
              Finding
            </th>
            <th scope="col" className="px-3 py-2 font-semibold">
              Your read
            </th>
            <th scope="col" className="px-3 py-2 font-semibold">
              Reference read
            </th>
            <th scope="col" className="px-3 py-2 font-semibold">
              Result
            </th>
          </tr>
        </thead>
        <tbody className="divide-y divide-slate-100">
          {findings.map((f) => {
            const agrees = f.yourRead === f.referenceRead;
            return (
              <tr key={f.key}>
                <th scope="row" className="py-2 pr-3 font-normal text-ink-900">
                  {f.label}
                </th>
                <td className="px-3 py-2 font-semibold text-ink-950">{READ_LABELS[f.yourRead]}</td>
                <td className="px-3 py-2 font-semibold text-ink-950">{READ_LABELS[f.referenceRead]}</td>
                <td className="px-3 py-2">
                  {agrees ? (
                    <span className="inline-flex items-center gap-1 text-sea-800">
                      <CircleCheck aria-hidden="true" className="size-4" />
                      Agree · {OUTCOME_WORDS[f.outcome]}
                    </span>
                  ) : f.outcome === "indeterminate" ? (
                    <span className="inline-flex items-center gap-1 text-slate-700">
                      <CircleHelp aria-hidden="true" className="size-4" />
                      Differs · {OUTCOME_WORDS[f.outcome]}
                    </span>
                  ) : (
                    <span className="inline-flex items-center gap-1 font-semibold text-coral-700">
                      <CircleAlert aria-hidden="true" className="size-4" />
                      Differs · {OUTCOME_WORDS[f.outcome]}
                    </span>
                  )}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
