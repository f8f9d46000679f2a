// Every query on the clips table. A clip's state changes only through the named transitions
// below: queued (uploaded, or sent again) → processing → ready, or failed after the last
// attempt; a retry, a change of redaction boxes or a lost worker send it back to queued.
// Transitions of the media job are guarded by the process version the job was sent for, so a
// job for a superseded version changes nothing.
import crypto from "node:crypto";
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import type { ClipRow } from "../presenters/exam";
import type { RedactionBox } from "../../shared/schemas/exams";
import type { DicomFacts } from "../media/dicom/read";

type Q = Db | Knex.Transaction;

/** A clip row with what its storage keys and reprocessing need beyond what is presented. */
export type StoredClipRow = ClipRow & {
  program_id: string;
  exam_id: string;
  original_key: string | null;
  processed_version: number | null;
  sha256: string;
  mime: string;
  position: number;
};

/** Every stored object a clip row names (original and current outputs). */
export const clipStorageKeys = (c: {
  original_key: string | null;
  output_key: string | null;
  poster_key: string | null;
  strip_key: string | null;
  thumb_key: string | null;
}) => [c.original_key, c.output_key, c.poster_key, c.strip_key, c.thumb_key].filter(Boolean) as string[];

// ---- reading ----

/** The clip with its exam (sonographer, status, program), scoped to the program. */
export function findClipWithExam(db: Q, programId: string, clipId: string, opts: { lock?: boolean } = {}) {
  const q = db("clips as c")
    .join("exams as e", "e.id", "c.exam_id")
    .where({ "c.id": clipId, "c.program_id": programId })
    .first("c.*", "e.sonographer_id", "e.status as exam_status", "e.program_id as exam_program_id");
  if (opts.lock) q.forUpdate("c");
  return q;
}

/** One clip by id, for the media worker (a job names only the clip). */
/** The exam's secret for replacement DICOM UIDs, made on first use (concurrent uploads agree on one). */
export async function examUidSecret(db: Q, examId: string): Promise<string> {
  await db("exams")
    .where("id", examId)
    .whereNull("dicom_uid_secret")
    .update({ dicom_uid_secret: crypto.randomBytes(32).toString("hex") });
  return (await db("exams").where("id", examId).first("dicom_uid_secret")).dicom_uid_secret as string;
}

export const findClipForJob = (db: Q, clipId: string) => db("clips").where("id", clipId).first();

/** An exam's clips in their order. */
export const listExamClips = (db: Q, examId: string) => db("clips").where("exam_id", examId).orderBy(["position", "created_at"]) as Promise<ClipRow[]>;

/** An exam's clips as stored, in no particular order (to delete their media). */
export const storedClipsOfExam = (db: Q, examId: string) => db("clips").where("exam_id", examId) as Promise<StoredClipRow[]>;

/** What submitting an exam checks of each clip. */
export const clipStatesOfExam = (db: Q, examId: string) =>
  db("clips").where("exam_id", examId).select("id", "state", "original_key") as Promise<{ id: string; state: string; original_key: string | null }[]>;

export async function countExamClips(db: Q, examId: string): Promise<number> {
  const [{ count }] = await db("clips").where("exam_id", examId).count<{ count: string }[]>("* as count");
  return Number(count);
}

/** The clip of the exam with exactly these bytes, if any. */
export const findClipByDigest = (db: Q, examId: string, sha256: string) =>
  db("clips").where({ exam_id: examId, sha256 }).first<{ id: string } | undefined>("id");

/** Where the next clip of an exam goes (0 for the first). */
export async function nextClipPosition(db: Q, examId: string): Promise<number> {
  const [{ max }] = await db("clips").where("exam_id", examId).max<{ max: number | null }[]>("position as max");
  return (max ?? -1) + 1;
}

/**
 * Columns for a list of exams aliased `e`: clip counts (all, ready, failed) and the first
 * ready clip with its process version (for the list's thumbnail).
 */
export function examClipSummaryColumns(db: Q) {
  return [
    db.raw(`(SELECT count(*) FROM clips c WHERE c.exam_id = e.id) AS clip_count`),
    db.raw(`(SELECT count(*) FROM clips c WHERE c.exam_id = e.id AND c.state = 'ready') AS ready_count`),
    db.raw(`(SELECT count(*) FROM clips c WHERE c.exam_id = e.id AND c.state = 'failed') AS failed_count`),
    db.raw(`(SELECT c.id FROM clips c WHERE c.exam_id = e.id AND c.state = 'ready' ORDER BY c.position, c.created_at LIMIT 1) AS poster_clip_id`),
    db.raw(`(SELECT c.process_version FROM clips c WHERE c.exam_id = e.id AND c.state = 'ready' ORDER BY c.position, c.created_at LIMIT 1) AS poster_version`),
  ];
}

/** How many clips of a sonographer's draft exams failed processing. */
export async function countFailedDraftClips(db: Q, programId: string, sonographerId: string): Promise<number> {
  const [r] = await db("clips as c")
    .join("exams as e", "e.id", "c.exam_id")
    .where({ "e.program_id": programId, "e.sonographer_id": sonographerId, "e.status": "draft", "c.state": "failed" })
    .count<{ c: string }[]>("* as c");
  return Number(r.c);
}

// ---- adding, editing, removing ----

export interface NewClipRow {
  id: string;
  examId: string;
  programId: string;
  view: string | null;
  kind: "video" | "still";
  originalName: string;
  originalKey: string;
  sha256: string;
  sizeBytes: number;
  mime: string;
  position: number;
  /** When the clip was made; default now (the demo seeds its history in the past). */
  createdAt?: Date;
  /** Facts read from a DICOM object before de-identification. */
  dicom?: DicomFacts | null;
}

