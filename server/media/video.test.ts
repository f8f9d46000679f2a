// The video pipeline end to end, checked against ffprobe's and ffmpeg's own reading of the
// outputs (not against our probe module) and sharp's reading of the poster and strip.
import { execFile } from "node:child_process";
import fs from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { generateDemoClip } from "../../seeds/clips/generate";
import { MediaError } from "./exec";
import { posterTime, processVideo, STRIP_FRAMES, STRIP_HEIGHT, stripTimes, type ProcessedVideo } from "./video";

const run = promisify(execFile);
const W = 320;
const H = 240;
/** Metadata written into every input; none of it may survive. */
const INPUT_TAGS = {
  title: "Patient name Example",
  comment: "MRN 000000 scanned bed 4",
  creation_time: "2026-01-02T03:04:05Z",
  location: "+51.5000-000.1000/",
};
/**
 * Tags that identify a person, place, time or tool. Muxers always write some structural tags
 * (major_brand, minor_version, compatible_brands, handler_name, vendor_id, language), which
 * carry nothing about the patient or the device, so the test names the identifying ones.
 */
const IDENTIFYING = [
  "title",
  "comment",
  "creation_time",
  "location",
  "location-eng",
  "com.apple.quicktime.location.ISO6709",
  "encoder",
  "date",
  "artist",
  "description",
];

let dir: string;
const inputs: Record<string, string> = {};
const outputs: Record<string, ProcessedVideo> = {};
const seiOutputs: Record<string, ProcessedVideo> = {};
let keyedOut: ProcessedVideo;

async function ffprobeJson(file: string) {
  const { stdout } = await run("ffprobe", ["-v", "error", "-print_format", "json", "-show_format", "-show_streams", file]);
  return JSON.parse(stdout) as {
    format: { format_name: string; tags?: Record<string, string> };
    streams: { codec_type: string; codec_name: string; pix_fmt?: string; width?: number; height?: number; tags?: Record<string, string> }[];
  };
}

async function videoHash(file: string): Promise<string> {
  const { stdout } = await run("ffmpeg", ["-v", "error", "-i", file, "-map", "0:v:0", "-c", "copy", "-f", "streamhash", "-hash", "sha256", "-"]);
  return stdout.trim();
}

/** Size and CRC of each video packet, as ffmpeg's framecrc muxer lists them (no decoding). */
async function packetCrcs(file: string): Promise<{ size: number; crc: string }[]> {
  const { stdout } = await run("ffmpeg", ["-v", "error", "-i", file, "-map", "0:v:0", "-c", "copy", "-f", "framecrc", "-"]);
  return stdout
    .split("\n")
    .filter((l) => /^\d/.test(l))
    .map((l) => l.split(",").map((x) => x.trim()))
    .map((f) => ({ size: Number(f[4]), crc: f[5] }));
}

/** An MD5 of each decoded frame, as ffmpeg's framemd5 muxer lists them. */
async function decodedMd5s(file: string): Promise<string[]> {
  const { stdout } = await run("ffmpeg", ["-v", "error", "-i", file, "-map", "0:v:0", "-f", "framemd5", "-"]);
  return stdout
    .split("\n")
    .filter((l) => /^\d/.test(l))
    .map((l) => l.split(",").pop()!.trim());
}

/**
 * The copy is the source's stream less its SEI units: the same pictures when decoded, and every
 * packet byte-identical except those that held SEI, which only shrink (x264 and the marker put it
 * in the first access unit).
 */
async function expectSameStreamLessSei(source: string, copy: string) {
  const [a, b] = await Promise.all([packetCrcs(source), packetCrcs(copy)]);
  expect(b.length).toBe(a.length);
  expect(a.length).toBeGreaterThan(1);
  expect(b.slice(1)).toEqual(a.slice(1));
  expect(b[0].size).toBeLessThan(a[0].size);
  expect(await decodedMd5s(copy)).toEqual(await decodedMd5s(source));
}

/** Text an H.264 SEI "user data unregistered" message carries in the marked input. */
const SEI_MARKER = "PATIENT-MARKER-12345";

/** One decoded frame of a file as RGB, read by ffmpeg. */
async function frameRgb(file: string, at: number): Promise<{ data: Buffer; width: number; height: number }> {
  const p = await ffprobeJson(file);
  const v = p.streams.find((s) => s.codec_type === "video")!;
  const { stdout } = await run("ffmpeg", ["-v", "error", "-ss", String(at), "-i", file, "-frames:v", "1", "-f", "rawvideo", "-pix_fmt", "rgb24", "-"], {
    encoding: "buffer",
    maxBuffer: 64 << 20,
  });
  return { data: stdout as unknown as Buffer, width: v.width!, height: v.height! };
}

