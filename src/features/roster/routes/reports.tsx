// Oversight → Reports: the credentialing report as a file, for the whole program or one
// sonographer, over a date range, as PDF (to sign and file) or CSV (for spreadsheets). The
// choices live in the URL, so the roster and a sonographer's page can link straight here.
import { useState } from "react";
import { useQuery } from "@tanstack/react-query";
import { Download } from "lucide-react";
import { useSearchParams } from "react-router-dom";
import { CREDENTIALING_CAUTION } from "../../../../shared/schemas/progress";
import { Button } from "../../../components/ui/button";
import { PageHeader } from "../../../components/ui/page-header";
import { SelectField } from "../../../components/ui/select-field";
import { ErrorState } from "../../../components/ui/states";
import { TextField } from "../../../components/ui/text-field";
import { daysAgo, isIsoDay, isoDay } from "../../../lib/date-range";
import { useReportDownload, type ReportFormat } from "../../progress";
import { rosterQuery } from "../api/roster";
import { DownloadStatus } from "../components/report-download";

const RANGES = [
  { label: "Last 90 days", days: 90 },
  { label: "Last 12 months", days: 365 },
] as const;

function Choice({
  name,
  value,
  checked,
  onChange,
  label,
  hint,
}: {
  name: string;
  value: string;
  checked: boolean;
  onChange: () => void;
  label: string;
  hint: string;
}) {
  const id = `${name}-${value}`;
  return (
    <div className="flex items-start gap-2">
      <input
        id={id}
        type="radio"
        name={name}
        value={value}
        checked={checked}
        onChange={onChange}
        aria-describedby={`${id}-hint`}
        className="mt-1 size-4 accent-sea-600"
      />
      <div>
        <label htmlFor={id} className="text-sm font-semibold text-ink-900">
          {label}
        </label>
        <p id={`${id}-hint`} className="text-sm text-slate-600">
          {hint}
        </p>
      </div>
    </div>
  );
}

interface Choices {
  scope: "program" | "sonographer";
  userId: string;
  /** "" = no limit on that side. */
  from: string;
  to: string;
  format: ReportFormat;
}

function choicesFrom(params: URLSearchParams): Choices {
  const userId = params.get("userId") ?? "";
  const day = (k: string, fallback: string) => (params.has(k) ? (isIsoDay(params.get(k)) ? params.get(k)! : "") : fallback);
  return {
    scope: params.get("scope") === "sonographer" || userId ? "sonographer" : "program",
    userId,
    // Empty dates mean "no limit"; the first visit starts with the last twelve months.
    from: day("from", daysAgo(365)),
    to: day("to", isoDay(new Date())),
    format: params.get("format") === "csv" ? "csv" : "pdf",
  };
}

