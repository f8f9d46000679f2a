// The program's DICOM inbox: what ultrasound machines send lands here, de-identified and
// grouped by study, until a clinician makes an exam of it. A study is known by a keyed hash of
// its original Study Instance UID (the key is the program's own), so later objects of the same
// study join it without the UID being kept. The operator name an object carries is compared
// with the names each member gave for themselves, and only the match is kept.
import crypto from "node:crypto";
import fsp from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import type { Knex } from "knex";
import type { z } from "zod";
import type { Db } from "../db/knex";
import type { AuthUser } from "../auth/types";
import type { Actor } from "./actor";
import { HttpError, notFound } from "../http/errors";
import { auditAs } from "../repositories/audit";
import { dicomFactsView } from "../presenters/exam";
import type { examCreateSchema } from "../../shared/schemas/exams";
import type { InboxStudy } from "../../shared/schemas/dicom-inbox";
import { createExam, discardExam, examForViewer, type ExamDeps } from "./exams";
import type { ExamView } from "../presenters/exam";
import { addClip, type ClipDeps } from "./clips";
import type { Storage } from "../storage/types";
import { readDicom, type ReadDicom } from "../media/dicom/read";
import { previewFrame } from "../media/dicom/frames";
import { deidentify } from "../media/dicom/deidentify";
import { storageFailed } from "./clips";
import { normaliseOperatorName } from "../../shared/schemas/users";

async function programSecret(db: Db, programId: string): Promise<string> {
  await db("programs")
    .where("id", programId)
    .whereNull("dicom_secret")
    .update({ dicom_secret: crypto.randomBytes(32).toString("hex") });
  return (await db("programs").where("id", programId).first("dicom_secret")).dicom_secret as string;
}

/** Stores one received object (already checked) in the program's inbox; returns the study's id. */
export async function receiveIntoInbox(
  deps: { db: Db; storage: Storage },
  input: { programId: string; callingAe: string; bytes: Buffer; read?: ReadDicom },
): Promise<string> {
  const { db, storage } = deps;
  const read = input.read ?? readDicom(input.bytes);
  const secret = await programSecret(db, input.programId);
  const hash = crypto
    .createHmac("sha256", secret)
    .update(read.studyInstanceUid ?? crypto.randomUUID())
    .digest("hex");
  const names = new Set(read.operatorNames.map(normaliseOperatorName).filter(Boolean));
  const members = names.size
    ? await db("memberships")
        .where("program_id", input.programId)
        .whereNull("deactivated_at")
        .whereRaw(`'sonographer' = ANY(roles)`)
        .select("user_id", "dicom_operator_names")
    : [];
  const matched = members.filter((m) => (m.dicom_operator_names as string[]).some((n) => names.has(normaliseOperatorName(n))));
  const [study] = await db("dicom_inbox_studies")
    .insert({
      program_id: input.programId,
      study_hash: hash,
      uid_secret: crypto.randomBytes(32).toString("hex"),
      calling_ae: input.callingAe.slice(0, 16),
      matched_user_id: matched.length === 1 ? matched[0].user_id : null,
    })
    .onConflict(["program_id", "study_hash"])
    .merge({ last_received_at: db.fn.now() })
    .returning(["id", "uid_secret"]);
  const { bytes } = deidentify(read.file, { uidSecret: study.uid_secret });
  const sha256 = crypto.createHash("sha256").update(bytes).digest("hex");
  const id = crypto.randomUUID();
  const key = `programs/${input.programId}/inbox/${study.id}/${id}.dcm`;
  const previewKey = `programs/${input.programId}/inbox/${study.id}/${id}.jpg`;
  const work = await fsp.mkdtemp(path.join(os.tmpdir(), "soundings-inbox-in-"));
  try {
    const tmp = path.join(work, "object.dcm");
    await fsp.writeFile(tmp, bytes);
    // The preview is made from the de-identified object; an object whose frames cannot be
    // decoded is refused here rather than failing later as a clip.
    const preview = path.join(work, "preview.jpg");
    await previewFrame(tmp, path.join(work, "frames"), read.facts.frames, preview);
    try {
      await storage.put(key, tmp, "application/dicom");
      await storage.put(previewKey, preview, "image/jpeg");
    } catch (err) {
      await storage.delete(key).catch(() => undefined);
      await storage.delete(previewKey).catch(() => undefined);
      throw storageFailed(err);
    }
  } finally {
    await fsp.rm(work, { recursive: true, force: true });
  }
  const inserted = await db("dicom_inbox_objects")
    .insert({
      id,
      study_id: study.id,
      program_id: input.programId,
      storage_key: key,
      preview_key: previewKey,
      sha256,
      size_bytes: bytes.length,
      facts: JSON.stringify(read.facts),
    })
    .onConflict(["study_id", "sha256"])
    .ignore()
    .returning("id");
  // The same object sent twice is kept once.
  if (!inserted.length) {
    await storage.delete(key).catch(() => undefined);
    await storage.delete(previewKey).catch(() => undefined);
  }
  return study.id as string;
}

