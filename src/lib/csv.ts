// CSV built in the browser from what a table shows, so an export always matches the screen.
// RFC 4180 quoting; text that a spreadsheet would run as a formula is defused with a quote.
import { saveBlob } from "./download";

export type CsvCell = string | number | null | undefined;

function cell(value: CsvCell): string {
  if (value === null || value === undefined) return "";
  if (typeof value === "number") return Number.isFinite(value) ? String(value) : "";
  // A leading =, +, - or @ makes spreadsheets evaluate the cell (CSV injection).
  const safe = /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

/** A CSV document (CRLF line ends) from a header row and data rows. */
export function toCsv(header: readonly string[], rows: readonly (readonly CsvCell[])[]): string {
  return [header, ...rows].map((r) => r.map(cell).join(",")).join("\r\n") + "\r\n";
}

/** Saves a CSV document as a file; a BOM lets spreadsheets read UTF-8. */
export function downloadCsv(filename: string, csv: string): void {
  saveBlob(new Blob(["\ufeff", csv], { type: "text/csv;charset=utf-8" }), filename);
}
