// My exams: the sonographer's own exams, filtered, sorted and paged by the server. Every
// choice lives in the address, so Back, reload and bookmarks keep the view.
import { Link, useLocation, useSearchParams } from "react-router-dom";
import { useQuery } from "@tanstack/react-query";
import type { SortingState } from "@tanstack/react-table";
import { examListQuerySchema } from "../../../../shared/schemas/exams";
import { Button, buttonClasses } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { PageHeader } from "../../../components/ui/page-header";
import { SelectField } from "../../../components/ui/select-field";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { applicationsQuery } from "../../../lib/catalogue";
import { formatCount } from "../../../lib/stat-format";
import { useExamList, type ExamListFilters } from "../api/exams";
import { ExamListFilters as FilterBar } from "../components/exam-list-filters";
import { ExamsTable, SORTABLE } from "../components/exams-table";

const PAGE_SIZES = [10, 25, 50, 100];
const DEFAULT_SORT = "-performedAt" as const;
const DEFAULT_LIMIT = 25;

type Filters = ExamListFilters & { sort: NonNullable<ExamListFilters["sort"]>; limit: number; offset: number };

/** Reads each parameter on its own, so one bad value in the address does not drop the rest. */
function readFilters(params: URLSearchParams): Filters {
  const shape = examListQuerySchema.shape;
  const read = <T,>(key: string, schema: { safeParse: (v: unknown) => { success: boolean; data?: T } }): T | undefined => {
    const raw = params.get(key);
    if (raw === null || raw === "") return undefined;
    const parsed = schema.safeParse(raw);
    return parsed.success ? parsed.data : undefined;
  };
  return {
    status: read("status", shape.status.unwrap()),
    application: read("application", shape.application.unwrap()),
    from: read("from", shape.from.unwrap()),
    to: read("to", shape.to.unwrap()),
    sort: read("sort", shape.sort.unwrap()) ?? DEFAULT_SORT,
    limit: read("limit", shape.limit.unwrap()) ?? DEFAULT_LIMIT,
    offset: read("offset", shape.offset.unwrap()) ?? 0,
  };
}

export default function MyExamsPage() {
  const [params, setParams] = useSearchParams();
  const location = useLocation();
  const notice = (location.state as { notice?: string } | null)?.notice ?? null;
  const filters = readFilters(params);
  const list = useExamList(filters);
  const apps = useQuery(applicationsQuery);

  const update = (change: Partial<ExamListFilters>, resetPage = true) => {
    const next = { ...filters, ...(resetPage ? { offset: 0 } : {}), ...change };
    const out = new URLSearchParams();
    if (next.status) out.set("status", next.status);
    if (next.application) out.set("application", next.application);
    if (next.from) out.set("from", next.from);
    if (next.to) out.set("to", next.to);
    if (next.sort && next.sort !== DEFAULT_SORT) out.set("sort", next.sort);
    if (next.limit && next.limit !== DEFAULT_LIMIT) out.set("limit", String(next.limit));
    if (next.offset) out.set("offset", String(next.offset));
    setParams(out);
  };

  const sortId = filters.sort.replace(/^-/, "");
  const sorting: SortingState = [{ id: sortId, desc: filters.sort.startsWith("-") }];
  const onSortingChange = (next: SortingState) => {
    const s = next[0];
    if (!s || !(SORTABLE as readonly string[]).includes(s.id)) return;
    update({ sort: `${s.desc ? "-" : ""}${s.id}` as ExamListFilters["sort"] });
  };

  const filtered = !!(filters.status || filters.application || filters.from || filters.to);
  const total = list.data?.total ?? 0;
  const first = total === 0 ? 0 : filters.offset + 1;
  const last = Math.min(filters.offset + filters.limit, total);

  return (
    <div>
      <PageHeader
        title="My exams"
        description="Your drafts and submitted exams. Select an exam to see its clips and processing."
        actions={
          <Link to="/exams/new" className={buttonClasses("primary")}>
            Submit an exam
          </Link>
        }
      />
      {notice ? (
        <div className="mb-4">
          <FormMessage tone="success" message={notice} />
        </div>
      ) : null}
      <FilterBar filters={filters} applications={apps.data?.applications ?? []} onChange={(c) => update(c)} onClear={() => setParams(new URLSearchParams())} />

      {list.isPending ? (
        <LoadingState label="Loading your exams…" />
      ) : list.isError ? (
        <ErrorState error={list.error} onRetry={() => void list.refetch()} retrying={list.isFetching} />
      ) : list.data.items.length === 0 ? (
        filtered || filters.offset > 0 ? (
          <EmptyState
            title="No exams match these filters"
            action={
              <Button variant="secondary" onClick={() => setParams(new URLSearchParams())}>
                Clear filters
              </Button>
            }
          />
        ) : (
          <EmptyState
            title="No exams yet — submit your first scan"
            action={
              <Link to="/exams/new" className={buttonClasses("primary")}>
                Submit an exam
              </Link>
            }
          >
            Describe the scan, add its clips and send it for review.
          </EmptyState>
        )
      ) : (
        <>
          <ExamsTable items={list.data.items} sorting={sorting} onSortingChange={onSortingChange} busy={list.isPlaceholderData} />
          <nav aria-label="Pages" className="mt-3 flex flex-wrap items-center justify-between gap-3 text-sm text-slate-700">
            <p aria-live="polite" className="tabular-nums">
              {formatCount(first)}–{formatCount(last)} of {formatCount(total)}
            </p>
            <div className="flex items-center gap-3">
              <SelectField
                label="Per page"
                compact
                className="flex items-center gap-2 [&>label]:whitespace-nowrap [&_select]:mt-0"
                value={String(filters.limit)}
                onChange={(e) => update({ limit: Number(e.target.value) })}
              >
                {PAGE_SIZES.map((n) => (
                  <option key={n} value={n}>
                    {n}
                  </option>
                ))}
              </SelectField>
              <Button
                variant="secondary"
                size="sm"
                disabled={filters.offset === 0}
                onClick={() => update({ offset: Math.max(0, filters.offset - filters.limit) }, false)}
              >
                Previous
              </Button>
              <Button variant="secondary" size="sm" disabled={last >= total} onClick={() => update({ offset: filters.offset + filters.limit }, false)}>
                Next
              </Button>
            </div>
          </nav>
        </>
      )}
    </div>
  );
}
