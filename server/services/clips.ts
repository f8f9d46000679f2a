// Clip use cases: add a clip to an exam (the upload route, the demo seed and any importer call
// the same addClip), label and redact it, retry it after a failure, remove it, and find the
// stored media a viewer may fetch.
import crypto from "node:crypto";
import fs from "node:fs";
import fsp from "node:fs/promises";
import { pipeline } from "node:stream/promises";
import type { Knex } from "knex";
import type { z } from "zod";
import type { Db } from "../db/knex";
import type { Storage } from "../storage/types";
import type { JobQueue } from "../jobs/queue";
import type { AuthUser } from "../auth/types";
import type { Actor } from "./actor";
import type { clipUpdateSchema } from "../../shared/schemas/exams";
import { HttpError, notFound } from "../http/errors";
import { detectMedia } from "../media/detect";
import { MediaError } from "../media/exec";
import { readDicom, type DicomFacts } from "../media/dicom/read";
import { deidentify } from "../media/dicom/deidentify";
import { mediaTypeOfKey, originalKey as originalKeyOf } from "../storage/keys";
import { auditAs } from "../repositories/audit";
import { findExam, lockExam, touchExam } from "../repositories/exams";
import {
  clipStorageKeys,
  countExamClips,
  deleteClip,
  examUidSecret,
  findClipByDigest,
  findClipWithExam,
  insertClip,
  nextClipPosition,
  relabelClip,
  requeueClipAtVersion,
  type StoredClipRow,
} from "../repositories/clips";
import { assertCanEdit, assertCanEditClip, assertCanView, examOfClip, type ExamRow } from "../policies/exam";

export interface ClipDeps {
  /** The pool, or a transaction of the caller's (the demo seed adds clips inside its own). */
  db: Db | Knex.Transaction;
  storage: Storage;
  /** Where clip jobs are sent once the clip is committed. */
  jobs: Pick<JobQueue, "enqueueClip">;
  log: (msg: unknown) => void;
  /** At most this many clips per exam (MAX_CLIPS_PER_EXAM); no limit when absent. */
  maxClipsPerExam?: number;
}

/** Keeps a display name only: no folders, no control characters, bounded length. */
export function cleanFileName(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? "";
  // Control characters (U+0000–U+001F, U+007F) never belong in a displayed name.
  const printable = [...base].filter((ch) => ch.charCodeAt(0) > 0x1f && ch.charCodeAt(0) !== 0x7f).join("");
  return printable.replace(/^\.+/, "").slice(0, 200) || "upload";
}

async function sha256(file: string): Promise<string> {
  const hash = crypto.createHash("sha256");
  await pipeline(fs.createReadStream(file), hash);
  return hash.digest("hex");
}

/** 507 when the disk is full, 503 when the store is otherwise unavailable; nothing was kept. */
export function storageFailed(err: unknown): HttpError {
  const full = ["ENOSPC", "EDQUOT"].includes((err as { code?: string }).code ?? "");
  return new HttpError(
    full ? 507 : 503,
    full ? "storage_full" : "storage_unavailable",
    `file: the server could not store the upload (${full ? "storage is full" : "storage is unavailable"}); nothing was kept, try again later`,
  );
}

const tooManyClips = (limit: number) => new HttpError(413, "too_many_clips", `An exam holds at most ${limit} clips`);

/**
 * Before a byte of an upload is accepted: the caller may change the exam and it has room for
 * another clip. Returns the exam.
 */
export async function assertMayAddClip(deps: Pick<ClipDeps, "db" | "maxClipsPerExam">, user: AuthUser, examId: string): Promise<ExamRow> {
  const exam = await findExam(deps.db, user.programId, examId);
  assertCanEdit(user, exam);
  if (deps.maxClipsPerExam !== undefined && (await countExamClips(deps.db, exam.id)) >= deps.maxClipsPerExam) throw tooManyClips(deps.maxClipsPerExam);
  return exam;
}

export interface NewClip {
  /** The exam the clip joins; the caller has checked that it may (assertMayAddClip). */
  exam: { id: string; programId: string };
  /** A local file holding the bytes; it stays where it is (the caller removes it). */
  path: string;
  /** The name the file had; kept for its owner's display only, cleaned here. */
  originalName: string;
  sizeBytes: number;
  /** The view label, or null. */
  view: string | null;
  /** Kind and type known to a trusted source (the demo library); otherwise read from the content. */
  media?: { kind: "video" | "still"; mime: string };
  /** When the clip was made (default now). */
  createdAt?: Date;
}

