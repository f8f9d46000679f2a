// The three states every data screen can be in besides "ready": loading, empty and failed.
// Failed always offers a retry, and explains in words (never colour alone).
import type { ReactNode } from "react";
import { Link } from "react-router-dom";
import { CircleAlert, LoaderCircle } from "lucide-react";
import { errorMessage, isApiError } from "../../lib/api-errors";
import { Button } from "./button";

export function LoadingState({ label = "Loading…" }: { label?: string }) {
  return (
    <div role="status" className="flex items-center gap-2 py-8 text-sm text-slate-600">
      <LoaderCircle aria-hidden="true" className="size-4 animate-spin text-sea-600" />
      <span>{label}</span>
    </div>
  );
}

export function EmptyState({ title, children, action }: { title: string; children?: ReactNode; action?: ReactNode }) {
  return (
    <div className="rounded-lg border border-dashed border-slate-300 bg-white px-6 py-8 text-center">
      <p className="font-semibold text-ink-900">{title}</p>
      {children ? <div className="mx-auto mt-1 max-w-prose text-sm text-slate-600">{children}</div> : null}
      {action ? <div className="mt-4">{action}</div> : null}
    </div>
  );
}

export function ErrorState({
  title = "This could not be loaded",
  error,
  onRetry,
  retrying = false,
}: {
  title?: string;
  error: unknown;
  onRetry?: () => void;
  retrying?: boolean;
}) {
  const message = errorMessage(error, "Something went wrong.");
  return (
    <div role="alert" className="rounded-lg border border-coral-300 bg-coral-50 px-5 py-4">
      <p className="flex items-center gap-2 font-semibold text-coral-800">
        <CircleAlert aria-hidden="true" className="size-4 shrink-0" />
        {title}
      </p>
      <p className="mt-1 text-sm text-coral-800">{message}</p>
      {onRetry ? (
        <Button variant="secondary" size="sm" className="mt-3" onClick={onRetry} busy={retrying}>
          Try again
        </Button>
      ) : null}
    </div>
  );
}

/**
 * A failed query of one item: "not there" (404, or 400 for an id that is not an id) gets its
 * own words and an optional way back; anything else the usual retry.
 */
export function QueryErrorState({
  query,
  notFound,
  back,
}: {
  query: { error: unknown; isFetching: boolean; refetch: () => unknown };
  notFound: { title: string; message: string };
  /** A link back to the list the item came from. */
  back?: { to: string; label: string };
}) {
  if (isApiError(query.error, 404) || isApiError(query.error, 400))
    return (
      <div className="space-y-3">
        <ErrorState title={notFound.title} error={new Error(notFound.message)} />
        {back ? (
          <Link to={back.to} className="text-sm font-semibold text-sea-700 underline-offset-2 hover:underline">
            {back.label}
          </Link>
        ) : null}
      </div>
    );
  return <ErrorState error={query.error} onRetry={() => void query.refetch()} retrying={query.isFetching} />;
}
