// The copy-or-transcode decision and its ffmpeg arguments, without any binary.
import { describe, expect, it } from "vitest";
import { MediaError } from "./exec";
import { ffmpegArgs, fitWithin1080, planVideo, redactionPixels, selectAtTimes } from "./plan";
import { parseProbe, type ProbeResult } from "./probe";

function probeOf(over: { codec?: string; pixFmt?: string; width?: number; height?: number; format?: string; rotation?: number } = {}): ProbeResult {
  return parseProbe(
    JSON.stringify({
      format: { format_name: over.format ?? "mov,mp4,m4a,3gp,3g2,mj2", duration: "3.0" },
      streams: [
        {
          index: 0,
          codec_type: "video",
          codec_name: over.codec ?? "h264",
          pix_fmt: over.pixFmt ?? "yuv420p",
          width: over.width ?? 1280,
          height: over.height ?? 720,
          r_frame_rate: "30/1",
          avg_frame_rate: "30/1",
          side_data_list: over.rotation ? [{ rotation: over.rotation }] : undefined,
        },
        { index: 1, codec_type: "audio", codec_name: "aac" },
      ],
    }),
  );
}

describe("planVideo", () => {
  it("copies H.264 yuv420p in MP4/MOV at or under 1080p", () => {
    const plan = planVideo(probeOf());
    expect(plan.video).toBe("copy");
    expect(plan.reasons).toEqual([]);
    expect(planVideo(probeOf({ width: 1080, height: 1920 })).video).toBe("copy"); // portrait 1080p
    expect(planVideo(probeOf({ width: 1920, height: 1080 })).video).toBe("copy");
  });
  it("transcodes HEVC", () => {
    const plan = planVideo(probeOf({ codec: "hevc" }));
    expect(plan.video).toBe("transcode");
    expect(plan.reasons.join()).toMatch(/hevc/);
  });
  it("transcodes yuv422p", () => {
    const plan = planVideo(probeOf({ pixFmt: "yuv422p" }));
    expect(plan.video).toBe("transcode");
    expect(plan.reasons.join()).toMatch(/yuv422p/);
  });
  it("transcodes and downscales 4K to fit 1080p with even sides", () => {
    const plan = planVideo(probeOf({ width: 3840, height: 2160 }));
    expect(plan.video).toBe("transcode");
    expect([plan.width, plan.height]).toEqual([1920, 1080]);
    expect(fitWithin1080(2000, 1500)).toEqual({ width: 1440, height: 1080 });
    expect(fitWithin1080(1081, 1921)).toEqual({ width: 1080, height: 1920 });
    expect(fitWithin1080(641, 481)).toEqual({ width: 642, height: 482 });
  });
  it("transcodes H.264 in an AVI container", () => {
    const plan = planVideo(probeOf({ format: "avi" }));
    expect(plan.video).toBe("transcode");
    expect(plan.reasons.join()).toMatch(/container is avi/);
  });
  it("transcodes when redaction boxes are set, and ignores empty boxes", () => {
    expect(planVideo(probeOf(), { redactions: [{ x: 0.1, y: 0.1, w: 0.2, h: 0.1 }] }).video).toBe("transcode");
    expect(planVideo(probeOf(), { redactions: [{ x: 0.1, y: 0.1, w: 0, h: 0.1 }] }).video).toBe("copy");
  });
  it("reads a display rotation as a swapped size", () => {
    const plan = planVideo(probeOf({ width: 1920, height: 1080, rotation: -90 }));
    expect(plan.source).toEqual({ width: 1080, height: 1920 });
    expect(plan.video).toBe("copy");
  });
  it("refuses a file without video", () => {
    const p = probeOf();
    expect(() => planVideo({ ...p, video: null, streams: p.streams.slice(1) })).toThrow(MediaError);
  });
  it("refuses a box with a coordinate that is not a number", () => {
    expect(() => planVideo(probeOf(), { redactions: [{ x: NaN, y: 0, w: 1, h: 1 }] })).toThrow(/not a number/);
  });
});

