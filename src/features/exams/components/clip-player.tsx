// A clip on the dark viewing surface: the video (looping, muted, inline, with controls) or
// the still, its frame strip, and in the meantime a placeholder. The clip's state itself is
// named once, by the status tag beside the player (ClipPanel), never here as well.
import { useState } from "react";
import { CircleAlert, LoaderCircle } from "lucide-react";
import type { Clip } from "../../../../shared/schemas/exams";

export function ClipPlayer({ clip, label }: { clip: Clip; label: string }) {
  const [loop, setLoop] = useState(true);
  const ready = clip.state === "ready";

  if (!ready) {
    return (
      <div className="flex aspect-video w-full flex-col items-center justify-center gap-2 rounded-md bg-ink-950 px-4 text-center text-sm text-ink-100">
        {clip.state === "failed" ? (
          <>
            <CircleAlert aria-hidden="true" className="size-6 text-coral-300" />
            <p className="text-ink-200">No playable copy of this clip.</p>
          </>
        ) : (
          <>
            <LoaderCircle aria-hidden="true" className="size-6 animate-spin text-sea-300" />
            <p className="text-ink-200">The player appears here when the clip is ready.</p>
          </>
        )}
      </div>
    );
  }

  return (
    <div className="rounded-md bg-ink-950 p-2">
      {clip.kind === "video" && clip.media.video ? (
        <>
          <video
            key={clip.media.video}
            src={clip.media.video}
            poster={clip.media.poster ?? undefined}
            aria-label={label}
            controls
            loop={loop}
            muted
            playsInline
            preload="metadata"
            className="mx-auto max-h-[60vh] w-full bg-ink-950 object-contain"
          />
          <label className="mt-2 inline-flex items-center gap-2 px-1 text-sm text-ink-100">
            <input type="checkbox" checked={loop} onChange={(e) => setLoop(e.target.checked)} className="size-4 accent-sea-400" />
            Loop
          </label>
        </>
      ) : clip.media.image ? (
        <img src={clip.media.image} alt={label} className="mx-auto max-h-[60vh] w-full object-contain" />
      ) : null}
      {clip.media.strip ? (
        <div className="mt-2 overflow-x-auto">
          <img src={clip.media.strip} alt={`Frame strip of ${label}`} className="h-16 max-w-none" />
        </div>
      ) : null}
    </div>
  );
}
