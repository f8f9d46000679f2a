// One clip of a draft in the editor: thumbnail, processing state, the reason for a failure
// with Retry, its view label, and removal.
import { Link } from "react-router-dom";
import { CircleAlert, LoaderCircle } from "lucide-react";
import type { Clip } from "../../../../shared/schemas/exams";
import { Button } from "../../../components/ui/button";
import { formatBytes } from "../../../lib/bytes";
import { useRemoveClip, useRetryClip } from "../api/exams";
import { ClipStateTag } from "./clip-state-tag";
import { ViewSelect } from "./view-select";
import { dicomLine } from "../../../lib/dicom";

type Props = { examId: string; clip: Clip; views: { key: string; label: string }[]; editable: boolean };

export function ClipThumb({ clip }: { clip: Clip }) {
  const src = clip.media.poster ?? clip.media.thumb;
  return (
    <div className="flex size-16 shrink-0 items-center justify-center overflow-hidden rounded bg-ink-950 text-ink-300">
      {src ? (
        <img src={src} alt={`Poster of ${clip.originalName || "clip"}`} className="size-full object-contain" />
      ) : clip.state === "failed" ? (
        <CircleAlert aria-hidden="true" className="size-5 text-coral-300" />
      ) : (
        <LoaderCircle aria-hidden="true" className="size-5 animate-spin" />
      )}
    </div>
  );
}

export function ClipRow({ examId, clip, views, editable }: Props) {
  const retry = useRetryClip(examId);
  const remove = useRemoveClip(examId);
  const name = clip.originalName || "clip";
  const facts = [clip.kind === "still" ? "Still" : "Video", formatBytes(clip.sizeBytes)];
  if (clip.state === "ready" && clip.width && clip.height) facts.push(`${clip.width}×${clip.height}`);
  if (clip.state === "ready" && clip.seconds) facts.push(`${clip.seconds.toFixed(1)} s`);
  const dicom = dicomLine(clip.dicom);
  if (dicom) facts.push(dicom);
  const actionError = retry.error?.message ?? remove.error?.message ?? null;

  return (
    <li className={`rounded-lg border bg-white p-3 ${clip.state === "failed" ? "border-coral-300" : "border-slate-200"}`} aria-label={`Clip ${name}`}>
      <div className="flex flex-wrap items-start gap-3">
        <ClipThumb clip={clip} />
        <div className="min-w-0 flex-1">
          <div className="flex flex-wrap items-center gap-2">
            <p className="truncate text-sm font-semibold text-ink-950">{name}</p>
            <span aria-live="polite">
              <ClipStateTag state={clip.state} />
            </span>
          </div>
          <p className="text-xs tabular-nums text-slate-600">{facts.join(" · ")}</p>
          {clip.state === "queued" || clip.state === "processing" ? (
            <p className="mt-1 text-xs text-slate-600">
              {clip.state === "queued" ? "Waiting for the media worker…" : "Making a web-playable copy, poster and frame strip…"}
            </p>
          ) : null}
          {clip.state === "failed" && clip.error ? (
            <p className="mt-1 flex items-start gap-1.5 text-sm text-coral-800">
              <CircleAlert aria-hidden="true" className="mt-0.5 size-4 shrink-0" />
              <span>{clip.error}</span>
            </p>
          ) : null}
          {actionError ? (
            <p className="mt-1 text-sm text-coral-800" role="alert">
              {actionError}
            </p>
          ) : null}
        </div>
        <div className="w-full sm:w-56">
          <ViewSelect examId={examId} clip={clip} views={views} disabled={!editable} />
        </div>
        {editable ? (
          <div className="flex flex-wrap items-center gap-1 sm:flex-col sm:items-end">
            {clip.state === "failed" ? (
              <Button variant="secondary" size="sm" busy={retry.isPending} onClick={() => retry.mutate(clip.id)} aria-label={`Retry ${name}`}>
                Retry
              </Button>
            ) : null}
            {clip.state === "ready" ? (
              <Link to={`/exams/${examId}#clip-${clip.id}`} className="rounded px-2.5 py-1 text-sm font-semibold text-sea-700 hover:bg-sea-50">
                Redact…
              </Link>
            ) : null}
            <Button variant="ghost" size="sm" busy={remove.isPending} onClick={() => remove.mutate(clip.id)} aria-label={`Remove ${name}`}>
              Remove
            </Button>
          </div>
        ) : null}
      </div>
    </li>
  );
}
