// One sonographer's reviewed exams as the QA lead sees them: what the learner was told (the
// final levels, reads against the reviewer's, comments) with every reviewer named, the
// acknowledgement state and any questions, plus the confirmatory results to enter later.
import { useState } from "react";
import { Link } from "react-router-dom";
import { CircleCheck, CircleMinus, MessageSquare } from "lucide-react";
import { ConfirmationsForm } from "../../progress";
import { Button } from "../../../components/ui/button";
import { SelectField } from "../../../components/ui/select-field";
import { StatusTag } from "../../../components/ui/status-tag";
import { formatDate, formatDateTime } from "../../../lib/format";
import type { FeedbackDetail } from "../api/roster";

const OUTCOME_WORDS: Record<FeedbackDetail["findings"][number]["outcome"], string> = {
  TP: "True positive",
  FP: "False positive",
  TN: "True negative",
  FN: "False negative",
  indeterminate: "Indeterminate",
};

const SOURCE_WORDS: Record<FeedbackDetail["source"], string> = {
  single_read: "One reviewer's read",
  double_read_agreed: "Two independent reads that agreed",
  adjudicated: "Two reads that differed, settled by adjudication",
};

const PAGE = 10;

function ExamFeedback({ fb, clinician }: { fb: FeedbackDetail; clinician: string }) {
  const [confirmOpen, setConfirmOpen] = useState(false);
  const offLevel = fb.criteria.filter((c) => c.level && !c.level.ideal);
  const reviewers = [...new Set(fb.comments.map((c) => c.reviewer).filter((r): r is string => !!r))];
  return (
    <article aria-labelledby={`exam-${fb.examId}`} className="rounded-lg border border-slate-200 bg-white p-4" data-testid="reviewed-exam">
      <header className="flex flex-wrap items-start justify-between gap-2">
        <div>
          <h3 id={`exam-${fb.examId}`} className="font-semibold text-ink-950">
            <Link to={`/exams/${fb.examId}`} className="text-sea-800 underline-offset-2 hover:underline">
              {fb.application.name} · {fb.code}
            </Link>
          </h3>
          <p className="text-xs text-slate-600">
            Performed {formatDate(fb.performedAt)} · {fb.setting} · reviewed {formatDateTime(fb.reviewedAt)} · {SOURCE_WORDS[fb.source]}
          </p>
        </div>
        <div className="flex flex-wrap gap-1">
          {fb.credit ? <StatusTag tone="good">Credited</StatusTag> : <StatusTag tone="off">No credit</StatusTag>}
          {fb.acknowledgedAt ? (
            <span className="inline-flex items-center gap-1 text-xs text-slate-700" title={formatDateTime(fb.acknowledgedAt)}>
              <CircleCheck aria-hidden="true" className="size-3.5 text-sea-700" />
              Acknowledged {formatDate(fb.acknowledgedAt)}
            </span>
          ) : (
            <span className="inline-flex items-center gap-1 text-xs text-slate-700">
              <CircleMinus aria-hidden="true" className="size-3.5" />
              Not acknowledged yet
            </span>
          )}
        </div>
      </header>

      {!fb.credit && fb.creditReasons?.length ? (
        <p className="mt-2 text-sm text-slate-700">
          <span className="font-semibold">No credit because:</span> {fb.creditReasons.join("; ")}
        </p>
      ) : null}

      <div className="mt-3 grid gap-4 md:grid-cols-2">
        <div>
          <h4 className="text-sm font-semibold text-ink-900">Levels below the aim</h4>
          {offLevel.length === 0 ? (
            <p className="text-sm text-slate-600">Every criterion at the level the program aims for.</p>
          ) : (
            <ul className="mt-1 space-y-0.5 text-sm">
              {offLevel.map((c) => (
                <li key={c.key}>
                  <span className="text-slate-700">{c.label}:</span>{" "}
                  <span className={c.level!.fails ? "font-semibold text-coral-800" : "text-ink-900"}>{c.level!.label}</span>
                  {c.level!.fails ? <span className="text-xs text-coral-800"> (blocks credit)</span> : null}
                </li>
              ))}
            </ul>
          )}
        </div>
        <div>
          <h4 className="text-sm font-semibold text-ink-900">Reads against the reviewer&apos;s</h4>
          {fb.findings.length === 0 ? (
            <p className="text-sm text-slate-600">No findings asked for.</p>
          ) : (
            <ul className="mt-1 space-y-0.5 text-sm">
              {fb.findings.map((f) => (
                <li key={f.key}>
                  <span className="text-slate-700">{f.label}:</span> {f.yourRead} / reviewer {f.referenceRead} —{" "}
                  <span className={f.outcome === "FP" || f.outcome === "FN" ? "font-semibold text-coral-800" : "text-ink-900"}>{OUTCOME_WORDS[f.outcome]}</span>
                </li>
              ))}
            </ul>
          )}
        </div>
      </div>

      <div className="mt-3">
        <h4 className="text-sm font-semibold text-ink-900">
          Reviewer comments{reviewers.length ? <span className="font-normal text-slate-600"> ({reviewers.join(", ")})</span> : null}
        </h4>
        {fb.comments.length === 0 ? (
          <p className="text-sm text-slate-600">No written comment.</p>
        ) : (
          <ul className="mt-1 space-y-2">
            {fb.comments.map((c, i) => (
              <li key={i} className="rounded-md bg-paper-200 px-3 py-2 text-sm">
                <p className="text-xs font-semibold text-slate-700" data-testid="reviewer-name">
                  {c.reviewer ?? "Reviewer (name not recorded)"} · {formatDateTime(c.at)}
                </p>
                <p className="whitespace-pre-wrap text-ink-900">{c.text}</p>
              </li>
            ))}
          </ul>
        )}
        {fb.adjudicationNote ? (
          <p className="mt-2 text-sm">
            <span className="font-semibold text-ink-900">Adjudication note:</span> {fb.adjudicationNote}
          </p>
        ) : null}
      </div>

      {fb.messages.length ? (
        <div className="mt-3">
          <h4 className="flex items-center gap-1 text-sm font-semibold text-ink-900">
            <MessageSquare aria-hidden="true" className="size-4" />
            Questions and answers
          </h4>
          <ul className="mt-1 space-y-1 text-sm">
            {fb.messages.map((m) => (
              <li key={m.id}>
                <span className="font-semibold">{m.author === "you" ? clinician : m.author}</span>
                <span className="text-xs text-slate-600"> · {formatDateTime(m.at)}</span>
                <p className="whitespace-pre-wrap text-ink-900">{m.body}</p>
              </li>
            ))}
          </ul>
        </div>
      ) : null}

      <div className="mt-3 border-t border-slate-100 pt-3">
        {confirmOpen ? (
          <ConfirmationsForm examId={fb.examId} headingLevel={3} />
        ) : (
          <Button variant="ghost" size="sm" aria-label={`Confirmatory results of ${fb.code}`} onClick={() => setConfirmOpen(true)}>
            Confirmatory results…
          </Button>
        )}
      </div>
    </article>
  );
}

