// Downloading the credentialing report: the work in flight (with "Preparing report…"), the
// server's refusal in its own words, and the saved file's name. Used by the Reports screen
// and by the page of one sonographer.
import { useEffect, useRef, useState } from "react";
import { FileSpreadsheet, FileText } from "lucide-react";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { downloadCredentialingReport, type ReportFormat, type ReportRequest } from "../api/roster";
import { errorMessage } from "../../../lib/api-errors";

type State = { kind: "idle" } | { kind: "preparing"; format: ReportFormat } | { kind: "saved"; name: string } | { kind: "failed"; message: string };

/** Runs one report download at a time; leaving the screen cancels the one in flight. */
export function useReportDownload() {
  const [state, setState] = useState<State>({ kind: "idle" });
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

/** The live line under the download controls: progress, the saved file, or the error. */
export function DownloadStatus({ state }: { state: State }) {
  return (
    <div className="mt-3 space-y-2">
      <p role="status" aria-live="polite" className="text-sm text-slate-700">
        {state.kind === "preparing" ? "Preparing report…" : state.kind === "saved" ? `Report saved as ${state.name}.` : ""}
      </p>
      <FormMessage message={state.kind === "failed" ? state.message : null} />
    </div>
  );
}

/** PDF and CSV buttons for a fixed request (one sonographer, one range). */
export function ReportButtons({ request, disabled }: { request: Omit<ReportRequest, "format">; disabled?: boolean }) {
  const { state, run, busy } = useReportDownload();
  return (
    <div>
      <div className="flex flex-wrap gap-2">
        <Button
          variant="secondary"
          size="sm"
          busy={state.kind === "preparing" && state.format === "pdf"}
          disabled={busy || disabled}
          onClick={() => void run({ ...request, format: "pdf" })}
        >
          {state.kind === "preparing" && state.format === "pdf" ? null : <FileText aria-hidden="true" className="size-4" />}
          Download report (PDF)
        </Button>
        <Button
          variant="secondary"
          size="sm"
          busy={state.kind === "preparing" && state.format === "csv"}
          disabled={busy || disabled}
          onClick={() => void run({ ...request, format: "csv" })}
        >
          {state.kind === "preparing" && state.format === "csv" ? null : <FileSpreadsheet aria-hidden="true" className="size-4" />}
          Download report (CSV)
        </Button>
      </div>
      <DownloadStatus state={state} />
    </div>
  );
}
