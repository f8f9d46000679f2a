// The exam's clips as a row of thumbnails on the viewing surface; the current one is marked
// in words and outline. The [ and ] keys move along it too (handled by the workspace).
import { Image as ImageIcon, Video } from "lucide-react";
import type { ReviewClip } from "../api/workspace";
import { Kbd } from "../../../components/ui/kbd";

export function clipTitle(clip: ReviewClip, index: number, views: { key: string; label: string }[]): string {
  const view = views.find((v) => v.key === clip.view)?.label ?? clip.view;
  return `Clip ${index + 1}${view ? `: ${view}` : ""}`;
}

export function ClipSwitcher({
  clips,
  current,
  views,
  onSelect,
}: {
  clips: ReviewClip[];
  current: number;
  views: { key: string; label: string }[];
  onSelect: (i: number) => void;
}) {
  if (clips.length < 2) return null;
  return (
    <nav aria-label="Clips of this exam" className="border-t border-ink-800 px-2 py-2">
      <div className="mb-1 flex items-center gap-2 text-xs text-ink-200">
        <span className="font-semibold text-ink-100">
          Clip {current + 1} of {clips.length}
        </span>
        <span className="inline-flex items-center gap-1">
          <Kbd tone="dark">[</Kbd> <Kbd tone="dark">]</Kbd> to switch
        </span>
      </div>
      <ul className="flex gap-2 overflow-x-auto pb-1">
        {clips.map((clip, i) => {
          const title = clipTitle(clip, i, views);
          const selected = i === current;
          const Icon = clip.kind === "video" ? Video : ImageIcon;
          return (
            <li key={clip.id} className="shrink-0">
              <button
                type="button"
                onClick={() => onSelect(i)}
                aria-current={selected ? "true" : undefined}
                aria-label={`${title} (${clip.kind === "video" ? `video${clip.seconds ? `, ${clip.seconds.toFixed(1)} s` : ""}` : "still"})`}
                className={
                  "block w-28 rounded-md p-1 text-left focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-sea-300 " +
                  (selected ? "bg-ink-800 ring-2 ring-sea-400" : "hover:bg-ink-900")
                }
              >
                {clip.media.thumb ? (
                  <img src={clip.media.thumb} alt="" className="aspect-video w-full rounded-sm bg-black object-cover" />
                ) : (
                  <span className="flex aspect-video w-full items-center justify-center rounded-sm bg-black text-ink-300">
                    <Icon aria-hidden="true" className="size-5" />
                  </span>
                )}
                <span className="mt-1 flex items-center gap-1 truncate text-xs text-ink-100">
                  <Icon aria-hidden="true" className="size-3 shrink-0" />
                  <span className="truncate">{title.replace(/^Clip /, "")}</span>
                </span>
              </button>
            </li>
          );
        })}
      </ul>
    </nav>
  );
}
