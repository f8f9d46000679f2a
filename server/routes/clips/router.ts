// Clips: upload (multipart), label and redact, remove, retry after a failure, and the
// authorized media routes (with Range) that the players use. Media is never a public folder.
import crypto from "node:crypto";
import fs from "node:fs";
import fsp from "node:fs/promises";
import { pipeline } from "node:stream/promises";
import multer from "multer";
import { z } from "zod";
import type { RequestHandler } from "express";
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { HttpError, notFound } from "../../http/errors";
import { unstorableReason } from "../../http/strings";
import { sendStored } from "../../http/range";
import { idParamsSchema } from "../../../shared/schemas/common";
import { clipSchema, clipUpdateSchema } from "../../../shared/schemas/exams";
import { findClipWithExam, findExam } from "../../repositories/exams";
import { presentClip, type ClipRow } from "../../presenters/exam";
import { assertCanEdit, assertCanView, type ExamRow } from "../../policies/exam";
import { audit } from "../../repositories/audit";
import { detectMedia } from "../../media/detect";
import type { AuthUser } from "../../auth/types";

const VARIANTS = ["video", "image", "poster", "strip", "thumb"] as const;

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

const clipAsExam = (c: { exam_id: string; exam_program_id: string; sonographer_id: string; exam_status: string }): ExamRow => ({
  id: c.exam_id,
  program_id: c.exam_program_id,
  sonographer_id: c.sonographer_id,
  status: c.exam_status,
});

/** 507 when the disk is full, 503 when the store is otherwise unavailable; nothing was kept. */
const storageFailed = (err: unknown) => {
  const full = ["ENOSPC", "EDQUOT"].includes((err as { code?: string }).code ?? "");
  return new HttpError(
    full ? 507 : 503,
    full ? "storage_full" : "storage_unavailable",
    `file: the server could not store the upload (${full ? "storage is full" : "storage is unavailable"}); nothing was kept, try again later`,
  );
};

