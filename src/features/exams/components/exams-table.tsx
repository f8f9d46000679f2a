// My exams as a table (TanStack Table in manual mode): the server sorts and pages, this
// only draws. Sorting is announced with aria-sort; a row opens the exam, and the code in
// each row is a real link for keyboard and screen-reader users.
import { useMemo } from "react";
import { Link, useNavigate } from "react-router-dom";
import { flexRender, getCoreRowModel, useReactTable, type ColumnDef, type SortingState } from "@tanstack/react-table";
import { CircleAlert, Film } from "lucide-react";
import type { ExamListItem } from "../../../../shared/schemas/exams";
import { formatDateTime } from "../../../lib/format";
import { SETTING_LABELS } from "../../../lib/catalogue";
import { ExamStatusTag } from "./exam-status-tag";
import { SortableHeader } from "../../../components/ui/sortable-header";

/** Columns the server can sort by, keyed by column id (TanStack sorts only columns with an accessor). */
export const SORTABLE = ["performedAt", "application", "status"] as const;

const columns: ColumnDef<ExamListItem>[] = [
  {
    id: "poster",
    header: () => <span className="sr-only">Poster</span>,
    enableSorting: false,
    cell: ({ row }) => (
      <div className="flex h-10 w-14 items-center justify-center overflow-hidden rounded bg-ink-950 text-ink-400">
        {row.original.posterUrl ? (
          <img src={row.original.posterUrl} alt="" loading="lazy" className="size-full object-contain" />
        ) : (
          <Film aria-hidden="true" className="size-4" />
        )}
      </div>
    ),
  },
  {
    id: "code",
    header: "Code",
    enableSorting: false,
    cell: ({ row }) => (
      <Link
        to={`/exams/${row.original.id}`}
        onClick={(e) => e.stopPropagation()}
        className="font-mono font-semibold text-sea-700 underline-offset-2 hover:underline"
      >
        {row.original.code}
      </Link>
    ),
  },
  { id: "application", accessorFn: (row) => row.application.name, header: "Application", cell: ({ row }) => row.original.application.name },
  {
    id: "performedAt",
    accessorFn: (row) => row.performedAt,
    header: "Performed",
    cell: ({ row }) => <span className="whitespace-nowrap tabular-nums">{formatDateTime(row.original.performedAt)}</span>,
  },
  { id: "setting", header: "Setting", enableSorting: false, cell: ({ row }) => SETTING_LABELS[row.original.setting] },
  {
    id: "clips",
    header: "Clips",
    enableSorting: false,
    cell: ({ row }) => {
      const { clipCount, readyClipCount, failedClipCount } = row.original;
      return (
        <span className="whitespace-nowrap tabular-nums">
          {clipCount === 0 ? (
            <span className="text-slate-600">None</span>
          ) : (
            <>
              {readyClipCount}/{clipCount} ready
            </>
          )}
          {failedClipCount > 0 ? (
            <span className="ml-2 inline-flex items-center gap-1 font-semibold text-coral-700">
              <CircleAlert aria-hidden="true" className="size-3.5" />
              {failedClipCount} failed
            </span>
          ) : null}
        </span>
      );
    },
  },
  { id: "status", accessorFn: (row) => row.status, header: "Status", cell: ({ row }) => <ExamStatusTag status={row.original.status} /> },
  {
    id: "updatedAt",
    header: "Updated",
    enableSorting: false,
    cell: ({ row }) => <span className="whitespace-nowrap tabular-nums text-slate-700">{formatDateTime(row.original.updatedAt)}</span>,
  },
];

type Props = {
  items: ExamListItem[];
  sorting: SortingState;
  onSortingChange: (next: SortingState) => void;
  busy?: boolean;
};

export function ExamsTable({ items, sorting, onSortingChange, busy }: Props) {
  const navigate = useNavigate();
  const data = useMemo(() => items, [items]);
  // TanStack Table returns functions that change identity each render; the React Compiler
  // lint cannot see that, and this component does not memoise on them.
  // eslint-disable-next-line react-hooks/incompatible-library
  const table = useReactTable({
    data,
    columns,
    getRowId: (row) => row.id,
    getCoreRowModel: getCoreRowModel(),
    manualSorting: true,
    manualPagination: true,
    manualFiltering: true,
    enableMultiSort: false,
    enableSortingRemoval: false,
    sortDescFirst: true,
    state: { sorting },
    onSortingChange: (updater) => onSortingChange(typeof updater === "function" ? updater(sorting) : updater),
  });

  return (
    <div className="overflow-x-auto rounded-lg border border-slate-200 bg-white" aria-busy={busy || undefined}>
      <table className="w-full text-left text-sm">
        <caption className="sr-only">My exams. Select a column heading to sort; select a code to open the exam.</caption>
        <thead className="border-b border-slate-200 bg-paper-200 text-xs uppercase tracking-wide text-slate-700">
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id}>
              {group.headers.map((header) => (
                <SortableHeader key={header.id} header={header} className="px-3 py-2 font-semibold" />
              ))}
            </tr>
          ))}
        </thead>
        <tbody className={`divide-y divide-slate-100 ${busy ? "opacity-60" : ""}`}>
          {table.getRowModel().rows.map((row) => (
            <tr key={row.id} onClick={() => navigate(`/exams/${row.original.id}`)} className="cursor-pointer hover:bg-sea-50">
              {row.getVisibleCells().map((cell) => (
                <td key={cell.id} className="px-3 py-2 text-ink-900">
                  {flexRender(cell.column.columnDef.cell, cell.getContext())}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
