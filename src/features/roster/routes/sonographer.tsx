// Oversight → Roster → one sonographer: what the learner sees on their Progress screen
// (thresholds, learning curves, trends, strengths and focus areas, accuracy) plus every
// reviewed exam with the reviewers named, and this sonographer's credentialing report.
// The range, rolling window and application live in the URL.
import { useQuery } from "@tanstack/react-query";
import { ArrowLeft } from "lucide-react";
import { Link, useParams } from "react-router-dom";
import type { ApplicationProgress, Progress } from "../../../../shared/schemas/progress";
import { AccuracyTable, CriterionTrends, LearningCurve, ProgressSummary, StrengthsAndFocus } from "../../progress";
import { buttonClasses } from "../../../components/ui/button";
import { PageHeader } from "../../../components/ui/page-header";
import { ReportSection } from "../../../components/ui/report-section";
import { SelectField } from "../../../components/ui/select-field";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { TextField } from "../../../components/ui/text-field";
import { isApiError } from "../../../lib/api-errors";
import { isIsoDay } from "../../../lib/date-range";
import { formatDate } from "../../../lib/format";
import { useSearchState } from "../../../lib/use-search-state";
import { sonographerFeedbackQuery, sonographerProgressQuery } from "../api/roster";
import { ReportButtons } from "../components/report-download";
import { ReviewedExams } from "../components/reviewed-exams";
import { SignalTag } from "../components/progress-marks";

const WINDOWS = [5, 10, 20] as const;

function useView() {
  const [params, update] = useSearchState();
  const from = isIsoDay(params.get("from")) ? params.get("from")! : "";
  const to = isIsoDay(params.get("to")) ? params.get("to")! : "";
  const w = Number(params.get("window"));
  const window = (WINDOWS as readonly number[]).includes(w) ? w : 10;
  const app = params.get("app") ?? "";
  const set = (k: "from" | "to" | "window" | "app", v: string) => update({ [k]: v });
  return { from, to, window, app, set };
}

/** The application shown in detail: the chosen one, else the first with reviewed exams, else the first. */
function pick(progress: Progress, code: string): ApplicationProgress | undefined {
  return progress.applications.find((a) => a.application.code === code) ?? progress.applications.find((a) => a.reviewed > 0) ?? progress.applications[0];
}

function ApplicationDetail({ progress, code, window, onPick }: { progress: Progress; code: string; window: number; onPick: (code: string) => void }) {
  const app = pick(progress, code);
  if (!app) return <EmptyState title="No application in this program yet">Add applications under Setup → Applications.</EmptyState>;
  return (
    <>
      <div className="mb-4 flex flex-wrap items-end gap-3">
        <SelectField label="Application" className="w-72" value={app.application.code} onChange={(e) => onPick(e.target.value)}>
          {progress.applications.map((a) => (
            <option key={a.application.code} value={a.application.code}>
              {a.application.name} ({a.reviewed} reviewed)
            </option>
          ))}
        </SelectField>
        <p className="flex items-center gap-2 pb-2 text-sm text-slate-700">
          Learning curve: <SignalTag signal={app.cusum.signal} />
        </p>
      </div>
      <ReportSection
        title={`Learning curve: ${app.application.name}`}
        description="The CUSUM path over reviewed exams in the order performed, with the program's decision limits."
      >
        <LearningCurve application={app} viewer="lead" />
      </ReportSection>
      <ReportSection
        title={`Criterion trends: ${app.application.name}`}
        description={`Rolling mean over the last ${window} reviewed exams, per rubric criterion.`}
      >
        <CriterionTrends application={app} window={window} />
      </ReportSection>
      <ReportSection
        title={`Accuracy: ${app.application.name}`}
        description="The clinician's reads against the reviewer's and against confirmatory results, with Wilson 95% intervals."
      >
        <AccuracyTable application={app} />
      </ReportSection>
    </>
  );
}

