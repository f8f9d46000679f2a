// The credentialing report (GET /api/reports/credentialing), a file rather than JSON: the
// sonographer downloads their own from Progress, the QA lead one sonographer's or the whole
// program's from the roster. One download at a time; leaving the screen cancels it.
import { useEffect, useRef, useState } from "react";
import { downloadFile } from "../../../lib/download";
import { errorMessage } from "../../../lib/api-errors";
import { queryString } from "../../../lib/query-string";

export type ReportFormat = "pdf" | "csv";

export interface ReportRequest {
  format: ReportFormat;
  /**
   * One sonographer; absent for the whole program. A sonographer downloading their own passes
   * their id: without it, a person who is also a QA lead would get the whole program's report.
   */
  userId?: string;
  from?: string;
  to?: string;
}

/** Fetches the credentialing report and saves it under the server's file name, which it returns. */
export function downloadCredentialingReport(req: ReportRequest, signal?: AbortSignal): Promise<string> {
  return downloadFile(`/reports/credentialing${queryString({ format: req.format, userId: req.userId, from: req.from, to: req.to })}`, {
    accept: req.format === "pdf" ? "application/pdf" : "text/csv",
    fallbackName: `credentialing-report.${req.format}`,
    signal,
    refusedMessage: (status) => (status === 403 ? "You do not have access to this report." : "The report could not be prepared. Please try again."),
  });
}

export type ReportDownloadState =
  { kind: "idle" } | { kind: "preparing"; format: ReportFormat } | { kind: "saved"; name: string } | { kind: "failed"; message: string };

/** Runs one report download at a time; leaving the screen cancels the one in flight. */
export function useReportDownload() {
  const [state, setState] = useState<ReportDownloadState>({ kind: "idle" });
  const controller = useRef<AbortController | null>(null);
  useEffect(() => () => controller.current?.abort(), []);

  const run = async (req: ReportRequest) => {
    controller.current?.abort();
    const c = new AbortController();
    controller.current = c;
    setState({ kind: "preparing", format: req.format });
    try {
      const name = await downloadCredentialingReport(req, c.signal);
      if (!c.signal.aborted) setState({ kind: "saved", name });
    } catch (error) {
      if (c.signal.aborted) return;
      setState({ kind: "failed", message: errorMessage(error, "The report could not be prepared.") });
    }
  };
  return { state, run, busy: state.kind === "preparing" };
}
