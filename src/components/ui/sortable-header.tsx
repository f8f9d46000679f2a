// A column heading of a TanStack table: a button that cycles the sort, an arrow icon that
// shows the direction, and aria-sort on the <th> so screen readers announce it.
import { flexRender, type Header } from "@tanstack/react-table";
import { ArrowDown, ArrowUp, ArrowUpDown } from "lucide-react";

export function SortableHeader<T>({ header, className }: { header: Header<T, unknown>; className: string }) {
  const numeric = (header.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric;
  const label = flexRender(header.column.columnDef.header, header.getContext());
  const canSort = header.column.getCanSort();
  const dir = header.column.getIsSorted();
  const Icon = dir === "asc" ? ArrowUp : dir === "desc" ? ArrowDown : ArrowUpDown;
  return (
    <th scope="col" className={className} aria-sort={dir === "asc" ? "ascending" : dir === "desc" ? "descending" : canSort ? "none" : undefined}>
      {canSort ? (
        <button
          type="button"
          onClick={header.column.getToggleSortingHandler()}
          className={`inline-flex items-center gap-1 rounded uppercase tracking-wide hover:text-ink-950 focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-sea-600 ${numeric ? "flex-row-reverse" : ""}`}
        >
          {label}
          <Icon aria-hidden="true" className={`size-3.5 ${dir ? "" : "text-slate-400"}`} />
        </button>
      ) : (
        label
      )}
    </th>
  );
}