/**
 * Largest channel value inside a normalised box (less `margin` pixels on each side), and the mean
 * outside it. The margin is there because lossy coding smears the bright picture next to a box a
 * few pixels into its edge (deblocking, ringing); that is not text showing through.
 */
function boxStats(img: { data: Buffer; width: number; height: number; channels?: number }, box: { x: number; y: number; w: number; h: number }, margin = 0) {
  const ch = img.channels ?? 3;
  let maxIn = 0;
  let sumOut = 0;
  let nOut = 0;
  for (let y = 0; y < img.height; y++)
    for (let x = 0; x < img.width; x++) {
      const inBox = x >= box.x * img.width && x < (box.x + box.w) * img.width && y >= box.y * img.height && y < (box.y + box.h) * img.height;
      const inside =
        inBox &&
        x >= box.x * img.width + margin &&
        x < (box.x + box.w) * img.width - margin &&
        y >= box.y * img.height + margin &&
        y < (box.y + box.h) * img.height - margin;
      if (inBox && !inside) continue;
      for (let c = 0; c < Math.min(3, ch); c++) {
        const v = img.data[(y * img.width + x) * ch + c];
        if (inside) maxIn = Math.max(maxIn, v);
        else {
          sumOut += v;
          nOut++;
        }
      }
    }
  return { maxIn, meanOut: sumOut / nOut };
}

const REDACT = { x: 0, y: 0, w: 0.6, h: 0.12 }; // over the burned-in text line at the top

beforeAll(async () => {
  dir = await fs.mkdtemp(path.join(os.tmpdir(), "soundings-media-test-"));
  const base = { footprint: "curvilinear" as const, seconds: 1, fps: 10, width: W, height: H, audio: true, metadata: INPUT_TAGS };
  inputs.h264 = path.join(dir, "in-h264.mp4");
  inputs.avi = path.join(dir, "in-mpeg4.avi");
  inputs.webm = path.join(dir, "in-vp9.webm");
  inputs.keyed = path.join(dir, "in-keyed.mp4");
  await Promise.all([
    // 10 s with a keyframe every second: the copy's poster and strip come from keyframes only.
    generateDemoClip(inputs.keyed, { footprint: "linear", seconds: 10, fps: 5, width: 160, height: 120, keyframeEvery: 1 }),
    generateDemoClip(inputs.h264, { ...base, container: "mp4", codec: "h264" }),
    generateDemoClip(inputs.avi, { ...base, container: "avi", codec: "mpeg4" }),
    generateDemoClip(inputs.webm, { ...base, container: "webm", codec: "vp9" }),
  ]);
  // An H.264 MP4 with the marker in an SEI user-data message, written by ffmpeg's h264_metadata
  // bitstream filter (its sei_user_data option: "UUID+string").
  inputs.sei = path.join(dir, "in-sei.mp4");
  await run("ffmpeg", [
    ...["-v", "error", "-f", "lavfi", "-i", `testsrc2=size=${W}x${H}:rate=10:duration=1`],
    ...["-c:v", "libx264", "-preset", "ultrafast", "-pix_fmt", "yuv420p"],
    ...["-bsf:v", `h264_metadata=sei_user_data=dc45e9bd-e6d9-48b7-962c-d820d923eeef+${SEI_MARKER}`, inputs.sei],
  ]);
  // A truncated MP4: the first half of a file whose index (moov) sits at the end.
  const whole = await fs.readFile(inputs.h264);
  inputs.truncated = path.join(dir, "truncated.mp4");
  await fs.writeFile(inputs.truncated, whole.subarray(0, whole.length >> 1));
  const [keyed, copy, avi, webm, redacted, seiCopy, seiTranscode] = await Promise.all([
    processVideo(inputs.keyed, path.join(dir, "out-keyed")),
    processVideo(inputs.h264, path.join(dir, "out-copy")),
    processVideo(inputs.avi, path.join(dir, "out-avi")),
    processVideo(inputs.webm, path.join(dir, "out-webm")),
    processVideo(inputs.h264, path.join(dir, "out-redacted"), { redactions: [REDACT] }),
    processVideo(inputs.sei, path.join(dir, "out-sei-copy")),
    processVideo(inputs.sei, path.join(dir, "out-sei-transcode"), { redactions: [REDACT] }),
  ]);
  Object.assign(outputs, { copy, avi, webm, redacted });
  Object.assign(seiOutputs, { copy: seiCopy, transcode: seiTranscode });
  keyedOut = keyed;
}, 120_000);

