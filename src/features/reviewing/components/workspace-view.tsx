// The scoring workspace for one held assignment: the clips on the ink viewing surface at the
// left, the rubric, the reviewer's reads and the feedback at the right. Keyboard first
// (see keyboard-help.tsx); the draft autosaves; Ctrl+Enter submits and opens the next exam.
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { useNavigate } from "react-router-dom";
import { useQueryClient } from "@tanstack/react-query";
import { Keyboard, Send, Undo2 } from "lucide-react";
import type { FindingRead } from "../../../../shared/catalogue";
import type { ScoreValue, Scores } from "../../../../shared/rubric/types";
import { scoreIssues } from "../../../../shared/rubric/logic";
import { Button } from "../../../components/ui/button";
import { ConfirmDialog } from "../../../components/ui/dialog";
import { FormMessage } from "../../../components/ui/form-message";
import { Kbd } from "../../../components/ui/kbd";
import { isApiError, validationIssues, type FieldIssue } from "../../../lib/api-errors";
import { queryString } from "../../../lib/query-string";
import type { Workspace } from "../api/workspace";
import { forgetWorkspace, useReleaseAssignment, useSubmitAndNext, type DraftBody } from "../api/scoring";
import { useDraftAutosave } from "../hooks/use-draft-autosave";
import { useFocusedSeconds } from "../hooks/use-focused-seconds";
import { useWorkspaceShortcuts } from "../hooks/use-workspace-shortcuts";
import { ClipSwitcher, clipTitle } from "./clip-switcher";
import { ClipViewer, type PlayerHandle } from "./clip-viewer";
import { CriterionField, criterionStopId } from "./criterion-field";
import { ExamFacts } from "./exam-summary";
import { ORIENTATION_LABELS, isOrientationCriterion } from "../../../lib/catalogue";
import { FEEDBACK_STOP_ID, FeedbackBox } from "./feedback-box";
import { FindingReadRow, findingStopId } from "./finding-read-row";
import { KeyboardHelp } from "./keyboard-help";
import { PrecheckHints } from "./precheck-hints";
import { SaveStatus, TimeSpent } from "./save-status";
import { dicomLine } from "../../../lib/dicom";

const KIND_LABELS: Record<string, string> = { primary: "First read", second: "Second read", adjudication: "Adjudication" };

/** Server (or local) issues by where they show: `scores.<key>`, `reads`, `feedback`, or `form` (first message per place). */
function issuesByPlace(issues: FieldIssue[], fallback: string): Record<string, string> {
  const out: Record<string, string> = {};
  for (const { path, message } of issues) {
    const place = path.startsWith("scores.")
      ? path
      : path.startsWith("reads")
        ? "reads"
        : path === "feedback"
          ? "feedback"
          : path.startsWith("urgent")
            ? "urgent.reason"
            : "form";
    if (!(place in out)) out[place] = message;
  }
  if (Object.keys(out).length === 0) out.form = fallback;
  return out;
}

/** Focuses a stop of the rubric: a group's checked (else first) option, or the element itself. */
function focusStop(id: string) {
  const el = document.getElementById(id);
  if (!el) return;
  const target = el.matches("fieldset") ? (el.querySelector<HTMLElement>("input:checked") ?? el.querySelector<HTMLElement>("input")) : el;
  target?.focus();
}

