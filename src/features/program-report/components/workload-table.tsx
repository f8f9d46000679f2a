// Reviewer workload as a sortable table (TanStack Table): reviews done, median time per
// review and claims held now. Sorting is by column header buttons, announced via aria-sort.
import { useState } from "react";
import { createColumnHelper, flexRender, getCoreRowModel, getSortedRowModel, useReactTable, type SortingState } from "@tanstack/react-table";
import { ExportCsvButton } from "../../../components/ui/export-csv-button";
import { ReportSection, tableClasses as t } from "../../../components/ui/report-section";
import { formatElapsed } from "../../../lib/duration";
import type { ReviewerWorkload } from "../api/program";
import { SortableHeader } from "../../../components/ui/sortable-header";

const col = createColumnHelper<ReviewerWorkload>();
const columns = [
  col.accessor("name", { header: "Reviewer", meta: { numeric: false } }),
  col.accessor("reviews", { header: "Reviews", meta: { numeric: true } }),
  col.accessor("medianSeconds", {
    header: "Median time per review",
    meta: { numeric: true },
    sortUndefined: "last",
    sortingFn: (a, b, id) => (a.getValue<number | null>(id) ?? Infinity) - (b.getValue<number | null>(id) ?? Infinity),
    cell: (c) => {
      const v = c.getValue();
      return v === null ? <span title="No review in this range">—</span> : formatElapsed(v);
    },
  }),
  col.accessor("held", { header: "Claims held", meta: { numeric: true } }),
];

export function WorkloadTable({ reviewers, filename }: { reviewers: ReviewerWorkload[]; filename: string }) {
  const [sorting, setSorting] = useState<SortingState>([{ id: "reviews", desc: true }]);
  // The table instance is rebuilt each render by design; nothing memoized depends on it.
  // eslint-disable-next-line react-hooks/incompatible-library
  const table = useReactTable({
    data: reviewers,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
  });
  return (
    <ReportSection
      title="Reviewer workload"
      description="Reviews submitted in the range, the median focused time per review, and claims each reviewer holds now."
      actions={
        <ExportCsvButton
          what="reviewer workload"
          filename={filename}
          header={["reviewer", "reviews", "median_seconds", "claims_held"]}
          rows={() => table.getRowModel().rows.map((r) => [r.original.name, r.original.reviews, r.original.medianSeconds, r.original.held])}
        />
      }
    >
      {reviewers.length === 0 ? (
        <p className="text-sm text-slate-600">No reviewer in this program yet.</p>
      ) : (
        <div className={t.wrap}>
          <table className={t.table}>
            <caption className="sr-only">Reviewer workload; column headers sort the table</caption>
            <thead className={t.thead}>
              {table.getHeaderGroups().map((hg) => (
                <tr key={hg.id}>
                  {hg.headers.map((h) => (
                    <SortableHeader
                      key={h.id}
                      header={h}
                      className={(h.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric ? t.thNum : t.th}
                    />
                  ))}
                </tr>
              ))}
            </thead>
            <tbody className={t.tbody}>
              {table.getRowModel().rows.map((row) => (
                <tr key={row.id}>
                  {row.getVisibleCells().map((cell) => {
                    const numeric = (cell.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric;
                    return (
                      <td key={cell.id} className={numeric ? t.tdNum : `${t.td} font-semibold`}>
                        {flexRender(cell.column.columnDef.cell, cell.getContext())}
                      </td>
                    );
                  })}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </ReportSection>
  );
}
