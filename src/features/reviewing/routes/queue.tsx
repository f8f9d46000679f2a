// Queue: what waits for me (by application and setting, with the age of the oldest), what
// I hold and until when, a filter by application, and "Start next" (also the N key), which
// claims the oldest due exam and opens it in the scoring workspace.
import { useCallback, useEffect } from "react";
import { useLocation, useNavigate, useSearchParams } from "react-router-dom";
import { useQuery } from "@tanstack/react-query";
import { Play } from "lucide-react";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { Kbd } from "../../../components/ui/kbd";
import { PageHeader } from "../../../components/ui/page-header";
import { SelectField } from "../../../components/ui/select-field";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { applicationsQuery } from "../../../lib/catalogue";
import { formatWaited } from "../../../lib/duration";
import { formatCount } from "../../../lib/stat-format";
import { hasCommandModifier, isTypingTarget } from "../../../lib/keyboard";
import { queryString } from "../../../lib/query-string";
import { useNow } from "../../../lib/use-now";
import { useQueueOverview, useStartNext } from "../api/queue";
import { HeldTable } from "../components/held-table";
import { WaitingTable } from "../components/waiting-table";

export default function QueuePage() {
  const [params, setParams] = useSearchParams();
  const filter = params.get("application") || null;
  const location = useLocation();
  const navigate = useNavigate();
  const notice = (location.state as { notice?: string } | null)?.notice ?? null;
  const overview = useQueueOverview();
  const apps = useQuery(applicationsQuery);
  const start = useStartNext();
  const now = useNow();

  const startNext = useCallback(() => {
    if (start.isPending) return;
    start.mutate(filter, {
      onSuccess: (workspace) => {
        if (workspace) void navigate(`/queue/${workspace.assignment.id}${queryString({ application: filter })}`);
      },
    });
  }, [start, filter, navigate]);

  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (e.key !== "n" || e.repeat || hasCommandModifier(e) || isTypingTarget(e.target) || e.defaultPrevented) return;
      if (document.querySelector("dialog[open]")) return;
      e.preventDefault();
      startNext();
    };
    document.addEventListener("keydown", onKey);
    return () => document.removeEventListener("keydown", onKey);
  }, [startNext]);

  const waiting = (overview.data?.waiting ?? []).filter((w) => !filter || w.application.code === filter);
  const held = overview.data?.held ?? [];
  const total = waiting.reduce((n, w) => n + w.count, 0);
  const oldest = waiting.reduce((m, w) => Math.max(m, w.oldestWaitingSeconds), 0);
  const filterName = apps.data?.applications.find((a) => a.code === filter)?.name ?? filter;
  const nothingLeft = start.isSuccess && start.data === undefined;

  return (
    <div>
      <PageHeader
        title="Queue"
        description="Exams reach you blinded, by code. Start next claims the oldest due exam, clinical before educational; a claim you leave returns to the queue when it ends."
        actions={
          <Button onClick={startNext} busy={start.isPending} aria-keyshortcuts="n" className="px-5">
            {start.isPending ? null : <Play aria-hidden="true" className="size-4" />}
            {held.length > 0 ? "Continue held exam" : "Start next"}
            <Kbd>N</Kbd>
          </Button>
        }
      />

      <div className="mb-4 space-y-2">
        {notice && !start.isSuccess ? <FormMessage tone="success" message={notice} /> : null}
        {nothingLeft ? (
          <FormMessage tone="info" message={filter ? `Nothing of ${filterName} is waiting for you right now.` : "Nothing is waiting for you right now."} />
        ) : null}
        <FormMessage message={start.isError ? start.error.message : null} />
      </div>

      <div className="mb-5 flex flex-wrap items-end justify-between gap-4">
        <SelectField
          label="Application"
          compact
          className="w-64"
          value={filter ?? ""}
          onChange={(e) => {
            start.reset();
            setParams(e.target.value ? { application: e.target.value } : {}, { replace: true });
          }}
        >
          <option value="">All applications</option>
          {(apps.data?.applications ?? []).map((a) => (
            <option key={a.code} value={a.code}>
              {a.name}
            </option>
          ))}
        </SelectField>
        {overview.data && total > 0 ? (
          <p className="text-sm text-slate-700" aria-live="polite">
            <span className="font-semibold tabular-nums text-ink-950">{formatCount(total)}</span> {total === 1 ? "exam waits" : "exams wait"}
            {filter ? ` in ${filterName}` : ""}; the oldest for <span className="font-semibold tabular-nums text-ink-950">{formatWaited(oldest)}</span>.
          </p>
        ) : null}
      </div>

      {overview.isPending ? (
        <LoadingState label="Loading the queue…" />
      ) : overview.isError ? (
        <ErrorState error={overview.error} onRetry={() => void overview.refetch()} retrying={overview.isFetching} />
      ) : (
        <div className="space-y-6">
          {held.length > 0 ? (
            <section aria-labelledby="held-heading">
              <h2 id="held-heading" className="mb-2 text-base font-semibold text-ink-950">
                You hold
              </h2>
              <HeldTable held={held} now={now} />
            </section>
          ) : null}
          <section aria-labelledby="waiting-heading">
            <h2 id="waiting-heading" className="mb-2 text-base font-semibold text-ink-950">
              Waiting
            </h2>
            {waiting.length === 0 ? (
              <EmptyState title="Nothing is waiting for you">
                {filter
                  ? `No ${filterName} exams wait for a read. Choose another application or all of them.`
                  : "New exams appear here as soon as clinicians submit them."}
              </EmptyState>
            ) : (
              <WaitingTable groups={waiting} />
            )}
          </section>
        </div>
      )}
    </div>
  );
}