export function registerClipRoutes(kit: RouteKit, { db, storage, config, jobs, log }: RouteContext) {
  fs.mkdirSync(config.uploads.tempDir, { recursive: true });
  const tooManyClips = () => new HttpError(413, "too_many_clips", `An exam holds at most ${config.uploads.maxClipsPerExam} clips`);
  const upload = multer({
    storage: multer.diskStorage({
      destination: config.uploads.tempDir,
      // Never the user's file name on disk.
      filename: (_req, _file, cb) => cb(null, crypto.randomUUID()),
    }),
    limits: { fileSize: config.uploads.maxFileBytes, files: 1, fields: 4, fieldSize: 200, parts: 6 },
    // Browsers send file names as raw UTF-8 (RFC 7578 section 4.2); multer's default is latin1.
    defParamCharset: "utf8",
  }).single("file");

  // Authorize before a byte of the file is accepted.
  const authorizeUpload: RequestHandler = (req, res, next) => {
    const id = String(req.params.id);
    if (!z.uuid().safeParse(id).success) return next(new HttpError(400, "validation_failed", "id: Invalid UUID"));
    findExam(db, (req.user as AuthUser).programId, id)
      .then(async (exam) => {
        assertCanEdit(req.user as AuthUser, exam);
        const [{ count }] = await db("clips").where("exam_id", exam.id).count<{ count: string }[]>("* as count");
        if (Number(count) >= config.uploads.maxClipsPerExam) throw tooManyClips();
        res.locals.exam = exam;
        next();
      })
      .catch(next);
  };
  const receive: RequestHandler = (req, res, next) => {
    upload(req, res, (err: unknown) => {
      if (!err) return next();
      if (err instanceof multer.MulterError) {
        const e =
          err.code === "LIMIT_FILE_SIZE"
            ? new HttpError(413, "file_too_large", `file: larger than the limit of ${Math.round(config.uploads.maxFileBytes / 1024 / 1024)} MB`)
            : err.code === "LIMIT_FILE_COUNT" || err.code === "LIMIT_UNEXPECTED_FILE"
              ? new HttpError(400, "too_many_files", `file: send one file per request, in the field "file" (got ${err.field ?? "another field"})`)
              : new HttpError(400, "bad_upload", `${err.field ?? "file"}: ${err.message}`);
        return next(e);
      }
      // The disk under the temporary folder failing is ours; anything else from the
      // multipart parser (no boundary, a truncated body, a broken part header) is the request's.
      const code = (err as { code?: string }).code;
      if (code === "ENOSPC" || code === "EDQUOT") return next(storageFailed(err));
      if (code && /^E[A-Z]+$/.test(code)) return next(err);
      next(new HttpError(400, "bad_upload", `file: the multipart body could not be read (${(err as Error).message}); send one file in the field "file"`));
    });
  };

  defineRoute(kit, {
    method: "post",
    path: "/exams/:id/clips",
    summary: "Upload one clip (multipart field `file`, optional `view`); processing starts at once",
    tag: "clips",
    access: ["sonographer"],
    before: [authorizeUpload, receive],
    responses: {
      202: { description: "Accepted; processing in the queue", schema: z.object({ id: z.uuid(), state: z.string(), clip: clipSchema }) },
      409: { description: "The same file is already in this exam, or the exam was submitted" },
      413: { description: "File too large, or too many clips" },
      415: { description: "Not a supported video or image (by content)" },
    },
    handler: async ({ req, res, user }) => {
      const file = req.file;
      const exam = res.locals.exam as ExamRow;
      if (!file) throw new HttpError(400, "validation_failed", 'file: attach a video or image in the field "file"');
      try {
        if (file.size === 0) throw new HttpError(400, "empty_file", "file: the file is empty");
        // eslint-disable-next-line no-control-regex -- control characters are what is refused
        if (/[\u0000-\u001f\u007f]/.test(file.originalname)) {
          throw new HttpError(400, "validation_failed", "file: the file name contains control characters; rename the file and upload it again");
        }
        for (const [field, value] of Object.entries(req.body ?? {})) {
          const reason = typeof value === "string" ? unstorableReason(value) : null;
          if (reason) throw new HttpError(400, "validation_failed", `${field}: ${reason}`);
        }
        const view = typeof req.body?.view === "string" && req.body.view.trim() ? req.body.view.trim().slice(0, 60) : null;
        const media = await detectMedia(file.path);
        if (!media.kind) {
          throw new HttpError(
            415,
            "unsupported_media_type",
            `file: found ${media.found}; upload MP4, MOV, M4V, AVI, WebM or MKV video, or a JPEG or PNG still`,
          );
        }
        const digest = await sha256(file.path);
        const clipId = crypto.randomUUID();
        const originalKey = `programs/${user.programId}/clips/${clipId}/original`;
        const duplicate = await db("clips").where({ exam_id: exam.id, sha256: digest }).first("id");
        if (duplicate) throw new HttpError(409, "duplicate_clip", "file: this exact file is already attached to the exam", { clipId: duplicate.id });
        try {
          await storage.put(originalKey, file.path, media.mime);
        } catch (err) {
          // A put that failed half-way may have left part of the object behind.
          await storage.delete(originalKey).catch(() => undefined);
          log(err);
          throw storageFailed(err);
        }
        let row: ClipRow;
        try {
          row = await db.transaction(async (trx) => {
            // Serialises uploads to one exam so positions stay 0, 1, 2… under concurrency,
            // and makes the limit hold: the count checked before the upload may be stale.
            await trx("exams").where("id", exam.id).forUpdate().first("id");
            const [{ count }] = await trx("clips").where("exam_id", exam.id).count<{ count: string }[]>("* as count");
            if (Number(count) >= config.uploads.maxClipsPerExam) throw tooManyClips();
            const [{ max }] = await trx("clips").where("exam_id", exam.id).max<{ max: number | null }[]>("position as max");
            const [r] = await trx("clips")
              .insert({
                id: clipId,
                exam_id: exam.id,
                program_id: user.programId,
                view_key: view,
                kind: media.kind,
                original_name: cleanFileName(file.originalname),
                original_key: originalKey,
                sha256: digest,
                size_bytes: file.size,
                mime: media.mime,
                position: (max ?? -1) + 1,
              })
              .returning("*");
            await trx("exams").where("id", exam.id).update({ updated_at: trx.fn.now() });
            await audit(trx, {
              programId: user.programId,
              actorUserId: user.id,
              action: "clip.uploaded",
              entityType: "clip",
              entityId: clipId,
              ip: req.ip,
              details: { examId: exam.id, sha256: digest, bytes: file.size },
            });
            return r;
          });
        } catch (err) {
          await storage.delete(originalKey);
          if ((err as { code?: string }).code === "23505") throw new HttpError(409, "duplicate_clip", "file: this exact file is already attached to the exam");
          throw err;
        }
        // Sent after commit; if this fails the sweep sends it later, nothing is lost.
        await jobs.enqueueClip({ clipId, version: 1 }).catch(() => undefined);
        res.status(202).json({ id: clipId, state: row.state, clip: presentClip(row, { forOwner: true }) });
      } finally {
        await fsp.rm(file.path, { force: true });
      }
    },
  });

  const loadOwnClip = async (user: AuthUser, id: string, lock = false) => {
    const q = findClipWithExam(db, user.programId, id);
    if (lock) q.forUpdate("c");
    const clip = await q;
    if (!clip) throw notFound("Clip");
    assertCanEdit(user, clipAsExam(clip));
    return clip;
  };

  defineRoute(kit, {
    method: "patch",
    path: "/clips/:id",
    summary: "Label a clip with its view and set redaction boxes (changing boxes reprocesses the clip)",
    tag: "clips",
    access: ["sonographer"],
    params: idParamsSchema,
    body: clipUpdateSchema,
    responses: { 200: { description: "Updated", schema: z.object({ clip: clipSchema }) } },
    handler: async ({ req, user, params, body }) => {
      const { row, reprocess } = await db.transaction(async (trx) => {
        const clip = await loadOwnClip(user, params.id, true);
        const changes: Record<string, unknown> = { updated_at: trx.fn.now() };
        if (body.view !== undefined) changes.view_key = body.view;
        const reprocess = body.redactions !== undefined && JSON.stringify(body.redactions) !== JSON.stringify(clip.redactions ?? []);
        if (reprocess) {
          if (!clip.original_key) throw new HttpError(409, "original_gone", "The original upload is no longer kept; upload the clip again");
          Object.assign(changes, { redactions: JSON.stringify(body.redactions), process_version: clip.process_version + 1, state: "queued", error: null });
        }
        const [row] = await trx("clips").where("id", clip.id).update(changes).returning("*");
        await audit(trx, {
          programId: user.programId,
          actorUserId: user.id,
          action: reprocess ? "clip.redacted" : "clip.updated",
          entityType: "clip",
          entityId: clip.id,
          ip: req.ip,
          details: reprocess ? { boxes: body.redactions!.length } : undefined,
        });
        return { row: row as ClipRow & { process_version: number }, reprocess };
      });
      if (reprocess) await jobs.enqueueClip({ clipId: row.id, version: row.process_version }).catch(() => undefined);
      return { clip: presentClip(row, { forOwner: true }) };
    },
  });

  defineRoute(kit, {
    method: "post",
    path: "/clips/:id/retry",
    summary: "Process a failed clip again",
    tag: "clips",
    access: ["sonographer"],
    params: idParamsSchema,
    responses: { 202: { description: "Queued again", schema: z.object({ clip: clipSchema }) }, 409: { description: "The clip has not failed" } },
    handler: async ({ req, res, user, params }) => {
      const row = await db.transaction(async (trx) => {
        const clip = await loadOwnClip(user, params.id, true);
        if (clip.state !== "failed") throw new HttpError(409, "not_failed", `The clip is ${clip.state}; only a failed clip can be retried`);
        const [row] = await trx("clips")
          .where("id", clip.id)
          .update({ state: "queued", error: null, process_version: clip.process_version + 1, updated_at: trx.fn.now() })
          .returning("*");
        await audit(trx, { programId: user.programId, actorUserId: user.id, action: "clip.retried", entityType: "clip", entityId: clip.id, ip: req.ip });
        return row as ClipRow;
      });
      await jobs.enqueueClip({ clipId: row.id, version: row.process_version }).catch(() => undefined);
      res.status(202).json({ clip: presentClip(row, { forOwner: true }) });
    },
  });

  defineRoute(kit, {
    method: "delete",
    path: "/clips/:id",
    summary: "Remove a clip from a draft exam",
    tag: "clips",
    access: ["sonographer"],
    params: idParamsSchema,
    responses: { 204: { description: "Removed" } },
    handler: async ({ req, user, params }) => {
      const clip = await db.transaction(async (trx) => {
        const clip = await loadOwnClip(user, params.id, true);
        await trx("clips").where("id", clip.id).delete();
        await audit(trx, { programId: user.programId, actorUserId: user.id, action: "clip.removed", entityType: "clip", entityId: clip.id, ip: req.ip });
        return clip;
      });
      await Promise.all(
        [clip.original_key, clip.output_key, clip.poster_key, clip.strip_key, clip.thumb_key]
          .filter(Boolean)
          .map((k: string) => storage.delete(k).catch(() => undefined)),
      );
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/clips/:id/media/:variant",
    summary: "A clip's media (video, image, poster, strip, thumb) for those allowed to see the exam; supports Range",
    tag: "clips",
    access: "signed_in",
    params: z.object({ id: z.uuid(), variant: z.enum(VARIANTS) }),
    responses: {
      200: { description: "The bytes" },
      206: { description: "Part of the bytes" },
      404: { description: "Not visible to you, or not processed" },
      416: { description: "Range not satisfiable" },
    },
    handler: async ({ req, res, user, params }) => {
      const clip = await findClipWithExam(db, user.programId, params.id);
      if (!clip) throw notFound("Clip");
      await assertCanView(db, user, clipAsExam(clip));
      if (clip.state !== "ready") throw notFound("Media");
      const key = {
        video: clip.kind === "video" ? clip.output_key : null,
        image: clip.kind === "still" ? clip.output_key : null,
        poster: clip.poster_key,
        strip: clip.strip_key,
        thumb: clip.thumb_key ?? clip.poster_key,
      }[params.variant];
      if (!key) throw notFound("Media");
      const type = key.endsWith(".mp4") ? "video/mp4" : key.endsWith(".png") ? "image/png" : "image/jpeg";
      await sendStored(req, res, storage, key, type);
    },
  });
}
