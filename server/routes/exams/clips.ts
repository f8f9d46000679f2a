// POST /exams/:id/clips: one clip as multipart (field `file`, optional `view`). The caller is
// authorized and the exam's room checked before a byte of the file is accepted; the file lands
// in a temporary folder under a random name, and addClip does the rest.
import crypto from "node:crypto";
import fs from "node:fs";
import fsp from "node:fs/promises";
import multer from "multer";
import type { RequestHandler } from "express";
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { HttpError } from "../../http/errors";
import { unstorableReason } from "../../http/strings";
import { clipUploadResponseSchema, idParamsSchema } from "./schema";
import { presentClip } from "../../presenters/exam";
import type { ExamRow } from "../../policies/exam";
import { actorOf } from "../../services/actor";
import { addClip, assertMayAddClip, storageFailed, type ClipDeps } from "../../services/clips";
import type { AuthUser } from "../../auth/types";

export function registerExamClipRoutes(kit: RouteKit, { db, storage, config, jobs, log }: RouteContext) {
  fs.mkdirSync(config.uploads.tempDir, { recursive: true });
  const deps: ClipDeps = { db, storage, jobs, log, maxClipsPerExam: config.uploads.maxClipsPerExam };
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
    if (!idParamsSchema.safeParse({ id }).success) return next(new HttpError(400, "validation_failed", "id: Invalid UUID"));
    assertMayAddClip(deps, req.user as AuthUser, id)
      .then((exam) => {
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
      202: { description: "Accepted; processing in the queue", schema: clipUploadResponseSchema },
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
        const row = await addClip(deps, actorOf(req, user), {
          exam: { id: exam.id, programId: user.programId },
          path: file.path,
          originalName: file.originalname,
          sizeBytes: file.size,
          view,
        });
        res.status(202);
        return { id: row.id, state: row.state, clip: presentClip(row, { forOwner: true }) };
      } finally {
        await fsp.rm(file.path, { force: true });
      }
    },
  });
}