afterAll(async () => {
  if (dir) await fs.rm(dir, { recursive: true, force: true });
});

describe("processVideo", () => {
  it("gives its inputs audio and identifying metadata (so the stripping checks below can fail)", async () => {
    for (const f of [inputs.h264, inputs.avi, inputs.webm]) {
      const p = await ffprobeJson(f);
      expect(p.streams.some((s) => s.codec_type === "audio")).toBe(true);
      const tags = JSON.stringify([p.format.tags, ...p.streams.map((s) => s.tags)]);
      expect(tags).toContain("Patient name");
    }
  });

  it("stream-copies an H.264 MP4: same video packets less their SEI units, no re-encode", async () => {
    const out = outputs.copy;
    expect(out.plan.video).toBe("copy");
    const p = await ffprobeJson(out.videoPath);
    expect(p.streams.find((s) => s.codec_type === "video")?.codec_name).toBe("h264");
    await expectSameStreamLessSei(inputs.h264, out.videoPath);
  });

  it("leaves no SEI user data (which can name a patient) in a copied or a transcoded stream", async () => {
    expect((await fs.readFile(inputs.sei)).includes(SEI_MARKER)).toBe(true);
    expect(seiOutputs.copy.plan.video).toBe("copy");
    expect(seiOutputs.transcode.plan.video).toBe("transcode");
    for (const [name, out] of Object.entries(seiOutputs)) {
      const bytes = await fs.readFile(out.videoPath);
      expect(bytes.includes(SEI_MARKER), name).toBe(false);
      expect(bytes.includes("x264 - core"), name).toBe(false);
    }
    await expectSameStreamLessSei(inputs.sei, seiOutputs.copy.videoPath);
  });

  it("transcodes MPEG-4 Part 2 in AVI and VP9 in WebM to H.264", async () => {
    expect(outputs.avi.plan.video).toBe("transcode");
    expect(outputs.avi.plan.reasons.join()).toMatch(/mpeg4/);
    expect(outputs.webm.plan.video).toBe("transcode");
    expect(outputs.webm.plan.reasons.join()).toMatch(/vp9/);
    for (const o of [outputs.avi, outputs.webm]) expect(await videoHash(o.videoPath)).not.toBe(await videoHash(inputs.h264));
  });

  it("every output is H.264 yuv420p MP4 with no audio and no identifying metadata", async () => {
    for (const [name, out] of Object.entries(outputs)) {
      const p = await ffprobeJson(out.videoPath);
      expect(p.format.format_name, name).toContain("mp4");
      expect(
        p.streams.map((s) => s.codec_type),
        name,
      ).toEqual(["video"]);
      expect(p.streams[0].codec_name, name).toBe("h264");
      expect(p.streams[0].pix_fmt, name).toBe("yuv420p");
      for (const tags of [p.format.tags ?? {}, ...p.streams.map((s) => s.tags ?? {})]) {
        for (const key of IDENTIFYING)
          expect(
            Object.keys(tags).map((k) => k.toLowerCase()),
            `${name}: ${key}`,
          ).not.toContain(key.toLowerCase());
      }
      const bytes = await fs.readFile(out.videoPath);
      for (const needle of ["Patient name", "MRN 000000", "2026-01-02", "+51.5000", "Lavf"]) expect(bytes.includes(needle), `${name}: ${needle}`).toBe(false);
    }
  });

  it("leaves no encoder settings text in a transcoded stream", async () => {
    for (const out of [outputs.avi, outputs.webm, outputs.redacted]) {
      expect((await fs.readFile(out.videoPath)).includes("x264 - core")).toBe(false);
    }
  });

  it("puts the index at the front (faststart)", async () => {
    const bytes = await fs.readFile(outputs.avi.videoPath);
    expect(bytes.indexOf("moov")).toBeLessThan(bytes.indexOf("mdat"));
  });

  it("reports size, length, rate and frame count", () => {
    for (const out of Object.values(outputs)) {
      expect([out.width, out.height]).toEqual([W, H]);
      expect(out.seconds).toBeCloseTo(1, 1);
      expect(out.fps).toBeCloseTo(10, 1);
      expect(out.frames).toBe(10);
    }
  });

  it("paints redaction boxes black in the video, the poster and the strip", async () => {
    const out = outputs.redacted;
    expect(out.plan.video).toBe("transcode");
    expect(out.plan.reasons.join()).toMatch(/redaction/);
    // Before: the input has the bright text line there.
    expect(boxStats(await frameRgb(inputs.h264, 0.5), REDACT).maxIn).toBeGreaterThan(150);
    const frame = boxStats(await frameRgb(out.videoPath, 0.5), REDACT, 4);
    expect(frame.maxIn).toBeLessThanOrEqual(6);
    expect(frame.meanOut).toBeGreaterThan(20);
    for (const file of [out.posterPath, out.stripPath]) {
      const { data, info } = await sharp(file).raw().toBuffer({ resolveWithObject: true });
      // The strip is 8 frames side by side: check the box in the first tile (JPEG allows a little ringing).
      const tileW = file === out.stripPath ? info.width / STRIP_FRAMES : info.width;
      const inTile = { ...REDACT, w: (REDACT.w * tileW) / info.width };
      const s = boxStats({ data, width: info.width, height: info.height, channels: info.channels }, inTile, file === out.stripPath ? 2 : 4);
      expect(s.maxIn, file).toBeLessThanOrEqual(24);
      expect(s.meanOut, file).toBeGreaterThan(20);
    }
  });

  it("makes a JPEG poster at full size and a JPEG strip of 8 frames 160 px high", async () => {
    for (const out of Object.values(outputs)) {
      const poster = await sharp(out.posterPath).metadata();
      expect(poster.format).toBe("jpeg");
      expect([poster.width, poster.height]).toEqual([W, H]);
      expect(poster.exif).toBeUndefined();
      const strip = await sharp(out.stripPath).metadata();
      expect(strip.format).toBe("jpeg");
      expect(strip.height).toBe(STRIP_HEIGHT);
      const tileW = 2 * Math.round((W * STRIP_HEIGHT) / H / 2);
      expect(strip.width).toBe(STRIP_FRAMES * tileW);
    }
  });

  it("answers a truncated MP4 with a readable MediaError and leaves no output", async () => {
    const outDir = path.join(dir, "out-truncated");
    const err = await processVideo(inputs.truncated, outDir).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(MediaError);
    expect((err as Error).message).toMatch(/^The file could not be read as video: .*moov atom not found/);
    expect((err as Error).message).not.toContain(dir); // no storage paths in what people read
    await expect(fs.readdir(outDir).catch(() => [])).resolves.toEqual([]);
  });
});

