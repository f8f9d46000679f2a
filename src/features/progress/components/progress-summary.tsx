// Progress toward credentialing: the totals and, per application, credited exams against
// the program's threshold (with the threshold marked on the bar), reviewed and submitted
// exams, and whether the threshold is met — in an icon and a word, not colour alone.
// Presentational: the learner's Progress screen and the QA lead's page of a sonographer
// both pass in what GET …/progress answered.
import { CircleCheck, Hourglass } from "lucide-react";
import type { ApplicationProgress, Progress } from "../../../../shared/schemas/progress";
import { tableClasses as t } from "../../../components/ui/report-section";
import { EmptyState } from "../../../components/ui/states";
import { formatDate } from "../../../lib/format";
import { percent } from "../../../lib/stat-format";
import { ThresholdBar } from "./threshold-bar";

function Figure({ label, value, detail }: { label: string; value: string; detail?: string }) {
  return (
    <div className="rounded-lg border border-slate-200 bg-white px-4 py-3">
      <dt className="text-sm text-slate-600">{label}</dt>
      <dd className="text-2xl font-semibold tabular-nums text-ink-950">{value}</dd>
      {detail ? <dd className="text-xs text-slate-600">{detail}</dd> : null}
    </div>
  );
}

/** Met, or how many credited exams are still needed, as an icon with words. */
/** Met, or what is still missing: counted exams, or credited exams with a positive finding. */
export function ThresholdStatus({ app }: { app: Pick<ApplicationProgress, "met" | "remaining" | "positives" | "creditRule"> }) {
  const { met, remaining } = app;
  const positivesMissing = Math.max(0, app.creditRule.minPositive - app.positives);
  return met ? (
    <span className="inline-flex items-center gap-1 font-semibold text-sea-800">
      <CircleCheck aria-hidden="true" className="size-4" />
      Met
    </span>
  ) : (
    <span className="inline-flex items-center gap-1 text-slate-700">
      <Hourglass aria-hidden="true" className="size-4" />
      {remaining > 0 ? `${remaining} more needed` : null}
      {remaining > 0 && positivesMissing > 0 ? "; " : null}
      {positivesMissing > 0 ? `${positivesMissing} more with a positive finding` : null}
    </span>
  );
}

/** Totals and per-application progress toward the credentialing threshold. */
export function ProgressSummary({ progress }: { progress: Progress }) {
  const { total, applications } = progress;
  // Applications without a single exam would fill the table with zeros: they are named in one line beneath it.
  const active = applications.filter((a) => a.submitted > 0 || a.reviewed > 0);
  const notStarted = applications.filter((a) => a.submitted === 0 && a.reviewed === 0);
  return (
    <div className="space-y-4">
      <dl className="grid grid-cols-2 gap-3 md:grid-cols-4">
        <Figure label="Applications met" value={`${total.applicationsMet} of ${total.applications}`} />
        <Figure
          label="Credited exams"
          value={String(total.credited)}
          detail={`${percent(total.reviewed ? total.credited / total.reviewed : null)} of reviewed`}
        />
        <Figure label="Reviewed exams" value={String(total.reviewed)} />
        <Figure
          label="Submitted exams"
          value={String(total.submitted)}
          detail={progress.lastActivityAt ? `Last submitted ${formatDate(progress.lastActivityAt)}` : undefined}
        />
      </dl>
      {active.length === 0 ? (
        <EmptyState title="No reviewed exams yet">
          Submit exams for review: each one a reviewer credits counts toward the program&rsquo;s threshold of {progress.settings.threshold} per application.
        </EmptyState>
      ) : (
        <div className={t.wrap}>
          <table className={t.table}>
            <caption className="sr-only">Credited exams against the credentialing threshold, per application</caption>
            <thead className={t.thead}>
              <tr>
                <th scope="col" className={t.th}>
                  Application
                </th>
                <th scope="col" className={`${t.th} w-1/3`}>
                  Credited of threshold
                </th>
                <th scope="col" className={t.thNum}>
                  Reviewed
                </th>
                <th scope="col" className={t.thNum}>
                  Submitted
                </th>
                <th scope="col" className={t.th}>
                  Threshold
                </th>
              </tr>
            </thead>
            <tbody className={t.tbody}>
              {active.map((a) => (
                <tr key={a.application.code}>
                  <th scope="row" className="px-3 py-2 font-semibold text-ink-900">
                    {a.application.name}
                  </th>
                  <td className="px-3 py-2">
                    <ThresholdBar credited={a.counted} threshold={a.threshold} label={`${a.application.name}: credited exams counted toward the threshold`} />
                    <span className="sr-only">
                      {a.counted} of {a.threshold}
                    </span>
                  </td>
                  <td className={t.tdNum}>{a.reviewed}</td>
                  <td className={t.tdNum}>{a.submitted}</td>
                  <td className="px-3 py-2 text-sm">
                    <ThresholdStatus app={a} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {active.length > 0 && notStarted.length > 0 ? (
        <p className="text-sm text-slate-700">
          <span className="font-semibold">No exams yet in:</span> {notStarted.map((a) => a.application.name).join(", ")}
          <span className="text-slate-600"> (0 of {notStarted[0].threshold} credited each)</span>.
        </p>
      ) : null}
      <p className="text-xs text-slate-600">
        An exam counts toward the threshold when its final review gives it credentialing credit (overall image quality at least{" "}
        {progress.settings.minQualityForCredit}, no critical criterion at a failing level, and no clinically significant disagreement in the reads).
      </p>
    </div>
  );
}
