// The roster as a sortable table (TanStack Table): each sonographer with progress per
// application, totals, last activity and flags. Sorting is by header buttons announced via
// aria-sort; the export holds the rows as filtered and sorted on screen.
import { useState } from "react";
import { Link } from "react-router-dom";
import { createColumnHelper, flexRender, getCoreRowModel, getSortedRowModel, useReactTable, type SortingState } from "@tanstack/react-table";
import { ROSTER_FLAG_LABELS, type RosterRow } from "../../../../shared/schemas/progress";
import { ExportCsvButton } from "../../../components/ui/export-csv-button";
import { tableClasses as t } from "../../../components/ui/report-section";
import { formatDate, formatDateTime } from "../../../lib/format";
import { CompactProgress, FlagTag, SIGNAL_WORDS, SignalTag } from "./progress-marks";
import { SortableHeader } from "../../../components/ui/sortable-header";

const metCount = (r: RosterRow) => r.applications.filter((a) => a.met).length;
/** Applications worth a line: any reviewed or credited exam. The rest are counted, not listed. */
const active = (r: RosterRow) => r.applications.filter((a) => a.reviewed > 0 || a.credited > 0);

const col = createColumnHelper<RosterRow>();
const columns = [
  col.accessor("name", {
    header: "Clinician",
    meta: { numeric: false },
    sortingFn: (a, b) => a.original.name.localeCompare(b.original.name),
    cell: (c) => (
      <div>
        <Link
          to={`/oversight/roster/${c.row.original.id}`}
          className="font-semibold text-sea-800 underline-offset-2 hover:underline focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-sea-600"
        >
          {c.getValue()}
        </Link>
        <div className="text-xs text-slate-600">{c.row.original.email}</div>
      </div>
    ),
  }),
  col.accessor((r) => metCount(r), {
    id: "applications",
    header: "Progress per application",
    meta: { numeric: false },
    // Most thresholds met first when sorted descending; credited exams break ties.
    sortingFn: (a, b) => metCount(a.original) - metCount(b.original) || a.original.total.credited - b.original.total.credited,
    cell: (c) => {
      const r = c.row.original;
      const shown = active(r);
      const quiet = r.applications.length - shown.length;
      return (
        <div className="min-w-[16rem]">
          <p className="mb-1 text-xs text-slate-600">
            <span className="tabular-nums">{metCount(r)}</span> of <span className="tabular-nums">{r.applications.length}</span> thresholds met
          </p>
          {shown.length === 0 ? (
            <p className="text-xs text-slate-600">No reviewed exam yet{r.total.submitted > 0 ? ` (${r.total.submitted} waiting for review)` : ""}.</p>
          ) : (
            <ul className="space-y-1">
              {shown.map((a) => (
                <li key={a.code} className="grid grid-cols-[7rem_auto] items-center gap-x-3 gap-y-0.5 xl:grid-cols-[8rem_auto_auto]">
                  <span className="text-xs font-semibold leading-tight text-ink-900">{a.name}</span>
                  <CompactProgress credited={a.credited} threshold={a.threshold} met={a.met} label={`${a.name}: credited exams of ${r.name}`} />
                  <span className="col-start-2 xl:col-start-auto">
                    <SignalTag signal={a.signal} />
                  </span>
                </li>
              ))}
            </ul>
          )}
          {quiet > 0 && shown.length > 0 ? (
            <p className="mt-1 text-xs text-slate-600">
              {quiet} other application{quiet === 1 ? "" : "s"} without a reviewed exam
            </p>
          ) : null}
        </div>
      );
    },
  }),
  col.accessor((r) => r.total.credited, {
    id: "totals",
    header: "Exams",
    meta: { numeric: true },
    // Sorted by credited exams, then reviewed, then submitted.
    sortingFn: (a, b) =>
      a.original.total.credited - b.original.total.credited ||
      a.original.total.reviewed - b.original.total.reviewed ||
      a.original.total.submitted - b.original.total.submitted,
    cell: (c) => {
      const { credited, reviewed, submitted } = c.row.original.total;
      return (
        <dl className="grid grid-cols-[auto_auto] justify-end gap-x-2 text-xs">
          <dt className="text-slate-600">credited</dt>
          <dd className="text-sm font-semibold">{credited}</dd>
          <dt className="text-slate-600">reviewed</dt>
          <dd>{reviewed}</dd>
          <dt className="text-slate-600">submitted</dt>
          <dd>{submitted}</dd>
        </dl>
      );
    },
  }),
  col.accessor("lastActivityAt", {
    header: "Last activity",
    meta: { numeric: true },
    sortingFn: (a, b) => (a.original.lastActivityAt ?? "").localeCompare(b.original.lastActivityAt ?? ""),
    cell: (c) => {
      const v = c.getValue();
      return v ? (
        <time dateTime={v} title={formatDateTime(v)} className="whitespace-nowrap">
          {formatDate(v)}
        </time>
      ) : (
        <span title="No exam yet">—</span>
      );
    },
  }),
  col.accessor((r) => r.flags.length, {
    id: "flags",
    header: "Flags",
    meta: { numeric: false },
    cell: (c) => {
      const flags = c.row.original.flags;
      return flags.length === 0 ? (
        <span className="text-xs text-slate-600">None</span>
      ) : (
        <ul className="flex flex-col items-start gap-1">
          {flags.map((f) => (
            <li key={f}>
              <FlagTag flag={f} />
            </li>
          ))}
        </ul>
      );
    },
  }),
];