/**
 * Adds a clip to an exam: checks the content, stores the original under its generated key
 * with its SHA-256, inserts the clip (under the exam's lock, so positions stay 0, 1, 2… and
 * the clip limit holds under parallel uploads), audits it as `actor` (none: not audited, the
 * demo seed) and sends its processing job once committed. A failing store answers 507/503
 * and keeps nothing.
 */
export async function addClip(deps: ClipDeps, actor: Actor | null, input: NewClip): Promise<StoredClipRow> {
  const { db, storage, jobs, log } = deps;
  const { exam } = input;
  // A DICOM object is always read from its content, even from a trusted source: it must be de-identified.
  const detected = input.media && input.media.mime !== "application/dicom" ? input.media : await detectMedia(input.path);
  if (!detected.kind) {
    throw new HttpError(
      415,
      "unsupported_media_type",
      `file: found ${"found" in detected ? detected.found : "an unknown file"}; upload MP4, MOV, M4V, AVI, WebM or MKV video, a JPEG or PNG still, or a DICOM ultrasound image`,
    );
  }
  const digest = await sha256(input.path);
  // A DICOM object is de-identified before anything of it is stored: the stored "original" is
  // already the de-identified object, and the facts worth keeping are read first.
  const dicom = detected.kind === "dicom" ? await deidentifiedUpload(db, exam.id, input.path) : null;
  const media = dicom
    ? { kind: dicom.facts.frames > 1 ? ("video" as const) : ("still" as const), mime: "application/dicom" }
    : (detected as { kind: "video" | "still"; mime: string });
  const storedPath = dicom?.path ?? input.path;
  const clipId = crypto.randomUUID();
  const originalKey = originalKeyOf(exam.programId, clipId);
  const duplicate = await findClipByDigest(db, exam.id, digest);
  if (duplicate) throw new HttpError(409, "duplicate_clip", "file: this exact file is already attached to the exam", { clipId: duplicate.id });
  try {
    await storage.put(originalKey, storedPath, media.mime);
  } catch (err) {
    // A put that failed half-way may have left part of the object behind.
    await storage.delete(originalKey).catch(() => undefined);
    log(err);
    throw storageFailed(err);
  }
  let row: StoredClipRow;
  try {
    row = await db.transaction(async (trx) => {
      // Serialises uploads to one exam so positions stay 0, 1, 2… under concurrency,
      // and makes the limit hold: the count checked before the upload may be stale.
      await lockExam(trx, exam.programId, exam.id);
      if (deps.maxClipsPerExam !== undefined && (await countExamClips(trx, exam.id)) >= deps.maxClipsPerExam) throw tooManyClips(deps.maxClipsPerExam);
      const r = await insertClip(trx, {
        id: clipId,
        examId: exam.id,
        programId: exam.programId,
        view: input.view,
        kind: media.kind,
        originalName: cleanFileName(input.originalName),
        originalKey,
        sha256: digest,
        sizeBytes: input.sizeBytes,
        mime: media.mime,
        position: await nextClipPosition(trx, exam.id),
        createdAt: input.createdAt,
        dicom: dicom?.facts ?? null,
      });
      await touchExam(trx, exam.id, input.createdAt);
      if (actor) {
        await auditAs(trx, actor, {
          action: "clip.uploaded",
          entityType: "clip",
          entityId: clipId,
          details: { examId: exam.id, sha256: digest, bytes: input.sizeBytes },
        });
      }
      return r;
    });
  } catch (err) {
    await storage.delete(originalKey);
    if ((err as { code?: string }).code === "23505") throw new HttpError(409, "duplicate_clip", "file: this exact file is already attached to the exam");
    throw err;
  } finally {
    if (dicom) await fsp.rm(dicom.path, { force: true });
  }
  // Sent after commit; if this fails the sweep sends it later, nothing is lost.
  await jobs.enqueueClip({ clipId, version: 1 }).catch(() => undefined);
  return row;
}

/**
 * Reads an uploaded DICOM object (415 naming what it is when Soundings cannot take it) and
 * writes its de-identified copy beside it; UIDs are replaced with the exam's own secret.
 */
