// The program's DICOM inbox: what ultrasound machines send lands here, de-identified and
// grouped by study, until a clinician makes an exam of it. A study is known by a keyed hash of
// its original Study Instance UID (the key is the program's own), so later objects of the same
// study join it without the UID being kept. The operator name an object carries is compared
// with the names each member gave for themselves, and only the match is kept.
import crypto from "node:crypto";
import fsp from "node:fs/promises";
import type { Db } from "../db/knex";
import type { Storage } from "../storage/types";
import { readDicom } from "../media/dicom/read";
import { deidentify } from "../media/dicom/deidentify";
import { storageFailed } from "./clips";

/** An operator name as compared: "Varga^Tobias" and "varga tobias" are the same person. */
export const normaliseOperatorName = (name: string) =>
  name
    .toUpperCase()
    .replace(/[\^,=]+/g, " ")
    .replace(/\s+/g, " ")
    .trim();

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
  input: { programId: string; callingAe: string; file: string; bytes: Buffer },
): Promise<string> {
  const { db, storage } = deps;
  const read = readDicom(input.bytes);
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
  const tmp = `${input.file}.deidentified`;
  await fsp.writeFile(tmp, bytes);
  try {
    await storage.put(key, tmp, "application/dicom");
  } catch (err) {
    await storage.delete(key).catch(() => undefined);
    throw storageFailed(err);
  } finally {
    await fsp.rm(tmp, { force: true });
  }
  const inserted = await db("dicom_inbox_objects")
    .insert({ id, study_id: study.id, program_id: input.programId, storage_key: key, sha256, size_bytes: bytes.length, facts: JSON.stringify(read.facts) })
    .onConflict(["study_id", "sha256"])
    .ignore()
    .returning("id");
  // The same object sent twice is kept once.
  if (!inserted.length) await storage.delete(key).catch(() => undefined);
  return study.id as string;
}
