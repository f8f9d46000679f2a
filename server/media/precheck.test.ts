// Pre-check hints on generated clips with known properties. These check OUR OWN heuristics on
// OUR OWN synthetic inputs (seeds/clips/generate.ts): they show the hints move the right way
// when footprint, gain or depth change, not that they are right on real patients' images.
import { execFile } from "node:child_process";
import fs from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { generateDemoClip, generateDemoStill, type DemoClipOptions } from "../../seeds/clips/generate";
import { MediaError } from "./exec";
import { analyseFrames, depthAgainstTypical, footprintMatches, precheckFile, type PrecheckResult } from "./precheck";
import { usMultiframe } from "../../tests/fixtures/dicom";

const run = promisify(execFile);
let dir: string;
const results: Record<string, PrecheckResult> = {};
const base = { seconds: 1, fps: 10, width: 320, height: 240 };
const CLIPS: Record<string, Omit<DemoClipOptions, "seconds" | "fps" | "width" | "height"> & { still?: boolean }> = {
  linear: { footprint: "linear", unusedDepth: 0.1 },
  curvilinear: { footprint: "curvilinear", unusedDepth: 0.1, container: "avi" },
  phased: { footprint: "phased", unusedDepth: 0.1, container: "webm" },
  low: { footprint: "curvilinear", gain: "low", unusedDepth: 0.1 },
  high: { footprint: "curvilinear", gain: "high", unusedDepth: 0.1 },
  deep: { footprint: "phased", unusedDepth: 0.4 },
  shallow: { footprint: "linear", unusedDepth: 0 },
  stillDeep: { footprint: "linear", unusedDepth: 0.45, still: true },
};

beforeAll(async () => {
  dir = await fs.mkdtemp(path.join(os.tmpdir(), "soundings-precheck-test-"));
  await Promise.all(
    Object.entries(CLIPS).map(async ([name, o]) => {
      const file = path.join(dir, `${name}.${o.still ? "png" : (o.container ?? "mp4")}`);
      if (o.still) await generateDemoStill(file, { ...base, ...o });
      else await generateDemoClip(file, { ...base, ...o });
      results[name] = await precheckFile(file, { transducer: "curvilinear" });
    }),
  );
}, 60_000);

afterAll(async () => {
  if (dir) await fs.rm(dir, { recursive: true, force: true });
});

describe("precheck on synthetic clips", () => {
  it("tells the footprints apart", () => {
    expect(results.linear.footprint.shape).toBe("linear");
    expect(results.curvilinear.footprint.shape).toBe("curvilinear");
    expect(results.phased.footprint.shape).toBe("phased");
    expect(results.stillDeep.footprint.shape).toBe("linear");
  });
  it("says whether the footprint fits the recorded transducer", () => {
    expect(results.curvilinear.transducerMatch).toBe(true);
    expect(results.phased.transducerMatch).toBe(false);
    expect(footprintMatches("phased", "endocavitary")).toBe(true);
    expect(footprintMatches("unknown", "linear")).toBeNull();
  });
  it("gives low, balanced and high gain", () => {
    expect(results.low.gain.hint).toBe("low");
    expect(results.curvilinear.gain.hint).toBe("balanced");
    expect(results.high.gain.hint).toBe("high");
    expect(results.low.gain.meanLuma).toBeLessThan(results.curvilinear.gain.meanLuma);
    expect(results.high.gain.saturatedShare).toBeGreaterThan(results.curvilinear.gain.saturatedShare);
  });
  it("finds unused depth at the bottom", () => {
    expect(results.deep.depth.hint).toBe("too_deep");
    expect(results.deep.depth.unusedShare).toBeGreaterThan(0.3);
    expect(results.stillDeep.depth.hint).toBe("too_deep");
    expect(results.linear.depth.hint).toBe("fits");
    expect(results.shallow.depth.hint).toBe("maybe_shallow");
  });
  it("reports clip length, rate and frames (still: one frame)", () => {
    for (const name of ["linear", "curvilinear", "phased"]) {
      expect(results[name].clip.seconds).toBeCloseTo(1, 1);
      expect(results[name].clip.fps).toBe(10);
      expect(results[name].clip.frames).toBe(10);
    }
    expect(results.stillDeep.clip).toEqual({ seconds: 0, fps: 0, frames: 1 });
  });
  it("says unknown for a frame with no imaging area", () => {
    const flat = { width: 64, height: 48, data: new Uint8Array(64 * 48) };
    expect(analyseFrames([flat]).footprint.shape).toBe("unknown");
  });
  it("refuses what it cannot read with a MediaError", async () => {
    const text = path.join(dir, "notes.mp4");
    await fs.writeFile(text, "not a video\n");
    await expect(precheckFile(text)).rejects.toThrow(MediaError);
  });
});

describe("npm run precheck", () => {
  it("prints one JSON line per file and exits non-zero when one is unreadable", async () => {
    const good = path.join(dir, "linear.mp4");
    const bad = path.join(dir, "missing.mp4");
    const err = await run(process.execPath, ["--import", "tsx", path.resolve("scripts/precheck.ts"), good, bad]).catch(
      (e: unknown) => e as { code: number; stdout: string },
    );
    expect((err as { code: number }).code).toBe(1);
    const lines = (err as { stdout: string }).stdout
      .trim()
      .split("\n")
      .map((l) => JSON.parse(l));
    expect(lines).toHaveLength(2);
    expect(lines[0]).toMatchObject({ file: good, gain: { hint: "balanced" }, depth: { hint: "fits" }, footprint: { shape: "linear" }, clip: { frames: 10 } });
    expect(typeof lines[0].gain.meanLuma).toBe("number");
    expect(typeof lines[0].depth.unusedShare).toBe("number");
    expect(lines[1].file).toBe(bad);
    expect(lines[1].error).toMatch(/./);
  });
});

describe("calibrated depth", () => {
  it("is typical within the application's range, with 10 % either side (our own allowance)", () => {
    expect(depthAgainstTypical(16, [12, 20])).toBe("within_typical");
    expect(depthAgainstTypical(22, [12, 20])).toBe("within_typical");
    expect(depthAgainstTypical(22.5, [12, 20])).toBe("deeper_than_typical");
    expect(depthAgainstTypical(10.9, [12, 20])).toBe("within_typical");
    expect(depthAgainstTypical(10.7, [12, 20])).toBe("shallower_than_typical");
  });

  it("npm run precheck reads a DICOM object: decoded frames, depth in cm from its regions, against an application", async () => {
    const file = path.join(dir, "us-cine");
    await fs.writeFile(file, usMultiframe({ frames: 6 }));
    const { stdout } = await run(process.execPath, ["--import", "tsx", path.resolve("scripts/precheck.ts"), "--application", "lung", file]);
    const line = JSON.parse(stdout.trim());
    // 400 rows × 0.02 cm = 8 cm, within the lung's 4–18 cm of the starting catalogue (shared/catalogue.ts).
    expect(line).toMatchObject({ file, depth: { cm: 8, typicalCm: [4, 18], against: "within_typical" }, clip: { frames: 6, fps: 25 } });
    expect(line.gain.hint).toMatch(/^(low|balanced|high)$/);
  }, 60_000);
});
