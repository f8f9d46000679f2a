// Time limits of ffmpeg/ffprobe runs, on the real binaries: an endless source is stopped.
import { describe, expect, it, vi } from "vitest";
import { FFMPEG, ffmpeg, MediaError, runTool } from "./exec";
import { ffmpegTimeoutSeconds, FFMPEG_TIMEOUT_MAX_SECONDS, FFMPEG_TIMEOUT_MIN_SECONDS, FFMPEG_TIMEOUT_PER_CLIP_SECOND } from "./limits";

// lavfi's testsrc without a duration never ends (ffmpeg's filter documentation: "If not specified,
// or the expressed duration is negative, the video is supposed to be generated forever").
const ENDLESS = ["-f", "lavfi", "-i", "testsrc=size=64x64:rate=25", "-f", "null", "-"];

describe("tool time limits", () => {
  it("kills an ffmpeg run past its limit with SIGKILL", async () => {
    const err = (await runTool(FFMPEG, ["-nostdin", "-v", "error", ...ENDLESS], { timeoutSeconds: 0.5 }).catch((e: unknown) => e)) as NodeJS.ErrnoException & {
      signal?: string;
      timedOutAfter?: number;
    };
    expect(err).toBeInstanceOf(Error);
    expect(err.signal).toBe("SIGKILL");
    expect(err.timedOutAfter).toBe(0.5);
  });

  it("turns a killed ffmpeg run into a MediaError that says it took too long", async () => {
    const err = await ffmpeg(ENDLESS, "The video could not be converted", { timeoutSeconds: 0.5 }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(MediaError);
    expect((err as Error).message).toBe("The video could not be converted: ffmpeg took longer than 0.5 s and was stopped");
  });

  it("lets a run that finishes in time through", async () => {
    const out = await ffmpeg(["-f", "lavfi", "-i", "testsrc=size=16x16:rate=1:duration=1", "-f", "rawvideo", "-pix_fmt", "gray", "pipe:1"], "x", {
      timeoutSeconds: 30,
    });
    expect(out.length).toBe(16 * 16);
  });

  it("gives ffmpeg time in proportion to the clip, between a floor and a ceiling", () => {
    expect(ffmpegTimeoutSeconds(1)).toBe(FFMPEG_TIMEOUT_MIN_SECONDS);
    expect(ffmpegTimeoutSeconds(20)).toBe(Math.max(FFMPEG_TIMEOUT_MIN_SECONDS, 20 * FFMPEG_TIMEOUT_PER_CLIP_SECOND));
    expect(ffmpegTimeoutSeconds(10_000)).toBe(FFMPEG_TIMEOUT_MAX_SECONDS);
    expect(ffmpegTimeoutSeconds(null)).toBe(FFMPEG_TIMEOUT_MAX_SECONDS);
    expect(ffmpegTimeoutSeconds(0)).toBe(FFMPEG_TIMEOUT_MAX_SECONDS);
  });
});

describe("processVideo under a time limit", () => {
  it("fails with 'ffmpeg took longer than N s' when the conversion outlasts its limit", async () => {
    // A ceiling far below what any conversion needs, read when the modules load.
    vi.resetModules();
    vi.stubEnv("MEDIA_FFMPEG_TIMEOUT_MAX_SECONDS", "0.02");
    try {
      const fs = await import("node:fs/promises");
      const os = await import("node:os");
      const path = await import("node:path");
      const { processVideo } = await import("./video");
      const { MediaError: FreshMediaError } = await import("./exec");
      const dir = await fs.mkdtemp(path.join(os.tmpdir(), "soundings-timeout-"));
      try {
        const input = path.join(dir, "in.avi");
        await runTool(FFMPEG, ["-v", "error", "-f", "lavfi", "-i", "testsrc2=size=320x240:rate=25:duration=2", "-c:v", "mpeg4", input], { timeoutSeconds: 60 });
        const err = await processVideo(input, path.join(dir, "out")).catch((e: unknown) => e);
        expect(err).toBeInstanceOf(FreshMediaError);
        expect((err as Error).message).toBe("The video could not be converted: ffmpeg took longer than 0.02 s and was stopped");
        await expect(fs.readdir(path.join(dir, "out"))).resolves.toEqual([]);
      } finally {
        await fs.rm(dir, { recursive: true, force: true });
      }
    } finally {
      vi.unstubAllEnvs();
      vi.resetModules();
    }
  });
});

describe("trimReason", () => {
  it("drops ffmpeg's '[demuxer @ 0xaddress]' prefixes, which mean nothing to the reader", async () => {
    const { trimReason } = await import("./exec");
    expect(
      trimReason("[mov,mp4,m4a,3gp,3g2,mj2 @ 0x5556f1c2d480] moov atom not found\nfile:/tmp/x: Invalid data found when processing input\n", ["file:/tmp/x"]),
    ).toBe("moov atom not found; Invalid data found when processing input");
  });
});
