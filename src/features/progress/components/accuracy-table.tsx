// Accuracy of the sonographer's reads for one application: sensitivity, specificity, PPV and
// NPV with Wilson 95% intervals (written out and drawn as whiskers) and the counts behind
// them — once against the reviewer's final read and, separately, against confirmatory
// results (CT, formal echo, surgery, clinical follow-up), with how many came by each method.
import type { Accuracy, ApplicationProgress, ConfirmationMethod, Rate } from "../../../../shared/schemas/progress";
import { CONFIRMATION_METHOD_LABELS, CONFIRMATION_METHODS } from "../../../../shared/schemas/progress";
import { tableClasses as t } from "../../../components/ui/report-section";
import { rateCount, rateText } from "../../../lib/stat-format";

const MEASURES: { key: "sensitivity" | "specificity" | "ppv" | "npv"; name: string; meaning: string }[] = [
  { key: "sensitivity", name: "Sensitivity", meaning: "Of findings that were present, the share read as positive" },
  { key: "specificity", name: "Specificity", meaning: "Of findings that were absent, the share read as negative" },
  { key: "ppv", name: "Positive predictive value (PPV)", meaning: "Of the positive reads, the share that were present" },
  { key: "npv", name: "Negative predictive value (NPV)", meaning: "Of the negative reads, the share that were absent" },
];

/** A 0–100 % track with the interval as a whisker and the value as a dot (decoration: the text carries the figures). */
function Whisker({ r }: { r: Rate }) {
  if (r.value === null) return null;
  const x = (v: number) => 4 + v * 112;
  return (
    <svg aria-hidden="true" width="120" height="14" viewBox="0 0 120 14" className="inline-block align-middle">
      <line x1={x(0)} y1="7" x2={x(1)} y2="7" stroke="#e9edf0" strokeWidth="2" />
      <line x1={x(0)} y1="3" x2={x(0)} y2="11" stroke="#bcc5cd" />
      <line x1={x(1)} y1="3" x2={x(1)} y2="11" stroke="#bcc5cd" />
      <line x1={x(r.ci95[0])} y1="7" x2={x(r.ci95[1])} y2="7" stroke="#324d66" strokeWidth="1.5" />
      <line x1={x(r.ci95[0])} y1="3.5" x2={x(r.ci95[0])} y2="10.5" stroke="#324d66" strokeWidth="1.5" />
      <line x1={x(r.ci95[1])} y1="3.5" x2={x(r.ci95[1])} y2="10.5" stroke="#324d66" strokeWidth="1.5" />
      <circle cx={x(r.value)} cy="7" r="3.5" fill="#0072B2" stroke="#1a2c3d" strokeWidth="0.75" />
    </svg>
  );
}

function counted(a: Accuracy): number {
  return a.tp + a.fp + a.tn + a.fn;
}

/** One reference's accuracy as a table of the four measures with the 2×2 counts beneath. */
export function AccuracyBlock({ title, accuracy, empty, note }: { title: string; accuracy: Accuracy; empty: string; note?: string }) {
  const n = counted(accuracy);
  return (
    <div className="space-y-2">
      <h3 className="font-semibold text-ink-950">{title}</h3>
      {n === 0 ? (
        <p className="rounded-lg border border-dashed border-slate-300 bg-white px-4 py-3 text-sm text-slate-600">
          {empty}
          {accuracy.indeterminate > 0 ? ` (${accuracy.indeterminate} indeterminate ${accuracy.indeterminate === 1 ? "read" : "reads"} left out.)` : ""}
        </p>
      ) : (
        <>
          <div className={t.wrap}>
            <table className={t.table}>
              <caption className="sr-only">{title}: four accuracy measures with 95% intervals</caption>
              <thead className={t.thead}>
                <tr>
                  <th scope="col" className={t.th}>
                    Measure
                  </th>
                  <th scope="col" className={t.thNum}>
                    Value (95% interval)
                  </th>
                  <th scope="col" className={t.th}>
                    <span className="sr-only">Interval drawn from 0 to 100%</span>
                    <span aria-hidden="true">0 – 100%</span>
                  </th>
                  <th scope="col" className={t.thNum}>
                    Counted
                  </th>
                </tr>
              </thead>
              <tbody className={t.tbody}>
                {MEASURES.map((m) => {
                  const r = accuracy[m.key];
                  return (
                    <tr key={m.key}>
                      <th scope="row" className="px-3 py-2 text-left">
                        <span className="font-semibold text-ink-900">{m.name}</span>
                        <span className="block text-xs font-normal text-slate-600">{m.meaning}</span>
                      </th>
                      <td className={`${t.tdNum} whitespace-nowrap`}>{rateText(r)}</td>
                      <td className="px-3 py-2">
                        <Whisker r={r} />
                      </td>
                      <td className={`${t.tdNum} whitespace-nowrap`}>{rateCount(r)}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
          <p className="text-sm tabular-nums text-slate-700">
            {n} {n === 1 ? "finding" : "findings"} compared: {accuracy.tp} true positive, {accuracy.fp} false positive, {accuracy.tn} true negative,{" "}
            {accuracy.fn} false negative
            {accuracy.indeterminate > 0 ? `; ${accuracy.indeterminate} indeterminate left out` : ""}.
          </p>
        </>
      )}
      {note ? <p className="text-xs text-slate-600">{note}</p> : null}
    </div>
  );
}

/** Accuracy against the reviewer's final read and, separately, against confirmatory results. */
export function AccuracyTable({ application }: { application: ApplicationProgress }) {
  const conf = application.accuracyVsConfirmatory;
  const methods = CONFIRMATION_METHODS.filter((m) => (conf.byMethod[m] ?? 0) > 0);
  const byMethod = methods.map((m: ConfirmationMethod) => `${CONFIRMATION_METHOD_LABELS[m]} ${conf.byMethod[m]}`).join(" · ");
  return (
    <div className="space-y-6">
      <AccuracyBlock
        title="Against the reviewer’s final read"
        accuracy={application.accuracyVsReviewer}
        empty="No reviewed exams yet."
        note="The reviewer’s final read of each finding (after adjudication where two reads differed) is taken as the reference."
      />
      <div className="space-y-2">
        <AccuracyBlock
          title="Against confirmatory results"
          accuracy={conf}
          empty="No confirmatory results entered yet. Add them on an exam’s page once CT, a formal echo, surgery or follow-up has shown the answer."
          note="The result of the later test is taken as the reference for the finding; it is compared with the clinician’s own read."
        />
        <p className="text-sm text-slate-700">
          <span className="font-semibold">Confirmed by method:</span> {methods.length ? byMethod : "none yet"}
          {conf.byMethod.none ? <span className="text-slate-600"> (“None” means no confirmatory test was done; those findings are left out.)</span> : null}
        </p>
      </div>
    </div>
  );
}
