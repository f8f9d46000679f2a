// "Export CSV" for a table: builds the file in the browser from the rows on screen.
import { Download } from "lucide-react";
import { downloadCsv, toCsv, type CsvCell } from "../../lib/csv";
import { Button } from "./button";

export function ExportCsvButton({
  filename,
  header,
  rows,
  label = "Export CSV",
  what,
}: {
  filename: string;
  header: readonly string[];
  rows: () => readonly (readonly CsvCell[])[];
  label?: string;
  /** What the table holds, for the accessible name ("Export CSV of reviewer workload"). */
  what: string;
}) {
  return (
    <Button variant="secondary" size="sm" aria-label={`${label} of ${what}`} onClick={() => downloadCsv(filename, toCsv(header, rows()))}>
      <Download aria-hidden="true" className="size-4" />
      {label}
    </Button>
  );
}
