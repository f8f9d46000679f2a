// Progress (the sonographer's own): how far each application is from the program's
// credentialing threshold, the CUSUM learning curve, per-criterion trends, accuracy against
// the reviewer and against confirmatory results, strengths and focus areas, and a download
// of "my credentialing report". Application, rolling-mean window and date range live in the
// address, so Back and a shared link keep them.
import { Link } from "react-router-dom";
import { useQuery } from "@tanstack/react-query";
import { Download, Mail } from "lucide-react";
import type { ApplicationProgress, Progress } from "../../../../shared/schemas/progress";
import { AccuracyTable } from "../components/accuracy-table";
import { CriterionTrends } from "../components/criterion-trends";
import { cusumSentence } from "../components/cusum-words";
import { LearningCurve } from "../components/learning-curve";
import { ProgressSummary, ThresholdStatus } from "../components/progress-summary";
import { StrengthsAndFocus } from "../components/strengths-and-focus";
import { useSearchState } from "../../../lib/use-search-state";
import { Button, buttonClasses } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { PageHeader } from "../../../components/ui/page-header";
import { ReportSection } from "../../../components/ui/report-section";
import { SelectField } from "../../../components/ui/select-field";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { TextField } from "../../../components/ui/text-field";
import { isIsoDay } from "../../../lib/date-range";
import { useReportDownload } from "../api/credentialing-report";
import { myProgressQuery } from "../api/progress";
import { rateText } from "../../../lib/stat-format";

const WINDOWS = [5, 10, 20] as const;

/** The application shown first: the one asked for, else the one with the most reviewed exams. */
function pickApplication(progress: Progress, wanted: string | null): ApplicationProgress | undefined {
  const asked = progress.applications.find((a) => a.application.code === wanted);
  if (asked) return asked;
  return [...progress.applications].sort((a, b) => b.reviewed - a.reviewed || b.submitted - a.submitted)[0];
}

function ReportDownload({ progress, from, to }: { progress: Progress; from?: string; to?: string }) {
  const { state, run } = useReportDownload();
  const busy = state.kind === "preparing" ? state.format : null;
  const error = state.kind === "failed" ? state.message : null;
  // My own id: without it, a person who is also a QA lead would get the whole program's report.
  const get = (format: "pdf" | "csv") => void run({ format, userId: progress.sonographer.id, from, to });
  return (
    <div className="flex flex-col items-end gap-2">
      <div className="flex flex-wrap gap-2">
        <Button onClick={() => get("pdf")} busy={busy === "pdf"}>
          {busy === "pdf" ? null : <Download aria-hidden="true" className="size-4" />}
          Download my credentialing report (PDF)
        </Button>
        <Button variant="secondary" onClick={() => get("csv")} busy={busy === "csv"} aria-label="Download my credentialing report as CSV">
          {busy === "csv" ? null : <Download aria-hidden="true" className="size-4" />}
          CSV
        </Button>
      </div>
      <FormMessage message={error} />
    </div>
  );
}

function FeedbackNudge({ progress }: { progress: Progress }) {
  if (progress.unreadFeedback === 0 && progress.unacknowledgedFeedback === 0) return null;
  const parts = [
    progress.unreadFeedback ? `${progress.unreadFeedback} unread` : null,
    progress.unacknowledgedFeedback ? `${progress.unacknowledgedFeedback} not yet acknowledged` : null,
  ].filter(Boolean);
  return (
    <p className="mb-6 flex flex-wrap items-center gap-2 rounded-lg border border-sea-200 bg-sea-50 px-4 py-3 text-sm text-sea-900">
      <Mail aria-hidden="true" className="size-4" />
      Feedback waiting: {parts.join(", ")}.
      <Link
        to={progress.unreadFeedback ? "/feedback?unread=1" : "/feedback?unacknowledged=1"}
        className="font-semibold text-sea-700 underline underline-offset-2"
      >
        Read it in Feedback
      </Link>
    </p>
  );
}

function ApplicationDetail({ app, progress }: { app: ApplicationProgress; progress: Progress }) {
  const name = app.application.name;
  return (
    <>
      <ReportSection
        title={`Learning curve — ${name}`}
        description="A CUSUM chart: it climbs with each reviewed exam that earned no credit and falls with each credited one; crossing a limit gives a signal."
      >
        <LearningCurve application={app} />
      </ReportSection>
      <ReportSection
        title={`Criterion trends — ${name}`}
        description={`How close each criterion of the rubric is to the level the program aims for, as a rolling mean over the last ${progress.window} exams.`}
      >
        <CriterionTrends application={app} window={progress.window} />
      </ReportSection>
      <ReportSection
        title={`Accuracy of your reads — ${name}`}
        description="Your read of each finding compared with the reviewer's final read and, separately, with later confirmatory results. Intervals are Wilson 95% intervals."
      >
        <AccuracyTable application={app} />
      </ReportSection>
    </>
  );
}

/** The application's credit rule as applied, and the counts it decides on. */
function CreditRuleNote({ app }: { app: ApplicationProgress }) {
  const s = app.creditedBySetting;
  return (
    <div className="mb-6 space-y-1 text-sm text-slate-700">
      <p>
        <span className="font-semibold text-ink-900">Credit rule: </span>
        {app.creditRuleText}
      </p>
      <p className="tabular-nums">
        Credited: {s.clinical} clinical, {s.educational} educational, {s.simulated} simulated · {app.positives} with a positive finding · {app.limited}{" "}
        technically limited · indeterminate reads {rateText(app.indeterminateRate)}
      </p>
    </div>
  );
}

