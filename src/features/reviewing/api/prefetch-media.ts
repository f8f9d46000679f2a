// Warms the browser cache with the next exam's media so it shows at once: every thumbnail,
// the first clip's poster and strip, and the first part of its video (a ranged request, so
// a long clip is not downloaded whole). Best effort: failures are ignored.
import type { Workspace } from "./workspace";

/** How much of the first video to fetch ahead: enough for the first seconds of a typical clip. */
const VIDEO_HEAD_BYTES = 1024 * 1024;

const warmImage = (src: string | null) => {
  if (!src) return;
  const img = new Image();
  img.decoding = "async";
  img.src = src;
};

export function prefetchWorkspaceMedia(workspace: Workspace) {
  const [first, ...rest] = workspace.exam.clips;
  if (!first) return;
  warmImage(first.media.poster ?? first.media.image);
  warmImage(first.media.strip);
  for (const clip of [first, ...rest]) warmImage(clip.media.thumb);
  if (first.media.video) {
    void fetch(first.media.video, { credentials: "include", headers: { Range: `bytes=0-${VIDEO_HEAD_BYTES - 1}` } })
      .then((r) => r.arrayBuffer())
      .catch(() => undefined);
  }
}
