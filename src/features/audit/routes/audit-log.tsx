// Setup → Audit log: who did what and when in this program. The page number lives in the
// address (?page=2) so a page can be shared and the back button works.
import { useSearchParams } from "react-router-dom";
import { ChevronLeft, ChevronRight } from "lucide-react";
import { Button } from "../../../components/ui/button";
import { PageHeader } from "../../../components/ui/page-header";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { formatCount } from "../../../lib/stat-format";
import { AUDIT_PAGE_SIZE, useAuditLog } from "../api/audit";
import { AuditTable } from "../components/audit-table";

export default function AuditLogPage() {
  const [params, setParams] = useSearchParams();
  const page = Math.max(1, Number.parseInt(params.get("page") ?? "1", 10) || 1);
  const offset = (page - 1) * AUDIT_PAGE_SIZE;
  const query = useAuditLog({ limit: AUDIT_PAGE_SIZE, offset });

  const total = query.data?.total ?? 0;
  const pages = Math.max(1, Math.ceil(total / AUDIT_PAGE_SIZE));
  const goTo = (p: number) => setParams(p === 1 ? {} : { page: String(p) });

  return (
    <div>
      <PageHeader eyebrow="Setup" title="Audit log" description="Sign-ins, invitations, role changes and other changes in this program, newest first." />
      {query.isPending ? (
        <LoadingState label="Loading the audit log…" />
      ) : query.isError ? (
        <ErrorState error={query.error} onRetry={() => void query.refetch()} retrying={query.isFetching} />
      ) : query.data.entries.length === 0 ? (
        page > 1 ? (
          <EmptyState title="No entries on this page" action={<Button onClick={() => goTo(1)}>Go to the first page</Button>}>
            The log has fewer pages than this address asks for.
          </EmptyState>
        ) : (
          <EmptyState title="The audit log is empty">Nothing has been recorded in this program yet.</EmptyState>
        )
      ) : (
        <>
          <AuditTable entries={query.data.entries} />
          <nav aria-label="Audit log pages" className="mt-4 flex flex-wrap items-center justify-between gap-3 text-sm">
            <p className="tabular-nums text-slate-700" aria-live="polite">
              {formatCount(offset + 1)}–{formatCount(offset + query.data.entries.length)} of {formatCount(total)}
              {query.isPlaceholderData ? " (loading…)" : ""}
            </p>
            <div className="flex items-center gap-2">
              <Button variant="secondary" size="sm" onClick={() => goTo(page - 1)} disabled={page <= 1}>
                <ChevronLeft aria-hidden="true" className="size-4" />
                Newer
              </Button>
              <span className="tabular-nums text-slate-700">
                Page {page} of {pages}
              </span>
              <Button variant="secondary" size="sm" onClick={() => goTo(page + 1)} disabled={page >= pages}>
                Older
                <ChevronRight aria-hidden="true" className="size-4" />
              </Button>
            </div>
          </nav>
        </>
      )}
    </div>
  );
}
