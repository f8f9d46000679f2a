// One file on its way to the server: its progress, or why the server refused it.
import { CircleAlert, FileVideo } from "lucide-react";
import { Button } from "../../../components/ui/button";
import { ProgressBar } from "../../../components/ui/progress-bar";
import { StatusTag } from "../../../components/ui/status-tag";
import { formatBytes } from "../../../lib/bytes";
import type { UploadItem } from "../api/clip-uploads";

export function UploadRow({ item, onRetry, onDismiss }: { item: UploadItem; onRetry: () => void; onDismiss: () => void }) {
  const refused = item.status === "refused";
  return (
    <li className={`rounded-lg border bg-white p-3 ${refused ? "border-coral-300" : "border-slate-200"}`} aria-label={`Upload of ${item.file.name}`}>
      <div className="flex flex-wrap items-center gap-3">
        <div className="flex size-16 shrink-0 items-center justify-center rounded bg-ink-950 text-ink-300">
          <FileVideo aria-hidden="true" className="size-6" />
        </div>
        <div className="min-w-0 flex-1">
          <p className="truncate text-sm font-semibold text-ink-950">{item.file.name}</p>
          <p className="text-xs tabular-nums text-slate-600">{formatBytes(item.file.size)}</p>
          {refused ? (
            <p role="alert" className="mt-1 flex items-start gap-1.5 text-sm text-coral-800">
              <CircleAlert aria-hidden="true" className="mt-0.5 size-4 shrink-0" />
              <span>{item.error}</span>
            </p>
          ) : (
            <div className="mt-1.5 max-w-md">
              <ProgressBar value={item.progress} label={`Uploading ${item.file.name}`} />
            </div>
          )}
        </div>
        <div className="flex items-center gap-2">
          {refused ? (
            <>
              <StatusTag tone="problem">Not uploaded</StatusTag>
              {item.retryable ? (
                <Button variant="secondary" size="sm" onClick={onRetry}>
                  Try again
                </Button>
              ) : null}
              <Button variant="ghost" size="sm" onClick={onDismiss} aria-label={`Dismiss ${item.file.name}`}>
                Dismiss
              </Button>
            </>
          ) : (
            <StatusTag tone="waiting">Uploading</StatusTag>
          )}
        </div>
      </div>
    </li>
  );
}
