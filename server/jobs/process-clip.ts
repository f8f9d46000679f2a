// The clip job: original → web-playable H.264 MP4 (or a clean still) + poster + frame strip
// + pre-check metrics, stored under generated keys. Idempotent: a job for an old process
// version, or one already done, does nothing. Errors propagate so pg-boss retries; on the
// last attempt the reason is written on the clip for the sonographer to see.
import fsp from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import type { Db } from "../db/knex";
import type { Storage } from "../storage/types";
import type { ClipJob } from "./queue";
import { processVideo } from "../media/video";
import { processStill } from "../media/still";
import { precheckFile } from "../media/precheck";
import { prepareDicom } from "../media/dicom/process";
import { MediaError } from "../media/exec";
import type { RedactionBox } from "../../shared/schemas/exams";
import { processedKey, type ProcessedName } from "../storage/keys";
import {
  findClipForJob,
  forgetClipOriginal,
  markClipAwaitingRetry,
  markClipFailed,
  markClipProcessing,
  markClipReady,
  originalOfSubmittedClip,
  touchProcessingClip,
  typicalDepthOfClip,
} from "../repositories/clips";

export interface ClipJobContext {
  db: Db;
  storage: Storage;
  /** When "delete_on_submit", an original is dropped once its exam is submitted and the clip is done. */
  originalRetention?: "delete_on_submit" | "keep";
  log?: (e: unknown) => void;
  /**
   * How often a running job says it is alive (touches the clip), so the stuck-clip sweep does
   * not send a clip again while its job is still transcoding; below the sweep's threshold.
   */
  heartbeatSeconds?: number;
}

export interface Attempt {
  retryCount: number;
  retryLimit: number;
}

/** A message a person can act on; internal details stay in the server log. */
export function describeFailure(err: unknown): string {
  // Paths of temporary files mean nothing to the reader and reveal the server's layout.
  if (err instanceof MediaError) return err.message.replace(/(?:\/[\w.@-]+){2,}/g, "the upload");
  return "Processing failed because of a server problem; try again, and tell your program lead if it keeps failing";
}

/** Same retention rule as at submission, for clips finished after their exam was sent (imports, the demo). */
async function dropOriginalIfSubmitted(ctx: ClipJobContext, clipId: string) {
  const original = await originalOfSubmittedClip(ctx.db, clipId);
  if (!original) return;
  await forgetClipOriginal(ctx.db, clipId);
  await ctx.storage.delete(original).catch(() => undefined);
}

/** Processes one clip at one version. Throws on failure (after recording the last one). */
export async function processClipJob(ctx: ClipJobContext, job: ClipJob, attempt: Attempt): Promise<"done" | "skipped"> {
  const clip = await findClipForJob(ctx.db, job.clipId);
  if (!clip || clip.process_version !== job.version || clip.processed_version === job.version) return "skipped";
  if (!clip.original_key) {
    await markClipFailed(ctx.db, clip.id, job.version, "The original upload is no longer kept, so this clip cannot be processed again");
    return "skipped";
  }
  await markClipProcessing(ctx.db, clip.id, job.version);
  const heartbeat = ctx.heartbeatSeconds
    ? setInterval(() => void touchProcessingClip(ctx.db, clip.id, job.version).catch(() => undefined), ctx.heartbeatSeconds * 1000)
    : undefined;
  heartbeat?.unref();

  const work = await fsp.mkdtemp(path.join(os.tmpdir(), "soundings-clip-"));
  try {
    const input = path.join(work, "original");
    await ctx.storage.download(clip.original_key, input);
    const redactions = (clip.redactions ?? []) as RedactionBox[];
    const put = async (name: ProcessedName, file: string, type: string) => {
      const key = processedKey(clip.program_id, clip.id, job.version, name);
      await ctx.storage.put(key, file, type);
      return key;
    };
    let update: Record<string, unknown>;
    // A DICOM object is decoded to frames first (redacted there, and in its own pixels); the
    // frames then take the same road as any upload, and the object is kept beside them.
    const dicom = clip.mime === "application/dicom" ? await prepareDicom(input, work, { redactions }) : null;
    const source = dicom?.media ?? input;
    const boxes = dicom ? [] : redactions;
    // A calibrated depth is compared with the exam's application's typical depth.
    const typical = dicom?.facts.depthCm != null ? await typicalDepthOfClip(ctx.db, clip.id) : null;
    const precheckOpts = { depthCm: dicom?.facts.depthCm ?? null, typicalDepthCm: typical };
    if (clip.kind === "video") {
      const out = await processVideo(source, work, { redactions: boxes });
      const precheck = await precheckFile(out.videoPath, precheckOpts).catch(() => null);
      update = {
        output_key: await put("video.mp4", out.videoPath, "video/mp4"),
        poster_key: await put("poster.jpg", out.posterPath, "image/jpeg"),
        strip_key: await put("strip.jpg", out.stripPath, "image/jpeg"),
        thumb_key: null,
        plan: JSON.stringify(out.plan),
        width: out.width,
        height: out.height,
        seconds: out.seconds,
        fps: out.fps,
        frames: out.frames,
        precheck: precheck ? JSON.stringify(precheck) : null,
      };
    } else {
      const out = await processStill(source, work, { redactions: boxes });
      const isPng = out.imagePath.endsWith(".png");
      const precheck = await precheckFile(out.imagePath, precheckOpts).catch(() => null);
      const imageKey = await put(isPng ? "image.png" : "image.jpg", out.imagePath, isPng ? "image/png" : "image/jpeg");
      update = {
        output_key: imageKey,
        poster_key: imageKey,
        thumb_key: await put("thumb.jpg", out.thumbPath, "image/jpeg"),
        strip_key: null,
        width: out.width,
        height: out.height,
        precheck: precheck ? JSON.stringify(precheck) : null,
      };
    }
    if (dicom) {
      update.dicom_key = await put("object.dcm", dicom.object, "application/dicom");
      update.dicom = JSON.stringify({ ...dicom.facts, cleanedPixels: dicom.cleanedPixels });
    }
    const previous = [clip.output_key, clip.poster_key, clip.strip_key, clip.thumb_key, clip.dicom_key].filter(Boolean) as string[];
    const n = await markClipReady(ctx.db, clip.id, job.version, update);
    // Outputs of earlier versions are superseded; a newer version's job cleans up after itself.
    if (n > 0) await Promise.all(previous.filter((k) => !Object.values(update).includes(k)).map((k) => ctx.storage.delete(k).catch(() => undefined)));
    if (n > 0 && ctx.originalRetention === "delete_on_submit") await dropOriginalIfSubmitted(ctx, clip.id);
    return "done";
  } catch (err) {
    const last = attempt.retryCount >= attempt.retryLimit;
    // A file that cannot be read is the upload's problem, said on the clip; only other errors need a stack.
    ctx.log?.(err instanceof MediaError ? `clip ${clip.id}: ${err.message}${last ? "" : " (will retry)"}` : err);
    if (last) await markClipFailed(ctx.db, clip.id, job.version, describeFailure(err));
    else await markClipAwaitingRetry(ctx.db, clip.id, job.version);
    throw err;
  } finally {
    clearInterval(heartbeat);
    await fsp.rm(work, { recursive: true, force: true });
  }
}