// ---- the inbox as people use it ----

const isLead = (user: AuthUser) => user.roles.includes("qa_lead") || user.roles.includes("admin");

/** The inbox studies a user may see: every open one for a QA lead or admin; for a clinician, their own matches and claims and the unassigned ones. */
function visibleStudies(db: Db | Knex.Transaction, user: AuthUser) {
  const q = db("dicom_inbox_studies as s").where("s.program_id", user.programId).whereNull("s.exam_id");
  if (isLead(user)) return q;
  return q.where((w) =>
    w
      .where("s.matched_user_id", user.id)
      .orWhere("s.claimed_by", user.id)
      .orWhere((u) => u.whereNull("s.matched_user_id").whereNull("s.claimed_by")),
  );
}

async function presentStudies(db: Db | Knex.Transaction, rows: Record<string, unknown>[]): Promise<InboxStudy[]> {
  if (!rows.length) return [];
  const objects = await db("dicom_inbox_objects")
    .whereIn(
      "study_id",
      rows.map((r) => r.id as string),
    )
    .orderBy("received_at")
    .select("id", "study_id", "facts", "size_bytes", "preview_key");
  const ids = [...new Set(rows.flatMap((r) => [r.matched_user_id, r.claimed_by]).filter(Boolean) as string[])];
  const names = new Map((await db("users").whereIn("id", ids).select("id", "name")).map((u) => [u.id as string, u.name as string]));
  const person = (id: unknown) => (typeof id === "string" && names.has(id) ? { id, name: names.get(id)! } : null);
  return rows.map((r) => ({
    id: r.id as string,
    receivedAt: (r.first_received_at as Date).toISOString(),
    lastReceivedAt: (r.last_received_at as Date).toISOString(),
    callingAe: r.calling_ae as string,
    objects: objects
      .filter((o) => o.study_id === r.id)
      .map((o) => ({
        id: o.id as string,
        facts: dicomFactsView(o.facts as Record<string, unknown>),
        sizeBytes: Number(o.size_bytes),
        hasPreview: o.preview_key !== null,
      })),
    matchedTo: person(r.matched_user_id),
    claimedBy: person(r.claimed_by),
  }));
}

export async function listInbox(db: Db, user: AuthUser): Promise<InboxStudy[]> {
  return presentStudies(db, await visibleStudies(db, user).orderBy("s.last_received_at", "desc").select("s.*"));
}

/** The stored preview of one object of a study the user may see; 404 otherwise. */
export async function inboxPreview(db: Db, user: AuthUser, studyId: string, objectId: string): Promise<string> {
  const row = await visibleStudies(db, user)
    .join("dicom_inbox_objects as o", "o.study_id", "s.id")
    .where({ "s.id": studyId, "o.id": objectId })
    .whereNotNull("o.preview_key")
    .first("o.preview_key");
  if (!row) throw notFound("Preview");
  return row.preview_key as string;
}