export default function ProgressPage() {
  const [params, set] = useSearchState();
  const from = isIsoDay(params.get("from")) ? params.get("from")! : undefined;
  const to = isIsoDay(params.get("to")) ? params.get("to")! : undefined;
  const windowParam = Number(params.get("window"));
  const windowSize = (WINDOWS as readonly number[]).includes(windowParam) ? windowParam : 10;
  const badRange = !!from && !!to && from > to;
  const query = useQuery({ ...myProgressQuery({ from, to, window: windowSize }), enabled: !badRange });
  const progress = query.data;

  const app = progress ? pickApplication(progress, params.get("application")) : undefined;

  return (
    <div>
      <PageHeader
        title="Progress"
        description="How far you are from credentialing in each application, your learning curve, how your scores move criterion by criterion, and how accurate your reads are."
        actions={progress ? <ReportDownload progress={progress} from={from} to={to} /> : undefined}
      />

      <form
        role="search"
        aria-label="Choose what the progress shows"
        onSubmit={(e) => e.preventDefault()}
        className="mb-6 flex flex-wrap items-end gap-3 rounded-lg border border-slate-200 bg-white p-4"
      >
        <SelectField
          label="Application"
          compact
          className="w-60"
          value={app?.application.code ?? ""}
          disabled={!progress}
          onChange={(e) => set({ application: e.target.value })}
        >
          {(progress?.applications ?? []).map((a) => (
            <option key={a.application.code} value={a.application.code}>
              {a.application.name}
              {a.reviewed === 0 ? " (no reviewed exams)" : ` (${a.reviewed} reviewed)`}
            </option>
          ))}
        </SelectField>
        <SelectField
          label="Rolling mean over"
          compact
          className="w-40"
          value={String(windowSize)}
          onChange={(e) => set({ window: e.target.value === "10" ? undefined : e.target.value })}
        >
          {WINDOWS.map((w) => (
            <option key={w} value={w}>
              last {w} exams
            </option>
          ))}
        </SelectField>
        <TextField
          label="From"
          type="date"
          className="w-40"
          value={from ?? ""}
          max={to}
          onChange={(e) => set({ from: isIsoDay(e.target.value) ? e.target.value : undefined })}
        />
        <TextField
          label="To"
          type="date"
          className="w-40"
          value={to ?? ""}
          min={from}
          onChange={(e) => set({ to: isIsoDay(e.target.value) ? e.target.value : undefined })}
        />
        {from || to ? (
          <Button variant="ghost" size="sm" className="mb-1" onClick={() => set({ from: undefined, to: undefined })}>
            All dates
          </Button>
        ) : null}
        {query.isFetching && progress ? (
          <span role="status" className="pb-2 text-sm text-slate-600">
            Updating…
          </span>
        ) : null}
      </form>

      {badRange ? (
        <ErrorState title="Check the dates" error={new Error("The start of the range is after its end.")} />
      ) : query.isError ? (
        <ErrorState error={query.error} onRetry={() => void query.refetch()} retrying={query.isFetching} />
      ) : !progress ? (
        <LoadingState label="Loading your progress…" />
      ) : progress.total.submitted === 0 && progress.total.reviewed === 0 ? (
        <EmptyState
          title={from || to ? "No exams in this range" : "No exams submitted yet"}
          action={
            from || to ? (
              <Button variant="secondary" onClick={() => set({ from: undefined, to: undefined })}>
                Show all dates
              </Button>
            ) : (
              <Link to="/exams/new" className={buttonClasses("primary")}>
                Submit an exam
              </Link>
            )
          }
        >
          Your progress fills in as reviewers score the exams you submit.
        </EmptyState>
      ) : (
        <>
          <FeedbackNudge progress={progress} />
          <ReportSection
            title="Toward credentialing"
            description={`Credited exams per application against the program's threshold${from || to ? " (exams performed in the chosen dates)" : ""}.`}
          >
            <ProgressSummary progress={progress} />
          </ReportSection>

          <ReportSection title="Strengths and focus areas" description="Across all applications, from your most recent reviewed exams.">
            <StrengthsAndFocus strengths={progress.strengths} focusAreas={progress.focusAreas} window={progress.window} />
          </ReportSection>

          {app ? (
            <div className="rounded-lg border border-slate-200 bg-paper-50 p-4 sm:p-5">
              <div className="mb-6 flex flex-wrap items-center justify-between gap-3 border-b border-slate-200 pb-3">
                <h2 className="text-xl font-semibold text-ink-950">{app.application.name}</h2>
                <p className="flex flex-wrap items-center gap-x-4 gap-y-1 text-sm tabular-nums text-slate-700">
                  <span>
                    {app.counted} of {app.threshold} counted
                  </span>
                  <ThresholdStatus app={app} />
                  <span>{cusumSentence(app.cusum)}</span>
                </p>
              </div>
              <CreditRuleNote app={app} />
              <ApplicationDetail app={app} progress={progress} />
            </div>
          ) : null}
        </>
      )}
    </div>
  );
}
