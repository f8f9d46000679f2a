// Downloading the credentialing report: the work in flight (with "Preparing report…"), the
// server's refusal in its own words, and the saved file's name. Used by the Reports screen
// and by the page of one sonographer.
import { FileSpreadsheet, FileText } from "lucide-react";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { useReportDownload, type ReportDownloadState, type ReportRequest } from "../../progress";

/** The live line under the download controls: progress, the saved file, or the error. */
export function DownloadStatus({ state }: { state: ReportDownloadState }) {
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