export default function SonographerPage() {
  const { userId = "" } = useParams();
  const { from, to, window, app, set } = useView();
  const range = { ...(from ? { from } : {}), ...(to ? { to } : {}), window: String(window) };
  const progress = useQuery(sonographerProgressQuery(userId, range));
  const feedback = useQuery(sonographerFeedbackQuery(userId));
  const data = progress.data;
  const rangeInvalid = !!from && !!to && from > to;
  const name = data?.sonographer.name ?? "Clinician";

  if (progress.isError && isApiError(progress.error, 404))
    return (
      <div>
        <PageHeader eyebrow="Roster" title="Clinician not found" />
        <EmptyState
          title="No clinician of this program has this address"
          action={
            <Link to="/oversight/roster" className={buttonClasses("secondary", "sm")}>
              Back to the roster
            </Link>
          }
        />
      </div>
    );

  return (
    <div>
      <PageHeader
        eyebrow="Roster"
        title={name}
        description={
          data ? (
            <>
              {data.sonographer.email} · last activity {formatDate(data.lastActivityAt)} · {data.unacknowledgedFeedback} reviewed exam
              {data.unacknowledgedFeedback === 1 ? "" : "s"} not acknowledged yet
            </>
          ) : null
        }
        actions={
          <Link to="/oversight/roster" className={buttonClasses("ghost", "sm")}>
            <ArrowLeft aria-hidden="true" className="size-4" />
            Roster
          </Link>
        }
      />
      <form
        role="search"
        aria-label="Choose the range"
        onSubmit={(e) => e.preventDefault()}
        className="mb-6 flex flex-wrap items-end gap-3 rounded-lg border border-slate-200 bg-white p-4"
      >
        <TextField label="From" type="date" className="w-44" value={from} max={to || undefined} onChange={(e) => set("from", e.target.value)} />
        <TextField
          label="To"
          type="date"
          className="w-44"
          value={to}
          min={from || undefined}
          error={rangeInvalid ? "The start of the range is after its end." : undefined}
          onChange={(e) => set("to", e.target.value)}
        />
        <SelectField
          label="Rolling mean over"
          className="w-44"
          value={String(window)}
          onChange={(e) => set("window", e.target.value === "10" ? "" : e.target.value)}
        >
          {WINDOWS.map((w) => (
            <option key={w} value={w}>
              {w} exams
            </option>
          ))}
        </SelectField>
        <p className="pb-2 text-sm text-slate-600">{from || to ? "Exams performed in this range." : "All dates (leave both empty)."}</p>
        {progress.isFetching && data ? (
          <span role="status" className="pb-2 text-sm text-slate-600">
            Updating…
          </span>
        ) : null}
      </form>

      <ReportSection
        title="Credentialing report"
        description={`This clinician's report for ${from || to ? "the range above" : "all dates"}, with a signature line for the program director.`}
      >
        <ReportButtons request={{ userId, from: from || undefined, to: to || undefined }} disabled={rangeInvalid} />
      </ReportSection>

      {rangeInvalid ? null : progress.isError ? (
        <ErrorState error={progress.error} onRetry={() => void progress.refetch()} retrying={progress.isFetching} />
      ) : !data ? (
        <LoadingState label="Loading the clinician's progress…" />
      ) : (
        <>
          <ReportSection title="Progress toward credentialing" description={`Threshold: ${data.settings.threshold} credited exams per application.`}>
            <ProgressSummary progress={data} />
          </ReportSection>
          <ReportSection title="Strengths and focus areas">
            <StrengthsAndFocus strengths={data.strengths} focusAreas={data.focusAreas} window={data.window} />
          </ReportSection>
          <ApplicationDetail progress={data} code={app} window={data.window} onPick={(code) => set("app", code)} />
        </>
      )}

      <ReportSection title="Reviewed exams" description="What the clinician was told about each exam, with the reviewers named; newest first.">
        {feedback.isError ? (
          <ErrorState error={feedback.error} onRetry={() => void feedback.refetch()} retrying={feedback.isFetching} />
        ) : !feedback.data ? (
          <LoadingState label="Loading the reviewed exams…" />
        ) : feedback.data.length === 0 ? (
          <EmptyState title="No reviewed exam yet">Exams appear here once their final review is in.</EmptyState>
        ) : (
          <ReviewedExams items={feedback.data} clinician={name} />
        )}
      </ReportSection>
    </div>
  );
}