describe("ffmpegArgs", () => {
  const tap = { times: [0.5, 1], width: 1280, height: 720 };
  it("always drops audio, subtitles, data, chapters and metadata, and writes no encoder tag", () => {
    for (const plan of [planVideo(probeOf()), planVideo(probeOf({ codec: "vp9", format: "matroska,webm" }))]) {
      const a = ffmpegArgs(plan, "in", "out").join(" ");
      for (const opt of ["-an", "-sn", "-dn", "-map_metadata -1", "-map_chapters -1", "-fflags +bitexact", "-movflags +faststart -"]) {
        expect(a).toContain(opt);
      }
      expect(a).toMatch(/ -f mp4 -y out$/);
    }
  });
  it("copies the stream, decoding only keyframes for the frame tap", () => {
    const a = ffmpegArgs(planVideo(probeOf()), "in", "out", { tap: { ...tap, keyframesOnly: true } }).join(" ");
    expect(a).toMatch(
      /^-skip_frame nokey -i in -map 0:v:0 .* -c:v copy -bsf:v filter_units=remove_types=6 -f mp4 -y out -map 0:v:0 -vf select=.* -frames:v 2 -f rawvideo pipe:1$/,
    );
  });
  it("encodes libx264 veryfast crf 23 yuv420p with a keyframe every second", () => {
    const a = ffmpegArgs(planVideo(probeOf({ codec: "mpeg4", format: "avi" })), "in", "out", { tap }).join(" ");
    expect(a).toContain("-map [enc]");
    expect(a).toContain("-c:v libx264 -preset veryfast -crf 23 -pix_fmt yuv420p");
    expect(a).toContain("-force_key_frames expr:gte(t,n_forced*1)");
    expect(a).toContain("-flags:v +bitexact");
    expect(a).toMatch(/-map \[frames\] -fps_mode passthrough -frames:v 2 -f rawvideo pipe:1$/);
  });
  it("fills redaction boxes black at even pixel edges, before the frames are tapped", () => {
    expect(redactionPixels([{ x: 0.1, y: 0.1, w: 0.25, h: 0.5 }], 641, 480)).toEqual([{ x: 64, y: 48, w: 162, h: 240 }]);
    const box = { x: 0, y: 0, w: 0.5, h: 0.1 };
    const a = ffmpegArgs(planVideo(probeOf(), { redactions: [box] }), "in", "out", { redactions: [box], tap });
    expect(a[a.indexOf("-filter_complex") + 1]).toMatch(
      /^\[0:v:0\]scale=1280:720:flags=bicubic,setsar=1,drawbox=x=0:y=0:w=640:h=72:color=black:t=fill,format=yuv420p,split=2\[enc\]\[tap\];\[tap\]select=/,
    );
  });
  it("selects the first frame at or after each time", () => {
    expect(selectAtTimes([1])).toBe("select='gt(gte(t\\,1.0000)*(isnan(prev_pts)+lt(prev_pts*TB\\,1.0000))\\,0)'");
  });
});

describe("clip length limit", () => {
  const withDuration = (format: string, stream?: string) => {
    const p = JSON.parse(JSON.stringify(probeOf()));
    p.duration = Number(format);
    p.video.duration = stream === undefined ? null : Number(stream);
    return p as ProbeResult;
  };
  it("refuses a clip longer than 10 minutes, by the container's or the stream's length", () => {
    expect(() => planVideo(withDuration("601"))).toThrow(new MediaError("The clip is 601 s long; the limit is 600 s (10 minutes)"));
    expect(() => planVideo(withDuration("3", "3600"))).toThrow(/the limit is 600 s/);
    expect(planVideo(withDuration("600")).video).toBe("copy");
  });
});

describe("frame size limit", () => {
  it("refuses a video frame over 8192 px on a side or over 50 megapixels", () => {
    expect(() => planVideo(probeOf({ width: 16000, height: 16000 }))).toThrow(
      new MediaError("The video is 16000×16000 pixels; the limit is 8192 pixels on a side"),
    );
    expect(() => planVideo(probeOf({ width: 8192, height: 8000 }))).toThrow(
      new MediaError("The video is 8192×8000 pixels; the limit is 50 megapixels a frame"),
    );
    expect(planVideo(probeOf({ width: 3840, height: 2160 })).video).toBe("transcode"); // 4K is fine
  });
});