export default function ReportsPage() {
  const [params, setParams] = useSearchParams();
  // The choices are held here so the controls answer at once, and copied into the URL so a
  // link (from the roster or a sonographer's page) asks for the same report.
  const [choices, setChoices] = useState(() => choicesFrom(params));
  const { scope, userId, from, to, format } = choices;
  const roster = useQuery({ ...rosterQuery, enabled: scope === "sonographer" });
  const { state, run, busy } = useReportDownload();

  const set = (changes: Partial<Choices>) => {
    const next = { ...choices, ...changes };
    if (next.scope === "program") next.userId = "";
    setChoices(next);
    const url = new URLSearchParams();
    if (next.scope === "sonographer") url.set("scope", "sonographer");
    if (next.userId) url.set("userId", next.userId);
    url.set("from", next.from);
    url.set("to", next.to);
    if (next.format === "csv") url.set("format", "csv");
    setParams(url, { replace: true });
  };

  const rangeProblem = from && to && from > to ? "The start of the range is after its end." : null;
  const scopeProblem = scope === "sonographer" && !userId ? "Choose a clinician." : null;
  const people = roster.data ? [...roster.data].sort((a, b) => a.name.localeCompare(b.name)) : [];
  const chosen = people.find((p) => p.id === userId);
  // Problems show after a first try to download, and each goes away once fixed.
  const [showProblems, setShowProblems] = useState(false);

  const submit = (e: React.FormEvent) => {
    e.preventDefault();
    if (rangeProblem || scopeProblem) {
      setShowProblems(true);
      return;
    }
    void run({ format, userId: scope === "sonographer" ? userId : undefined, from: from || undefined, to: to || undefined });
  };

  return (
    <div className="max-w-3xl">
      <PageHeader
        eyebrow="Oversight"
        title="Reports"
        description="The credentialing report: counts per application against the threshold, image quality, accuracy with 95% intervals, the learning-curve result and a signature line for the program director."
      />
      <form onSubmit={submit} noValidate aria-label="Credentialing report" className="space-y-6">
        <fieldset className="space-y-3 rounded-lg border border-slate-200 bg-white p-5">
          <legend className="px-1 text-lg font-semibold text-ink-950">Who</legend>
          <Choice
            name="scope"
            value="program"
            checked={scope === "program"}
            onChange={() => set({ scope: "program" })}
            label="Whole program"
            hint="A summary of the program, then a section for each clinician."
          />
          <Choice
            name="scope"
            value="sonographer"
            checked={scope === "sonographer"}
            onChange={() => set({ scope: "sonographer" })}
            label="One clinician"
            hint="The clinician's own section, to file with a request for privileges."
          />
          {scope === "sonographer" ? (
            roster.isError ? (
              <ErrorState title="The clinicians could not be loaded" error={roster.error} onRetry={() => void roster.refetch()} retrying={roster.isFetching} />
            ) : (
              <SelectField
                label="Clinician"
                className="max-w-sm pl-6"
                value={userId}
                disabled={!roster.data}
                error={showProblems && scopeProblem ? scopeProblem : undefined}
                hint={!roster.data ? "Loading the clinicians…" : people.length === 0 ? "No clinician in this program yet." : undefined}
                onChange={(e) => set({ userId: e.target.value })}
              >
                <option value="">Choose…</option>
                {people.map((p) => (
                  <option key={p.id} value={p.id}>
                    {p.name}
                  </option>
                ))}
                {userId && roster.data && !chosen ? <option value={userId}>Unknown clinician</option> : null}
              </SelectField>
            )
          ) : null}
        </fieldset>

        <fieldset className="space-y-3 rounded-lg border border-slate-200 bg-white p-5">
          <legend className="px-1 text-lg font-semibold text-ink-950">Dates</legend>
          <p className="text-sm text-slate-600">Exams performed in this range count. Leave a date empty for no limit on that side.</p>
          <div className="flex flex-wrap items-end gap-3">
            <TextField label="From" type="date" className="w-44" value={from} max={to || undefined} onChange={(e) => set({ from: e.target.value })} />
            <TextField
              label="To"
              type="date"
              className="w-44"
              value={to}
              min={from || undefined}
              error={showProblems && rangeProblem ? rangeProblem : undefined}
              onChange={(e) => set({ to: e.target.value })}
            />
            <div className="flex flex-wrap gap-2 pb-1">
              {RANGES.map((r) => (
                <Button key={r.days} variant="ghost" size="sm" onClick={() => set({ from: daysAgo(r.days), to: isoDay(new Date()) })}>
                  {r.label}
                </Button>
              ))}
              <Button variant="ghost" size="sm" onClick={() => set({ from: "", to: "" })}>
                All dates
              </Button>
            </div>
          </div>
        </fieldset>

        <fieldset className="space-y-3 rounded-lg border border-slate-200 bg-white p-5">
          <legend className="px-1 text-lg font-semibold text-ink-950">Format</legend>
          <Choice name="format" value="pdf" checked={format === "pdf"} onChange={() => set({ format: "pdf" })} label="PDF" hint="To print, sign and file." />
          <Choice
            name="format"
            value="csv"
            checked={format === "csv"}
            onChange={() => set({ format: "csv" })}
            label="CSV"
            hint="One row per clinician and application, for spreadsheets; proportions from 0 to 1."
          />
        </fieldset>

        <div>
          <Button type="submit" busy={busy}>
            {busy ? null : <Download aria-hidden="true" className="size-4" />}
            Download
          </Button>
          <DownloadStatus state={state} />
        </div>
      </form>
      <p className="mt-8 max-w-prose text-xs text-slate-600">Every report is printed with this caution: {CREDENTIALING_CAUTION}</p>
    </div>
  );
}