/** The list with an application filter, newest first, shown ten at a time. */
export function ReviewedExams({ items, clinician }: { items: FeedbackDetail[]; clinician: string }) {
  const [app, setApp] = useState("");
  const [shown, setShown] = useState(PAGE);
  const apps = [...new Map(items.map((i) => [i.application.code, i.application.name])).entries()].sort((a, b) => a[1].localeCompare(b[1]));
  const list = items.filter((i) => !app || i.application.code === app);
  return (
    <div>
      <div className="mb-3 flex flex-wrap items-end justify-between gap-3">
        <SelectField
          label="Application"
          compact
          className="w-64"
          value={app}
          onChange={(e) => {
            setApp(e.target.value);
            setShown(PAGE);
          }}
        >
          <option value="">All applications ({items.length})</option>
          {apps.map(([code, name]) => (
            <option key={code} value={code}>
              {name} ({items.filter((i) => i.application.code === code).length})
            </option>
          ))}
        </SelectField>
        <p role="status" className="text-sm text-slate-600">
          Showing {Math.min(shown, list.length)} of {list.length} reviewed exam{list.length === 1 ? "" : "s"}
        </p>
      </div>
      <div className="space-y-3">
        {list.slice(0, shown).map((fb) => (
          <ExamFeedback key={fb.examId} fb={fb} clinician={clinician} />
        ))}
      </div>
      {list.length > shown ? (
        <Button variant="secondary" size="sm" className="mt-3" onClick={() => setShown((n) => n + PAGE)}>
          Show {Math.min(PAGE, list.length - shown)} more
        </Button>
      ) : null}
    </div>
  );
}
