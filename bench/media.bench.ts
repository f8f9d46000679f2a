// What the media pipeline costs on top of ffmpeg. A generated 20 s 1080p MPEG-4 Part 2 AVI goes
// through processVideo (probe, plan, transcode with the poster/strip frames tapped from the same
// run, poster and strip JPEGs, a probe of the output) and through bare ffmpeg doing the same
// encode (same filters, encoder and settings) straight to MP4, alternately, in the same run; the
// ratio of the best times is the overhead (target ≤ 1.15). Then the stream-copy path on a 20 s
// 1080p H.264 MP4 with a keyframe every second (the pipeline's own output), in multiples of real
// time (target ≥ 50×): the whole processVideo, and the bare ffmpeg copy as its reference.
// Other work on the machine moves the seconds; read the ratios, and the best of several rounds.
import fs from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { generateDemoClip } from "../seeds/clips/generate";
import { ffmpeg, fileUrl } from "../server/media/exec";
import { ffmpegArgs, planVideo } from "../server/media/plan";
import { probe } from "../server/media/probe";
import { processVideo } from "../server/media/video";

const SECONDS = 20;
const ROUNDS = 3;
const dir = await fs.mkdtemp(path.join(os.tmpdir(), "soundings-bench-media-"));

async function time(fn: () => Promise<unknown>): Promise<number> {
  const t0 = performance.now();
  await fn();
  return (performance.now() - t0) / 1000;
}

try {
  const avi = path.join(dir, "source.avi");
  process.stdout.write(`generating a ${SECONDS} s 1920×1080 MPEG-4 Part 2 AVI... `);
  const gen = await time(() =>
    generateDemoClip(avi, {
      footprint: "curvilinear",
      seconds: SECONDS,
      fps: 30,
      width: 1920,
      height: 1080,
      container: "avi",
      codec: "mpeg4",
      audio: true,
      unusedDepth: 0.1,
    }),
  );
  console.log(`${gen.toFixed(1)} s`);

  const plan = planVideo(await probe(avi));
  const bareArgs = ffmpegArgs(plan, fileUrl(avi), fileUrl(path.join(dir, "bare.mp4")));
  const bare: number[] = [];
  const pipeline: number[] = [];
  for (let r = 0; r < ROUNDS; r++) {
    bare.push(await time(() => ffmpeg(bareArgs, "bare transcode")));
    pipeline.push(await time(() => processVideo(avi, path.join(dir, `out-${r}`))));
    console.log(`round ${r + 1}: bare ffmpeg ${bare[r].toFixed(2)} s, processVideo ${pipeline[r].toFixed(2)} s`);
  }
  const b = Math.min(...bare);
  const p = Math.min(...pipeline);
  console.log(`reference  bare ffmpeg transcode   ${b.toFixed(2)} s (best of ${ROUNDS})`);
  console.log(`measured   processVideo transcode  ${p.toFixed(2)} s (best of ${ROUNDS})`);
  console.log(`ratio (processVideo / bare): ${(p / b).toFixed(3)}  (target ≤ 1.15)`);

  const mp4 = path.join(dir, "out-0", "video.mp4");
  const copyPlan = planVideo(await probe(mp4));
  if (copyPlan.video !== "copy") throw new Error(`expected a stream copy, got: ${copyPlan.reasons.join("; ")}`);
  const bareCopyArgs = ffmpegArgs(copyPlan, fileUrl(mp4), fileUrl(path.join(dir, "bare-copy.mp4")));
  const copies: number[] = [];
  const bareCopies: number[] = [];
  for (let r = 0; r < ROUNDS; r++) {
    bareCopies.push(await time(() => ffmpeg(bareCopyArgs, "bare copy")));
    copies.push(await time(() => processVideo(mp4, path.join(dir, `copy-${r}`))));
  }
  const c = Math.min(...copies);
  const bc = Math.min(...bareCopies);
  console.log(`reference  bare ffmpeg stream copy ${bc.toFixed(3)} s: ${(SECONDS / bc).toFixed(1)}× real time`);
  console.log(
    `measured   processVideo stream copy ${c.toFixed(3)} s (probe, copy + keyframe decode, poster, strip, probe): ${(SECONDS / c).toFixed(1)}× real time  (target ≥ 50×)`,
  );
} finally {
  await fs.rm(dir, { recursive: true, force: true });
}
