// One clip on the ink viewing surface: the video with play/pause, loop (on by default),
// speed from 0.25× to 2× and frame stepping at the clip's own frame rate; a still as an
// image; the frame strip under it. The workspace drives it by keyboard through `handle`.
import { useCallback, useEffect, useImperativeHandle, useRef, useState, type Ref } from "react";
import { ChevronLeft, ChevronRight, Pause, Play, Repeat } from "lucide-react";
import type { ReviewClip } from "../api/workspace";
import { Kbd } from "../../../components/ui/kbd";

export const SPEEDS = [0.25, 0.5, 0.75, 1, 1.5, 2] as const;
const FALLBACK_FPS = 30;

/** What the workspace's shortcuts can do to the player. */
export interface PlayerHandle {
  togglePlay: () => void;
  step: (direction: 1 | -1) => void;
  changeSpeed: (direction: 1 | -1) => void;
  toggleLoop: () => void;
}

const controlButton =
  "inline-flex items-center justify-center gap-1 rounded-md px-2 py-1 text-sm font-semibold text-ink-50 hover:bg-ink-800 " +
  "focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-sea-300 disabled:opacity-50";

export function ClipViewer({ clip, label, handle }: { clip: ReviewClip; label: string; handle: Ref<PlayerHandle | null> }) {
  const video = useRef<HTMLVideoElement>(null);
  const [playing, setPlaying] = useState(false);
  const [loop, setLoop] = useState(true);
  const [speed, setSpeed] = useState<number>(1);
  const [time, setTime] = useState(0);
  const [duration, setDuration] = useState(clip.seconds ?? 0);
  const fps = clip.fps && clip.fps > 0 ? clip.fps : FALLBACK_FPS;
  const frames = clip.frames ?? Math.max(1, Math.round((clip.seconds ?? 0) * fps));
  const isVideo = clip.kind === "video" && !!clip.media.video;

  useEffect(() => {
    if (video.current) video.current.playbackRate = speed;
  }, [speed]);

  const togglePlay = useCallback(() => {
    const v = video.current;
    if (!v) return;
    if (v.paused) void v.play().catch(() => undefined);
    else v.pause();
  }, []);

  const step = useCallback(
    (direction: 1 | -1) => {
      const v = video.current;
      if (!v) return;
      v.pause();
      // Land in the middle of the target frame so rounding never shows its neighbour.
      const current = Math.floor(v.currentTime * fps + 1e-3);
      const target = Math.min(Math.max(current + direction, 0), Math.max(frames - 1, 0));
      v.currentTime = (target + 0.5) / fps;
      setTime(v.currentTime);
    },
    [fps, frames],
  );

  const changeSpeed = useCallback((direction: 1 | -1) => {
    setSpeed((s) => {
      const i = SPEEDS.indexOf(s as (typeof SPEEDS)[number]);
      return SPEEDS[Math.min(Math.max((i < 0 ? 3 : i) + direction, 0), SPEEDS.length - 1)];
    });
  }, []);

  useImperativeHandle(handle, () => ({ togglePlay, step, changeSpeed, toggleLoop: () => setLoop((l) => !l) }), [togglePlay, step, changeSpeed]);

  const frame = Math.min(Math.floor(time * fps + 1e-3) + 1, frames);

  return (
    <div>
      <div className="flex min-h-48 items-center justify-center bg-black">
        {isVideo ? (
          <video
            ref={video}
            key={clip.media.video}
            src={clip.media.video ?? undefined}
            poster={clip.media.poster ?? undefined}
            aria-label={label}
            loop={loop}
            muted
            playsInline
            autoPlay
            preload="auto"
            onPlay={() => setPlaying(true)}
            onPause={() => setPlaying(false)}
            onTimeUpdate={(e) => setTime(e.currentTarget.currentTime)}
            onSeeked={(e) => setTime(e.currentTarget.currentTime)}
            onLoadedMetadata={(e) => {
              e.currentTarget.playbackRate = speed;
              if (Number.isFinite(e.currentTarget.duration)) setDuration(e.currentTarget.duration);
            }}
            className="max-h-[46vh] w-full object-contain"
          />
        ) : clip.media.image ? (
          <img src={clip.media.image} alt={label} className="max-h-[46vh] w-full object-contain" />
        ) : (
          <p className="p-6 text-sm text-ink-200">This clip has no playable media.</p>
        )}
      </div>

      {isVideo ? (
        <div role="group" aria-label="Player controls" className="flex flex-wrap items-center gap-x-2 gap-y-1 border-t border-ink-800 px-2 py-1.5">
          <button type="button" className={controlButton} onClick={togglePlay} aria-keyshortcuts="Space" aria-label={playing ? "Pause" : "Play"}>
            {playing ? <Pause aria-hidden="true" className="size-4" /> : <Play aria-hidden="true" className="size-4" />}
            <Kbd tone="dark">Space</Kbd>
          </button>
          <button type="button" className={controlButton} onClick={() => step(-1)} aria-keyshortcuts="ArrowLeft" aria-label="Previous frame">
            <ChevronLeft aria-hidden="true" className="size-4" />
          </button>
          <button type="button" className={controlButton} onClick={() => step(1)} aria-keyshortcuts="ArrowRight" aria-label="Next frame">
            <ChevronRight aria-hidden="true" className="size-4" />
          </button>
          <label className="inline-flex items-center gap-1.5 text-sm text-ink-100">
            Speed
            <select
              value={speed}
              onChange={(e) => setSpeed(Number(e.target.value))}
              className="rounded border border-ink-600 bg-ink-900 px-1 py-0.5 text-sm text-ink-50 focus-visible:outline-2 focus-visible:outline-sea-300"
            >
              {SPEEDS.map((s) => (
                <option key={s} value={s}>
                  {s}×
                </option>
              ))}
            </select>
          </label>
          <label className="inline-flex items-center gap-1.5 text-sm text-ink-100">
            <input type="checkbox" checked={loop} onChange={(e) => setLoop(e.target.checked)} className="size-4 accent-sea-400" />
            <Repeat aria-hidden="true" className="size-3.5" />
            Loop
          </label>
          <p className="ml-auto text-xs tabular-nums text-ink-200">
            {time.toFixed(2)} / {duration.toFixed(2)} s · frame {frame} / {frames} · {Math.round(fps)} fps
          </p>
        </div>
      ) : null}

      {clip.media.strip ? (
        <div className="overflow-x-auto border-t border-ink-800 px-2 py-1.5">
          <img src={clip.media.strip} alt={`Frame strip of ${label}`} className="h-12 max-w-none" />
        </div>
      ) : null}
    </div>
  );
}