/** A clinician takes a study that matched nobody (or them); 409 when someone else has it. */
export async function claimStudy(db: Db, user: AuthUser, actor: Actor, id: string): Promise<InboxStudy> {
  return db.transaction(async (trx) => {
    const study = await visibleStudies(trx, user).where("s.id", id).forUpdate().first("s.*");
    if (!study) throw notFound("Inbox study");
    if (study.claimed_by && study.claimed_by !== user.id) throw new HttpError(409, "already_claimed", "This study has been claimed by someone else");
    await trx("dicom_inbox_studies").where("id", id).update({ claimed_by: user.id });
    await auditAs(trx, actor, { action: "dicom_inbox.claimed", entityType: "dicom_inbox_study", entityId: id });
    return (await presentStudies(trx, [{ ...study, claimed_by: user.id }]))[0];
  });
}

/**
 * Makes a draft exam of an inbox study in one step: the exam's details as in POST /exams, and
 * every received object as a clip (through addClip, so each is checked, de-identified with the
 * study's UID secret and processed like an upload). The study leaves the inbox.
 */
export async function examFromStudy(
  deps: ClipDeps & ExamDeps,
  user: AuthUser,
  actor: Actor,
  id: string,
  body: z.output<typeof examCreateSchema>,
): Promise<ExamView> {
  const { db, storage } = deps;
  const study = await visibleStudies(db, user).where("s.id", id).first("s.*");
  if (!study) throw notFound("Inbox study");
  if (study.claimed_by && study.claimed_by !== user.id) throw new HttpError(409, "already_claimed", "This study has been claimed by someone else");
  const taken = await db("dicom_inbox_studies")
    .where({ id, exam_id: null })
    .whereRaw("coalesce(claimed_by, ?) = ?", [user.id, user.id])
    .update({ claimed_by: user.id });
  if (!taken) throw new HttpError(409, "already_claimed", "This study has been claimed or made into an exam already");
  let exam: ExamView["exam"];
  try {
    exam = (await createExam(deps, user, actor, body)).exam;
  } catch (err) {
    await db("dicom_inbox_studies")
      .where("id", id)
      .update({ claimed_by: study.claimed_by ?? null });
    throw err;
  }
  await db("exams").where("id", exam.id).update({ dicom_uid_secret: study.uid_secret });
  const objects = await db("dicom_inbox_objects").where("study_id", id).orderBy("received_at");
  const dir = await fsp.mkdtemp(path.join(os.tmpdir(), "soundings-inbox-"));
  try {
    for (const [i, o] of objects.entries()) {
      const file = path.join(dir, `${o.id}.dcm`);
      await storage.download(o.storage_key, file);
      await addClip(deps, actor, {
        exam: { id: exam.id, programId: user.programId },
        path: file,
        originalName: `received-${i + 1}.dcm`,
        sizeBytes: Number(o.size_bytes),
        view: null,
      });
    }
  } catch (err) {
    // All or nothing: the half-made draft is discarded (with its stored clips) and the study
    // goes back to the inbox as it was.
    await discardExam(deps, user, actor, exam.id).catch(deps.log);
    await db("dicom_inbox_studies")
      .where("id", id)
      .update({ claimed_by: study.claimed_by ?? null });
    throw err;
  } finally {
    await fsp.rm(dir, { recursive: true, force: true });
  }
  await db("dicom_inbox_studies").where("id", id).update({ exam_id: exam.id });
  await auditAs(db, actor, {
    action: "dicom_inbox.exam_made",
    entityType: "dicom_inbox_study",
    entityId: id,
    details: { examId: exam.id, objects: objects.length },
  });
  return examForViewer(db, user, exam.id);
}