export function WorkspaceView({ workspace, application, notice }: { workspace: Workspace; application: string | null; notice: string | null }) {
  const { assignment, exam, rubric, draft, snippets } = workspace;
  const navigate = useNavigate();
  const criteria = rubric.criteria;
  const [scores, setScores] = useState<Scores>(() =>
    Object.fromEntries(Object.entries(draft?.scores ?? {}).filter(([k]) => criteria.some((c) => c.key === k))),
  );
  const [reads, setReads] = useState<Record<string, FindingRead>>(() => Object.fromEntries((draft?.reads ?? []).map((r) => [r.key, r.read])));
  const [feedback, setFeedback] = useState(draft?.feedback ?? "");
  const [limited, setLimited] = useState(draft?.limited ?? false);
  const [urgent, setUrgent] = useState(false);
  const [urgentReason, setUrgentReason] = useState("");
  const [version, setVersion] = useState(0);
  const [issues, setIssues] = useState<Record<string, string>>({});
  const [focusedCriterion, setFocusedCriterion] = useState<string | null>(null);
  const [clipIndex, setClipIndex] = useState(0);
  const [helpOpen, setHelpOpen] = useState(false);
  const [releaseOpen, setReleaseOpen] = useState(false);
  const seconds = useFocusedSeconds(draft?.timeSpentSeconds ?? 0);
  const player = useRef<PlayerHandle>(null);
  const submit = useSubmitAndNext(assignment.id);
  // A 503 or lost connection is being retried: say so rather than look stuck or failed.
  const submitWaiting = submit.isPending && submit.failureCount > 0;
  const release = useReleaseAssignment(assignment.id);
  const queryClient = useQueryClient();
  const finished = useRef(false);

  // A submitted or released workspace is dropped from the cache once its screen is gone.
  useEffect(() => {
    const id = assignment.id;
    return () => {
      if (finished.current) forgetWorkspace(queryClient, id);
    };
  }, [assignment.id, queryClient]);

  const stops = useMemo(
    () => [...criteria.map((c) => criterionStopId(c.key)), ...exam.findings.map((f) => findingStopId(f.key)), FEEDBACK_STOP_ID],
    [criteria, exam.findings],
  );

  const body = (): DraftBody => ({
    scores,
    reads: exam.findings.filter((f) => reads[f.key]).map((f) => ({ key: f.key, read: reads[f.key] })),
    feedback,
    timeSpentSeconds: seconds.current,
    limited,
  });
  const autosave = useDraftAutosave(assignment.id, body, version, draft?.savedAt ?? null);
  const leaseExpiresAt = autosave.state.kind === "saved" ? autosave.state.leaseExpiresAt : assignment.leaseExpiresAt;
  const claimLost =
    autosave.state.kind === "lost" || (isApiError(submit.error, 409) && (submit.error.code === "not_claimed" || submit.error.code === "claim_expired"));

  const changed = () => setVersion((v) => v + 1);
  const clearIssue = (place: string) =>
    setIssues((all) => (place in all || "form" in all ? Object.fromEntries(Object.entries(all).filter(([k]) => k !== place && k !== "form")) : all));

  const setScore = (key: string, value: ScoreValue | undefined) => {
    setScores((s) => {
      const next = { ...s };
      if (value === undefined) delete next[key];
      else next[key] = value;
      return next;
    });
    clearIssue(`scores.${key}`);
    changed();
  };
  const setRead = (key: string, read: FindingRead) => {
    setReads((r) => ({ ...r, [key]: read }));
    clearIssue("reads");
    changed();
  };

  const advance = (fromId: string, direction: 1 | -1) => {
    const i = stops.indexOf(fromId);
    const next = stops[Math.min(Math.max(i + direction, 0), stops.length - 1)];
    if (next) focusStop(next);
  };

  // Open with the first criterion still to score in focus — after the layout has focused the heading.
  useEffect(() => {
    const frame = requestAnimationFrame(() => {
      const first = criteria.find((c) => scores[c.key] === undefined);
      focusStop(first ? criterionStopId(first.key) : (stops[0] ?? FEEDBACK_STOP_ID));
    });
    return () => cancelAnimationFrame(frame);
    // Only when the workspace opens.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);

  const doSubmit = () => {
    if (submit.isPending || claimLost) return;
    const local = scoreIssues(criteria, exam.application.code, scores, rubric.version).map((i) => ({ path: i.path, message: i.message }));
    const missing = exam.findings.filter((f) => !reads[f.key]);
    if (missing.length)
      local.push({ path: "reads", message: `Record your own read of ${missing.length === 1 ? `"${missing[0].label}"` : `${missing.length} findings`}` });
    if (urgent && !urgentReason.trim()) local.push({ path: "urgent.reason", message: "Say why this patient needs follow-up now" });
    if (local.length) {
      setIssues(issuesByPlace(local, ""));
      const first = local[0].path.startsWith("scores.")
        ? criterionStopId(local[0].path.slice(7))
        : missing[0]
          ? findingStopId(missing[0].key)
          : local[0].path === "urgent.reason"
            ? "urgent-reason"
            : FEEDBACK_STOP_ID;
      focusStop(first);
      return;
    }
    autosave.cancel();
    submit.mutate(
      { body: { ...body(), rubricId: rubric.id, urgent: urgent ? { reason: urgentReason.trim() } : null }, application },
      {
        onSuccess: ({ next }) => {
          finished.current = true;
          const query = queryString({ application });
          if (next)
            void navigate(`/queue/${next.assignment.id}${query}`, {
              replace: true,
              state: { notice: `Exam ${exam.code} submitted. Next: exam ${next.exam.code}.` },
            });
          else
            void navigate(`/queue${query}`, {
              replace: true,
              state: { notice: `All done: exam ${exam.code} is submitted and nothing else is waiting for you.` },
            });
        },
        onError: (error) => {
          autosave.resume();
          if (isApiError(error, 400)) {
            const found = issuesByPlace(validationIssues(error.details, error.message), error.message);
            setIssues(found);
            const firstScore = Object.keys(found).find((k) => k.startsWith("scores."));
            if (firstScore) focusStop(criterionStopId(firstScore.slice(7)));
          } else if (isApiError(error, 409) && error.code === "already_submitted") {
            void navigate("/queue", { replace: true, state: { notice: `Exam ${exam.code} was already submitted.` } });
          }
        },
      },
    );
  };

  const selectClip = useCallback((i: number) => setClipIndex(Math.min(Math.max(i, 0), Math.max(exam.clips.length - 1, 0))), [exam.clips.length]);

  useWorkspaceShortcuts({
    player,
    submit: doSubmit,
    openHelp: () => setHelpOpen(true),
    moveClip: (d) => setClipIndex((i) => Math.min(Math.max(i + d, 0), Math.max(exam.clips.length - 1, 0))),
  });

  const clip = exam.clips[clipIndex];
  const title = clip ? clipTitle(clip, clipIndex, exam.views) : "";
  const requiredLeft = criteria.filter((c) => c.required && scores[c.key] === undefined).length;
  const readsLeft = exam.findings.filter((f) => !reads[f.key]).length;
  const issueCount = Object.keys(issues).length;

  return (
    <div className="text-ink-950">
      <title>{`Scoring ${exam.code} · Soundings`}</title>
      <div className="mb-3 flex flex-wrap items-start justify-between gap-x-4 gap-y-2 border-b border-slate-200 pb-3">
        <div className="min-w-0">
          <p className="text-xs font-semibold uppercase tracking-wide text-sea-700">Scoring · {KIND_LABELS[assignment.kind] ?? assignment.kind}</p>
          <h1 tabIndex={-1} className="text-xl font-semibold focus:outline-none">
            Exam <span className="font-mono">{exam.code}</span>
          </h1>
          <ExamFacts exam={exam} leaseExpiresAt={leaseExpiresAt} />
        </div>
        <div className="flex flex-wrap items-center gap-3">
          <TimeSpent seconds={seconds} initial={draft?.timeSpentSeconds ?? 0} />
          <SaveStatus state={autosave.state} />
          <Button variant="ghost" size="sm" onClick={() => setHelpOpen(true)} aria-keyshortcuts="?">
            <Keyboard aria-hidden="true" className="size-4" />
            Keys <Kbd>?</Kbd>
          </Button>
          <Button variant="secondary" size="sm" onClick={() => setReleaseOpen(true)} disabled={claimLost}>
            <Undo2 aria-hidden="true" className="size-4" />
            Release
          </Button>
        </div>
      </div>

      <div className="mb-3 space-y-2 empty:mb-0">
        {notice ? <FormMessage tone="success" message={notice} /> : null}
        {claimLost ? (
          <FormMessage message="You no longer hold this exam: the claim ended and it went back to the queue. Your latest changes here were not saved. Go back to the Queue to start the next one." />
        ) : null}
        {autosave.state.kind === "failed" ? (
          <FormMessage message={`The draft could not be saved: ${autosave.state.message} It will try again with your next change.`} />
        ) : null}
      </div>

      <div className="grid items-start gap-4 lg:grid-cols-[minmax(0,1fr)_25rem]">
        <section aria-label="Clips" className="overflow-hidden rounded-lg bg-ink-950 text-ink-50 lg:sticky lg:top-4">
          {clip ? (
            <>
              <div className="flex items-center justify-between gap-2 px-3 py-1.5 text-sm">
                <h2 className="font-semibold">{title}</h2>
                <span className="text-xs text-ink-200">
                  {clip.kind === "video" ? "Video" : "Still"}
                  {clip.width && clip.height ? ` · ${clip.width}×${clip.height}` : ""}
                  {clip.dicom ? ` · ${dicomLine(clip.dicom)}` : ""}
                </span>
              </div>
              <ClipViewer key={clip.id} clip={clip} label={title} handle={player} />
              <PrecheckHints precheck={clip.precheck} transducer={exam.transducer} />
              <ClipSwitcher clips={exam.clips} current={clipIndex} views={exam.views} onSelect={selectClip} />
            </>
          ) : (
            <p className="p-6 text-sm text-ink-200">This exam has no ready clips.</p>
          )}
        </section>

        <div className="space-y-3 lg:max-h-[calc(100vh-4rem)] lg:overflow-y-auto lg:px-1">
          <section aria-labelledby="rubric-heading" className="space-y-1.5">
            <div className="flex items-baseline justify-between gap-2">
              <h2 id="rubric-heading" className="text-sm font-semibold uppercase tracking-wide text-slate-700">
                {rubric.name} <span className="font-normal normal-case text-slate-600">v{rubric.version}</span>
              </h2>
              <span className="text-xs text-slate-600">{requiredLeft === 0 ? "All required scored" : `${requiredLeft} required left`}</span>
            </div>
            {criteria.map((c, i) => (
              <CriterionField
                key={c.key}
                criterion={c}
                position={i + 1}
                value={scores[c.key]}
                error={issues[`scores.${c.key}`]}
                onChange={(v) => setScore(c.key, v)}
                onAdvance={(d) => advance(criterionStopId(c.key), d)}
                onFocusCriterion={() => setFocusedCriterion(c.key)}
                note={isOrientationCriterion(c) ? `This application: ${ORIENTATION_LABELS[exam.guide.orientation]}.` : undefined}
              />
            ))}
          </section>

          {exam.findings.length > 0 ? (
            <section aria-labelledby="reads-heading" className="space-y-1.5">
              <div className="flex items-baseline justify-between gap-2">
                <h2 id="reads-heading" className="text-sm font-semibold uppercase tracking-wide text-slate-700">
                  Your read of each finding
                </h2>
                <span className="text-xs text-slate-600">{readsLeft === 0 ? "All read" : `${readsLeft} left`}</span>
              </div>
              {issues.reads ? (
                <p role="alert" className="text-xs font-semibold text-coral-700">
                  {issues.reads}
                </p>
              ) : null}
              {exam.findings.map((f) => (
                <FindingReadRow
                  key={f.key}
                  finding={f}
                  value={reads[f.key]}
                  invalid={!!issues.reads}
                  onChange={(r) => setRead(f.key, r)}
                  onAdvance={(d) => advance(findingStopId(f.key), d)}
                />
              ))}
            </section>
          ) : null}

          <FeedbackBox
            value={feedback}
            onChange={(t) => {
              setFeedback(t);
              clearIssue("feedback");
              changed();
            }}
            snippets={snippets}
            criteria={criteria}
            focusedCriterion={focusedCriterion}
            error={issues.feedback}
          />

          <label className="flex items-start gap-2 rounded-md border border-slate-200 bg-white px-2.5 py-2 text-sm text-ink-900">
            <input
              type="checkbox"
              checked={limited}
              onChange={(e) => {
                setLimited(e.target.checked);
                changed();
              }}
              className="mt-0.5 size-4 accent-sea-600"
            />
            <span>
              <span className="font-semibold">Technically limited by patient factors</span>
              <span className="block text-xs text-slate-600">
                Body habitus, bowel gas, subcutaneous air, a patient who cannot be positioned: the exam earns no credit and is not counted as poor technique.
              </span>
            </span>
          </label>

          {exam.setting === "clinical" ? (
            <div className={`rounded-md border px-2.5 py-2 text-sm ${urgent ? "border-coral-400 bg-coral-50" : "border-slate-200 bg-white"}`}>
              <label className="flex items-start gap-2 text-ink-900">
                <input
                  type="checkbox"
                  checked={urgent}
                  onChange={(e) => {
                    setUrgent(e.target.checked);
                    clearIssue("urgent.reason");
                  }}
                  className="mt-0.5 size-4 accent-coral-600"
                />
                <span>
                  <span className="font-semibold">Needs clinical follow-up now</span>
                  <span className="block text-xs text-slate-600">
                    The QA lead and the program&apos;s on-call address are told as soon as you submit, before any second read or adjudication.
                  </span>
                </span>
              </label>
              {urgent ? (
                <div className="mt-2">
                  <label htmlFor="urgent-reason" className="block text-xs font-semibold text-ink-900">
                    Why, in a sentence
                  </label>
                  <textarea
                    id="urgent-reason"
                    rows={2}
                    value={urgentReason}
                    maxLength={1000}
                    onChange={(e) => {
                      setUrgentReason(e.target.value);
                      clearIssue("urgent.reason");
                    }}
                    aria-invalid={issues["urgent.reason"] ? true : undefined}
                    aria-describedby={issues["urgent.reason"] ? "urgent-reason-error" : undefined}
                    className="mt-1 block w-full rounded-md border border-slate-400 bg-white px-2 py-1 text-sm text-ink-950 focus-visible:outline-2 focus-visible:outline-sea-600"
                  />
                  {issues["urgent.reason"] ? (
                    <p id="urgent-reason-error" className="mt-1 text-xs text-coral-700">
                      {issues["urgent.reason"]}
                    </p>
                  ) : null}
                </div>
              ) : null}
            </div>
          ) : null}

          <div className="sticky bottom-0 space-y-2 border-t border-slate-200 bg-paper pt-2 pb-2">
            <FormMessage
              message={
                issues.form ??
                (issueCount > 0
                  ? `${issueCount === 1 ? "One thing needs" : `${issueCount} things need`} your attention before submitting; see the marked items.`
                  : submitWaiting
                    ? "Waiting for the server to take your review; your scores are kept and it is sent again by itself."
                    : submit.isError && !isApiError(submit.error, 400)
                      ? submit.error.message
                      : null)
              }
            />
            <Button onClick={doSubmit} busy={submit.isPending} disabled={claimLost} aria-keyshortcuts="Control+Enter" className="w-full">
              {submit.isPending ? null : <Send aria-hidden="true" className="size-4" />}
              Submit and open next
              <span className="inline-flex gap-0.5" aria-hidden="true">
                <Kbd>Ctrl</Kbd>
                <Kbd>Enter</Kbd>
              </span>
            </Button>
          </div>
        </div>
      </div>

      <KeyboardHelp open={helpOpen} onClose={() => setHelpOpen(false)} />
      <ConfirmDialog
        open={releaseOpen}
        title={`Give exam ${exam.code} back?`}
        confirmLabel="Release"
        busy={release.isPending}
        error={release.error?.message}
        onClose={() => setReleaseOpen(false)}
        onConfirm={() => {
          autosave.cancel();
          release.mutate(undefined, {
            onSuccess: () => {
              finished.current = true;
              void navigate("/queue", { replace: true, state: { notice: `Exam ${exam.code} went back to the queue.` } });
            },
            onError: () => autosave.resume(),
          });
        }}
      >
        It returns to the queue for any reviewer, and your scores, reads and feedback so far are discarded.
      </ConfirmDialog>
    </div>
  );
}