async function deidentifiedUpload(db: Db | Knex.Transaction, examId: string, file: string): Promise<{ path: string; facts: DicomFacts }> {
  let read: ReturnType<typeof readDicom>;
  try {
    read = readDicom(await fsp.readFile(file));
  } catch (err) {
    if (err instanceof MediaError) throw new HttpError(415, "unsupported_media_type", `file: ${err.message}`);
    throw err;
  }
  const secret = await examUidSecret(db, examId);
  const { bytes } = deidentify(read.file, { uidSecret: secret });
  const out = `${file}.deidentified.dcm`;
  await fsp.writeFile(out, bytes);
  return { path: out, facts: read.facts };
}

/** The caller's own clip of a draft, locked for the rest of the transaction. */
async function lockOwnClip(trx: Knex.Transaction, user: AuthUser, id: string) {
  const clip = await findClipWithExam(trx, user.programId, id, { lock: true });
  assertCanEditClip(user, clip);
  return clip;
}

/** Labels a clip with its view and sets redaction boxes; changed boxes reprocess the clip from its original. */
export async function updateClip(
  deps: Pick<ClipDeps, "db" | "jobs">,
  user: AuthUser,
  actor: Actor,
  id: string,
  body: z.output<typeof clipUpdateSchema>,
): Promise<StoredClipRow> {
  const { row, reprocess } = await deps.db.transaction(async (trx) => {
    const clip = await lockOwnClip(trx, user, id);
    const reprocess = body.redactions !== undefined && JSON.stringify(body.redactions) !== JSON.stringify(clip.redactions ?? []);
    if (reprocess && !clip.original_key) throw new HttpError(409, "original_gone", "The original upload is no longer kept; upload the clip again");
    const row = reprocess
      ? await requeueClipAtVersion(trx, clip.id, clip.process_version + 1, { view: body.view, redactions: body.redactions })
      : await relabelClip(trx, clip.id, body.view);
    await auditAs(trx, actor, {
      action: reprocess ? "clip.redacted" : "clip.updated",
      entityType: "clip",
      entityId: clip.id,
      details: reprocess ? { boxes: body.redactions!.length } : undefined,
    });
    return { row, reprocess };
  });
  if (reprocess) await deps.jobs.enqueueClip({ clipId: row.id, version: row.process_version }).catch(() => undefined);
  return row;
}

/** Processes a failed clip again, at its next process version. */
export async function retryClip(deps: Pick<ClipDeps, "db" | "jobs">, user: AuthUser, actor: Actor, id: string): Promise<StoredClipRow> {
  const row = await deps.db.transaction(async (trx) => {
    const clip = await lockOwnClip(trx, user, id);
    if (clip.state !== "failed") throw new HttpError(409, "not_failed", `The clip is ${clip.state}; only a failed clip can be retried`);
    const row = await requeueClipAtVersion(trx, clip.id, clip.process_version + 1);
    await auditAs(trx, actor, { action: "clip.retried", entityType: "clip", entityId: clip.id });
    return row;
  });
  await deps.jobs.enqueueClip({ clipId: row.id, version: row.process_version }).catch(() => undefined);
  return row;
}

/** Removes a clip from a draft, and its media. */
export async function removeClip(deps: Pick<ClipDeps, "db" | "storage">, user: AuthUser, actor: Actor, id: string): Promise<void> {
  const clip = await deps.db.transaction(async (trx) => {
    const clip = await lockOwnClip(trx, user, id);
    await deleteClip(trx, clip.id);
    await auditAs(trx, actor, { action: "clip.removed", entityType: "clip", entityId: clip.id });
    return clip;
  });
  await Promise.all(clipStorageKeys(clip).map((k) => deps.storage.delete(k).catch(() => undefined)));
}

export const MEDIA_VARIANTS = ["video", "image", "poster", "strip", "thumb"] as const;
export type MediaVariant = (typeof MEDIA_VARIANTS)[number];

/** The stored object (and its media type) of a ready clip's variant, for someone who may see the exam; 404 otherwise. */
export async function clipMedia(db: Db, user: AuthUser, id: string, variant: MediaVariant): Promise<{ key: string; type: string }> {
  const clip = await findClipWithExam(db, user.programId, id);
  if (!clip) throw notFound("Clip");
  await assertCanView(db, user, examOfClip(clip));
  if (clip.state !== "ready") throw notFound("Media");
  const key = {
    video: clip.kind === "video" ? clip.output_key : null,
    image: clip.kind === "still" ? clip.output_key : null,
    poster: clip.poster_key,
    strip: clip.strip_key,
    thumb: clip.thumb_key ?? clip.poster_key,
  }[variant];
  if (!key) throw notFound("Media");
  return { key, type: mediaTypeOfKey(key) };
}
