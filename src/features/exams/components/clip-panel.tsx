// One clip on the exam page: the player on the viewing surface, its state and facts, and —
// while the exam is a draft — its view label, redaction, retry and removal.
import { useState } from "react";
import { CircleAlert } from "lucide-react";
import type { Clip } from "../../../../shared/schemas/exams";
import { Button } from "../../../components/ui/button";
import { formatBytes } from "../../../lib/bytes";
import { useRemoveClip, useRetryClip, useUpdateClip } from "../api/exams";
import { ClipPlayer } from "./clip-player";
import { ClipStateTag } from "./clip-state-tag";
import { RedactionEditor } from "./redaction-editor";
import { ViewSelect } from "./view-select";
import { dicomFacts } from "../../../lib/dicom";

type Props = {
  examId: string;
  clip: Clip;
  index: number;
  views: { key: string; label: string }[];
  editable: boolean;
};

export function ClipPanel({ examId, clip, index, views, editable }: Props) {
  const [redacting, setRedacting] = useState(false);
  const update = useUpdateClip(examId);
  const retry = useRetryClip(examId);
  const remove = useRemoveClip(examId);
  const viewLabel = views.find((v) => v.key === clip.view)?.label ?? clip.view;
  const title = `Clip ${index + 1}${viewLabel ? `: ${viewLabel}` : ""}`;
  const headingId = `clip-${clip.id}-heading`;
  const actionError = retry.error?.message ?? remove.error?.message ?? null;

  const facts: [string, string][] = [
    ["Kind", clip.kind === "still" ? "Still image" : "Video"],
    ["File", clip.originalName || "—"],
    ["Size", formatBytes(clip.sizeBytes)],
  ];
  if (clip.width && clip.height) facts.push(["Frame", `${clip.width}×${clip.height}`]);
  if (clip.seconds) facts.push(["Length", `${clip.seconds.toFixed(1)} s`]);
  if (clip.fps) facts.push(["Frame rate", `${Math.round(clip.fps)} fps`]);
  facts.push(...dicomFacts(clip.dicom));
  facts.push(["Redaction", clip.redactions.length ? `${clip.redactions.length} ${clip.redactions.length === 1 ? "box" : "boxes"}` : "None"]);

  return (
    <section id={`clip-${clip.id}`} aria-labelledby={headingId} className="scroll-mt-6 rounded-lg border border-slate-200 bg-white p-4">
      <div className="mb-3 flex flex-wrap items-center justify-between gap-2">
        <h3 id={headingId} className="font-semibold text-ink-950">
          {title}
        </h3>
        {/* The one element that names the clip's state (announced when it changes). */}
        <span role="status" aria-label={`State of ${title}`}>
          <ClipStateTag state={clip.state} />
        </span>
      </div>
      <div className="grid gap-4 lg:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
        <div>
          {redacting && clip.state === "ready" ? (
            <RedactionEditor
              clip={clip}
              label={title}
              saving={update.isPending}
              error={update.isError ? update.error.message : null}
              onCancel={() => setRedacting(false)}
              onSave={(redactions) => update.mutate({ clipId: clip.id, body: { redactions } }, { onSuccess: () => setRedacting(false) })}
            />
          ) : (
            <ClipPlayer clip={clip} label={title} />
          )}
        </div>
        <div className="space-y-4">
          <dl className="grid grid-cols-[6rem_1fr] gap-x-3 gap-y-1 text-sm">
            {facts.map(([k, v]) => (
              <div key={k} className="contents">
                <dt className="text-slate-600">{k}</dt>
                <dd className="min-w-0 truncate tabular-nums text-ink-900">{v}</dd>
              </div>
            ))}
          </dl>
          {clip.state === "failed" && clip.error ? (
            <p className="flex items-start gap-1.5 text-sm text-coral-800">
              <CircleAlert aria-hidden="true" className="mt-0.5 size-4 shrink-0" />
              <span>{clip.error}</span>
            </p>
          ) : null}
          {actionError ? (
            <p role="alert" className="text-sm text-coral-800">
              {actionError}
            </p>
          ) : null}
          {editable ? (
            <>
              <ViewSelect examId={examId} clip={clip} views={views} />
              <div className="flex flex-wrap gap-2">
                {clip.state === "ready" && !redacting ? (
                  <Button variant="secondary" size="sm" onClick={() => setRedacting(true)}>
                    Redact…
                  </Button>
                ) : null}
                {clip.state === "failed" ? (
                  <Button variant="secondary" size="sm" busy={retry.isPending} onClick={() => retry.mutate(clip.id)}>
                    Retry
                  </Button>
                ) : null}
                <Button variant="ghost" size="sm" busy={remove.isPending} onClick={() => remove.mutate(clip.id)} aria-label={`Remove ${title}`}>
                  Remove
                </Button>
              </div>
            </>
          ) : null}
        </div>
      </div>
    </section>
  );
}