describe("poster and strip timing", () => {
  it("takes the poster at 10% (or 0.5 s in a short clip) and spreads the strip from there", () => {
    expect(posterTime(20)).toBeCloseTo(2);
    expect(posterTime(3)).toBe(0.5);
    expect(posterTime(0.4)).toBeCloseTo(0.2);
    const t = stripTimes(20);
    expect(t).toHaveLength(STRIP_FRAMES);
    expect(t[0]).toBeCloseTo(2);
    expect(t[7]).toBeCloseTo(2 + (7 * 18) / 8);
  });

  it("cuts a stream copy's strip from keyframes at different times", async () => {
    expect(keyedOut.plan.video).toBe("copy");
    const { data, info } = await sharp(keyedOut.stripPath).raw().toBuffer({ resolveWithObject: true });
    const tileW = info.width / STRIP_FRAMES;
    const tile = (i: number) => {
      const px: number[] = [];
      for (let y = 0; y < info.height; y++) for (let x = 0; x < tileW; x++) px.push(data[(y * info.width + i * tileW + x) * info.channels]);
      return px;
    };
    // The speckle drifts over time, so tiles from different seconds differ clearly.
    const diff = (a: number[], b: number[]) => a.reduce((s, v, i) => s + Math.abs(v - b[i]), 0) / a.length;
    const tiles = Array.from({ length: STRIP_FRAMES }, (_, i) => tile(i));
    for (let i = 1; i < STRIP_FRAMES; i++) expect(diff(tiles[i - 1], tiles[i]), `tile ${i}`).toBeGreaterThan(5);
    expect(keyedOut.frames).toBe(50);
    // Tile 1 wants t = 2.125 s: a keyframe-only decode gives the keyframe at 3.0 s, a full decode the
    // frame at 2.2 s. Compare it with both, decoded by ffmpeg at the tile's size.
    const at = async (t: number) => {
      const { stdout } = await run(
        "ffmpeg",
        [
          "-v",
          "error",
          "-i",
          inputs.keyed,
          "-vf",
          `select='gte(t\\,${t})',scale=${tileW}:${info.height}`,
          "-frames:v",
          "1",
          "-f",
          "rawvideo",
          "-pix_fmt",
          "rgb24",
          "-",
        ],
        { encoding: "buffer" },
      );
      return Array.from({ length: tileW * info.height }, (_, i) => (stdout as unknown as Buffer)[i * 3]);
    };
    expect(diff(tiles[1], await at(3))).toBeLessThan(diff(tiles[1], await at(2.2)));
  });
});