function csvHeader(apps: { code: string }[]): string[] {
  return [
    "sonographer",
    "email",
    "submitted",
    "reviewed",
    "credited",
    "applications_met",
    "last_activity",
    "flags",
    ...apps.flatMap((a) => [`${a.code}_credited`, `${a.code}_threshold`, `${a.code}_met`, `${a.code}_learning_curve`]),
  ];
}

export function RosterTable({ rows, filename }: { rows: RosterRow[]; filename: string }) {
  const [sorting, setSorting] = useState<SortingState>([{ id: "name", desc: false }]);
  // The table instance is rebuilt each render by design; nothing memoized depends on it.
  // eslint-disable-next-line react-hooks/incompatible-library
  const table = useReactTable({
    data: rows,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
  });
  const apps = [...new Map(rows.flatMap((r) => r.applications).map((a) => [a.code, a])).values()];

  return (
    <div>
      <div className="mb-2 flex flex-wrap items-center justify-between gap-3">
        <p role="status" className="text-sm text-slate-600">
          {rows.length === 1 ? "1 clinician" : `${rows.length} clinicians`}
        </p>
        <ExportCsvButton
          what="the roster"
          filename={filename}
          header={csvHeader(apps)}
          rows={() =>
            table.getRowModel().rows.map(({ original: r }) => [
              r.name,
              r.email,
              r.total.submitted,
              r.total.reviewed,
              r.total.credited,
              metCount(r),
              r.lastActivityAt,
              r.flags.map((f) => ROSTER_FLAG_LABELS[f]).join("; "),
              ...apps.flatMap((app) => {
                const a = r.applications.find((x) => x.code === app.code);
                return a ? [a.credited, a.threshold, a.met ? "yes" : "no", SIGNAL_WORDS[a.signal]] : [null, null, null, null];
              }),
            ])
          }
        />
      </div>
      <div className={t.wrap}>
        <table className={t.table}>
          <caption className="sr-only">Clinicians with their progress toward credentialing; column headers sort the table</caption>
          <thead className={t.thead}>
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => (
                  <SortableHeader
                    key={h.id}
                    header={h}
                    className={`${(h.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric ? t.thNum : t.th} align-bottom`}
                  />
                ))}
              </tr>
            ))}
          </thead>
          <tbody className={t.tbody}>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="align-top">
                {row.getVisibleCells().map((cell) => {
                  const numeric = (cell.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric;
                  const content = flexRender(cell.column.columnDef.cell, cell.getContext());
                  // The sonographer's name heads the row, so a screen reader names each cell's row.
                  return cell.column.id === "name" ? (
                    <th key={cell.id} scope="row" className={`${t.td} font-normal`}>
                      {content}
                    </th>
                  ) : (
                    <td key={cell.id} className={numeric ? t.tdNum : t.td}>
                      {content}
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}
