// Oversight → Agreement: how consistently reviewers score, per criterion, over a date range
// and optionally one application; who agrees with whom, where values are confused, who
// drifts from consensus, and which exams disagree. Every filter lives in the URL.
import { useQuery } from "@tanstack/react-query";
import { PageHeader } from "../../../components/ui/page-header";
import { SelectField } from "../../../components/ui/select-field";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { TextField } from "../../../components/ui/text-field";
import { applicationsQuery } from "../../../lib/catalogue";
import { daysAgo, isIsoDay, isoDay } from "../../../lib/date-range";
import { agreementQuery, type AgreementFilters, type Person } from "../api/agreement";
import { BiasChart } from "../components/bias-chart";
import { ConfusionTable } from "../components/confusion-table";
import { CriteriaTable } from "../components/criteria-table";
import { DisagreementsTable } from "../components/disagreements-table";
import { PairHeatmap, type PairMeasure } from "../components/pair-heatmap";
import { useSearchState } from "../../../lib/use-search-state";

function useFilters() {
  // The range in effect goes into the URL with any change, so a shared link shows the same report.
  const [params, update] = useSearchState();
  const from = isIsoDay(params.get("from")) ? params.get("from")! : daysAgo(90);
  const to = isIsoDay(params.get("to")) ? params.get("to")! : isoDay(new Date());
  const filters: AgreementFilters = {
    from,
    to,
    application: params.get("application") ?? undefined,
    criterion: params.get("criterion") ?? undefined,
    reviewerA: params.get("reviewerA") ?? undefined,
    reviewerB: params.get("reviewerB") ?? undefined,
  };
  const measure: PairMeasure = params.get("measure") === "kappa" ? "kappa" : "percentAgreement";
  /** Sets (or with "" clears) URL parameters, keeping the others; history is replaced, not stacked. */
  const set = (changes: Record<string, string>) => update({ from, to, ...changes });
  return { filters, measure, set };
}

export default function AgreementPage() {
  const { filters, measure, set } = useFilters();
  const report = useQuery(agreementQuery(filters));
  const apps = useQuery(applicationsQuery);
  const data = report.data;
  const criterion = data?.criteria.find((c) => c.key === data.criterion);
  const criterionLabel = criterion?.label ?? data?.criterion ?? "";
  const stem = `agreement_${filters.from}_${filters.to}${filters.application ? `_${filters.application}` : ""}`;
  const reviewers: Person[] = data
    ? [...new Map(data.pairs.flatMap((p) => [p.a, p.b]).map((r) => [r.id, r])).values()].sort((x, y) => x.name.localeCompare(y.name))
    : [];
  const labelOf = (v: string | number | null) => {
    if (v === null) return "—";
    return data?.confusion.categories.find((c) => c.value === String(v))?.label ?? String(v);
  };
  const rangeInvalid = filters.from > filters.to;

  return (
    <div>
      <PageHeader
        eyebrow="Oversight"
        title="Agreement"
        description="How consistently reviewers score the same exams, from every exam read twice or more in the range (first and second reads alike)."
      />
      <form
        role="search"
        aria-label="Filter the agreement report"
        onSubmit={(e) => e.preventDefault()}
        className="mb-6 flex flex-wrap items-end gap-3 rounded-lg border border-slate-200 bg-white p-4"
      >
        <TextField
          label="From"
          type="date"
          className="w-40"
          value={filters.from}
          max={filters.to}
          onChange={(e) => isIsoDay(e.target.value) && set({ from: e.target.value })}
        />
        <TextField
          label="To"
          type="date"
          className="w-40"
          value={filters.to}
          min={filters.from}
          onChange={(e) => isIsoDay(e.target.value) && set({ to: e.target.value })}
        />
        <SelectField label="Application" compact className="w-52" value={filters.application ?? ""} onChange={(e) => set({ application: e.target.value })}>
          <option value="">All applications</option>
          {apps.data?.applications.map((a) => (
            <option key={a.code} value={a.code}>
              {a.name}
            </option>
          ))}
        </SelectField>
        <SelectField
          label="Criterion"
          hint="For pairs, confusion, bias and disagreements"
          compact
          className="w-64"
          value={data?.criterion ?? filters.criterion ?? ""}
          onChange={(e) => set({ criterion: e.target.value })}
          disabled={!data}
        >
          {data?.criteria.map((c) => (
            <option key={c.key} value={c.key}>
              {c.label}
            </option>
          )) ?? <option value="">—</option>}
        </SelectField>
        {report.isFetching && data ? (
          <span role="status" className="pb-2 text-sm text-slate-600">
            Updating…
          </span>
        ) : null}
      </form>

      {rangeInvalid ? (
        <ErrorState title="Check the dates" error={new Error("The start of the range is after its end.")} />
      ) : report.isError ? (
        <ErrorState error={report.error} onRetry={() => void report.refetch()} retrying={report.isFetching} />
      ) : !data ? (
        <LoadingState label="Computing agreement…" />
      ) : data.criteria.every((c) => c.units === 0) ? (
        <EmptyState title="No double reads in this range yet">
          Agreement needs exams read by two reviewers. Widen the dates, choose another application, or raise the share of exams read twice in Program settings.
        </EmptyState>
      ) : (
        <>
          <CriteriaTable criteria={data.criteria} filename={`${stem}_criteria.csv`} />
          <PairHeatmap
            pairs={data.pairs}
            measure={measure}
            onMeasureChange={(m) => set({ measure: m === "kappa" ? "kappa" : "" })}
            criterionLabel={criterionLabel}
            filename={`${stem}_${data.criterion}_pairs.csv`}
          />
          <ConfusionTable
            confusion={data.confusion}
            criterionLabel={criterionLabel}
            filename={`${stem}_${data.criterion}_confusion.csv`}
            controls={
              <div className="mb-3 flex flex-wrap items-end gap-3">
                <SelectField
                  label="Rows: reviewer"
                  compact
                  className="w-56"
                  value={filters.reviewerA ?? ""}
                  onChange={(e) => set({ reviewerA: e.target.value })}
                >
                  <option value="">First read (anyone)</option>
                  {reviewers.map((r) => (
                    <option key={r.id} value={r.id} disabled={r.id === filters.reviewerB}>
                      {r.name}
                    </option>
                  ))}
                </SelectField>
                <SelectField
                  label="Columns: reviewer"
                  compact
                  className="w-56"
                  value={filters.reviewerB ?? ""}
                  onChange={(e) => set({ reviewerB: e.target.value })}
                >
                  <option value="">Second read (anyone)</option>
                  {reviewers.map((r) => (
                    <option key={r.id} value={r.id} disabled={r.id === filters.reviewerA}>
                      {r.name}
                    </option>
                  ))}
                </SelectField>
                {filters.reviewerA && !filters.reviewerB ? (
                  <p className="pb-1 text-sm text-slate-600">Choose the second reviewer too to compare the pair.</p>
                ) : null}
              </div>
            }
          />
          <BiasChart bias={data.bias} criterionLabel={criterionLabel} filename={`${stem}_${data.criterion}_bias.csv`} />
          <DisagreementsTable
            rows={data.disagreements}
            criterionLabel={criterionLabel}
            filename={`${stem}_${data.criterion}_disagreements.csv`}
            labelOf={labelOf}
          />
        </>
      )}
    </div>
  );
}