/** Inserts a new clip, queued for its first processing (version 1). */
export async function insertClip(trx: Q, c: NewClipRow): Promise<StoredClipRow> {
  const [row] = await trx("clips")
    .insert({
      id: c.id,
      exam_id: c.examId,
      program_id: c.programId,
      view_key: c.view,
      kind: c.kind,
      original_name: c.originalName,
      original_key: c.originalKey,
      sha256: c.sha256,
      size_bytes: c.sizeBytes,
      mime: c.mime,
      position: c.position,
      dicom: c.dicom ? JSON.stringify(c.dicom) : null,
      ...(c.createdAt ? { created_at: c.createdAt } : {}),
    })
    .returning("*");
  return row;
}

/** Changes a clip's view label only (undefined keeps it); its media stay as they are. */
export async function relabelClip(trx: Q, clipId: string, view: string | null | undefined): Promise<StoredClipRow> {
  const changes: Record<string, unknown> = { updated_at: trx.fn.now() };
  if (view !== undefined) changes.view_key = view;
  const [row] = await trx("clips").where("id", clipId).update(changes).returning("*");
  return row;
}

/**
 * Sends a clip back to the queue at a new process version (after a failure, or with new
 * redaction boxes, optionally relabelled in the same change); the job for that version redoes its media.
 */
export async function requeueClipAtVersion(
  trx: Q,
  clipId: string,
  version: number,
  changes: { redactions?: RedactionBox[]; view?: string | null } = {},
): Promise<StoredClipRow> {
  const update: Record<string, unknown> = { updated_at: trx.fn.now() };
  if (changes.view !== undefined) update.view_key = changes.view;
  if (changes.redactions !== undefined) update.redactions = JSON.stringify(changes.redactions);
  Object.assign(update, { process_version: version, state: "queued", error: null });
  const [row] = await trx("clips").where("id", clipId).update(update).returning("*");
  return row;
}

export const deleteClip = (trx: Q, clipId: string) => trx("clips").where("id", clipId).delete();

// ---- originals ----

/** Forgets the originals of an exam's clips (their objects are deleted by the caller). */
export const forgetExamOriginals = (trx: Q, examId: string) => trx("clips").where("exam_id", examId).update({ original_key: null });

/** The original of a clip whose exam is no longer a draft, if it is still kept. */
export async function originalOfSubmittedClip(db: Q, clipId: string): Promise<string | undefined> {
  const [row] = await db("clips as c")
    .join("exams as e", "e.id", "c.exam_id")
    .where("c.id", clipId)
    .whereNot("e.status", "draft")
    .whereNotNull("c.original_key")
    .select("c.original_key");
  return row?.original_key;
}

export const forgetClipOriginal = (db: Q, clipId: string) => db("clips").where("id", clipId).update({ original_key: null });

// ---- the media job's transitions (guarded by the job's process version) ----

/** The job picked the clip up: processing, one more attempt. */
export const markClipProcessing = (db: Q, clipId: string, version: number) =>
  db("clips")
    .where({ id: clipId, process_version: version })
    .update({ state: "processing", attempts: db.raw("attempts + 1"), updated_at: db.fn.now() });

/** The job is still at work on the clip (a heartbeat): the stuck-clip sweep leaves it alone. */
export const touchProcessingClip = (db: Q, clipId: string, version: number) =>
  db("clips").where({ id: clipId, process_version: version, state: "processing" }).update({ updated_at: db.fn.now() });

/** Processing finished: the new outputs and metadata, ready. Returns how many rows changed (0 = superseded). */
export const markClipReady = (db: Q, clipId: string, version: number, outputs: Record<string, unknown>): Promise<number> =>
  db("clips")
    .where({ id: clipId, process_version: version })
    .update({ ...outputs, state: "ready", error: null, processed_version: version, processed_at: db.fn.now(), updated_at: db.fn.now() });

/** Processing gave up (last attempt, or nothing left to process): failed, with the reason shown on the clip. */
export const markClipFailed = (db: Q, clipId: string, version: number, error: string) =>
  db("clips").where({ id: clipId, process_version: version }).update({ state: "failed", error, updated_at: db.fn.now() });

/** An attempt failed and the queue will try again: back to queued. */
export const markClipAwaitingRetry = (db: Q, clipId: string, version: number) =>
  db("clips").where({ id: clipId, process_version: version }).update({ state: "queued", error: null, updated_at: db.fn.now() });

/**
 * Clips left queued or processing for longer than `stuckAfterSeconds` (a worker died, or a
 * job was never sent) go back to queued; returns them so their jobs are sent again.
 */
export const requeueStuckClips = (db: Q, stuckAfterSeconds: number) =>
  db("clips")
    .whereIn("state", ["queued", "processing"])
    .andWhere("updated_at", "<", db.raw(`now() - make_interval(secs => ?)`, [stuckAfterSeconds]))
    .update({ state: "queued", updated_at: db.fn.now() })
    .returning(["id", "process_version"]) as Promise<{ id: string; process_version: number }[]>;

/** The typical depth range (cm) of the application a clip's exam was recorded under, or null. */
export async function typicalDepthOfClip(db: Q, clipId: string): Promise<[number, number] | null> {
  const row = await db("clips as c")
    .join("exams as e", "e.id", "c.exam_id")
    .join("applications as a", "a.id", "e.application_id")
    .where("c.id", clipId)
    .first("a.depth_min_cm", "a.depth_max_cm");
  return row && row.depth_min_cm !== null && row.depth_max_cm !== null ? [Number(row.depth_min_cm), Number(row.depth_max_cm)] : null;
}
