// DICOM uploads (issue 13): recognised by content; pydicom's own test files (Debian's
// python3-pydicom, pydicom/data/test_files) and an ultrasound multi-frame object built here
// with dcmjs become clips at the object's frame rate; what is kept is de-identified by the
// PS3.15 Annex E Basic Profile, checked with two outside readers: DCMTK's dcmdump and pydicom.
// UIDs are replaced consistently within an exam; the region calibration is kept and gives the
// depth; redaction boxes clean the object's own pixels; bad objects are refused by name with
// nothing stored.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { efastExamBody, makeKit, makeMember, makeProgram, tokenFor, type TestKit, type TestMember } from "./helpers";
import { startMediaWorker, type MediaWorker } from "../../server/jobs/worker";
import { INVENTED, usMultiframe } from "../fixtures/dicom";

/** Debian's python3-pydicom test files. */
const PYDICOM_FILES = "/usr/lib/python3/dist-packages/pydicom/data/test_files";
const PYTHON = process.env.SOUNDINGS_PYTHON ?? (fs.existsSync("/usr/bin/python3") ? "/usr/bin/python3" : "python3");

let kit: TestKit;
let worker: MediaWorker;
let owner: TestMember;
let auth: string;
let dir: string;

beforeAll(async () => {
  kit = makeKit({ JOB_SCHEMA: "pgboss_dicomtest", JOB_RETRY_LIMIT: "0" });
  worker = await startMediaWorker({ db: kit.db, storage: kit.storage, config: kit.config, queue: await kit.queue(), log: () => {} });
  const program = await makeProgram(kit.db);
  owner = await makeMember(kit.db, program.id, ["sonographer"]);
  auth = `Bearer ${await tokenFor(kit, owner)}`;
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "soundings-dicom-test-"));
});
afterAll(async () => {
  await worker.stop();
  await kit.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

const newExam = async () => {
  const res = await request(kit.app).post("/api/exams").set("Authorization", auth).send(efastExamBody());
  expect(res.status).toBe(201);
  return res.body.exam as { id: string };
};
const upload = (examId: string, content: Buffer, filename: string) =>
  request(kit.app).post(`/api/exams/${examId}/clips`).set("Authorization", auth).attach("file", content, { filename });

async function settled(clipId: string) {
  for (let i = 0; i < 300; i++) {
    const c = await kit.db("clips").where("id", clipId).first();
    if (["ready", "failed"].includes(c.state)) return c;
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error("clip never settled");
}
/** The stored object of a key, as a file. */
async function stored(key: string, name: string) {
  const file = path.join(dir, name);
  await kit.storage.download(key, file);
  return file;
}
/** What pydicom reads from a file: the attributes asked for (null when absent), private tags, the pixel array's shape. */
function pydicomRead(file: string, keywords: string[]) {
  const script = `
import json, sys, pydicom
d = pydicom.dcmread(sys.argv[1])
out = {k: (str(d[k].value) if k in d else None) for k in sys.argv[2:]}
out["_private"] = [str(e.tag) for e in d if e.tag.is_private]
out["_shape"] = list(d.pixel_array.shape)
out["_regions"] = [float(r.PhysicalDeltaY) for r in d.get("SequenceOfUltrasoundRegions", [])]
out["_codes"] = [c.CodeValue for c in d.get("DeidentificationMethodCodeSequence", [])]
print(json.dumps(out))
`;
  return JSON.parse(execFileSync(PYTHON, ["-c", script, file, ...keywords], { encoding: "utf8" })) as Record<string, unknown> & {
    _private: string[];
    _shape: number[];
    _regions: number[];
    _codes: string[];
  };
}

describe("DICOM upload", () => {
  it("turns pydicom's RLE, YBR and JPEG test files into a clip and stills, whatever their extension", async () => {
    const exam = await newExam();
    const rle = await upload(exam.id, fs.readFileSync(path.join(PYDICOM_FILES, "SC_rgb_rle_2frame.dcm")), "loop");
    const ybr = await upload(exam.id, fs.readFileSync(path.join(PYDICOM_FILES, "SC_ybr_full_422_uncompressed.dcm")), "image.bin");
    const jpeg = await upload(exam.id, fs.readFileSync(path.join(PYDICOM_FILES, "JPEG-lossy.dcm")), "JPEG-lossy.dcm");
    for (const r of [rle, ybr, jpeg]) expect(r.status, JSON.stringify(r.body)).toBe(202);
    const [a, b, c] = await Promise.all([rle, ybr, jpeg].map((r) => settled(r.body.id)));
    expect([a.state, b.state, c.state], [a.error, b.error, c.error].join(" | ")).toEqual(["ready", "ready", "ready"]);
    // Two frames make a clip; one frame a still (pydicom's files carry no frame rate: 30 a second is taken).
    expect([a.kind, b.kind, c.kind]).toEqual(["video", "still", "still"]);
    expect(a.frames).toBe(2);
    expect(a.dicom).toMatchObject({ transferSyntax: "RLE Lossless", frames: 2, sopClass: "Secondary Capture Image" });
    expect(c.dicom).toMatchObject({ transferSyntaxUid: "1.2.840.10008.1.2.4.51", rows: 1024, columns: 256 });
    // The kept object: pydicom's files name their patient; nothing of it is left, per pydicom and dcmdump.
    const kept = await stored(a.dicom_key, "rle.dcm");
    const read = pydicomRead(kept, ["PatientName", "PatientID", "PatientIdentityRemoved"]);
    expect(read).toMatchObject({ PatientName: "", PatientID: "", PatientIdentityRemoved: "YES" });
    expect(read._shape).toEqual([2, 100, 100, 3]);
    expect(execFileSync("dcmdump", [kept], { encoding: "utf8" })).not.toMatch(/Lestrade/);
  }, 120_000);

  it("de-identifies an ultrasound multi-frame object by the Basic Profile, keeping the calibration and the depth", async () => {
    const exam = await newExam();
    const study = "2.25.200000000000000000000000000000000077";
    const first = usMultiframe({ studyUid: study, seed: 1 });
    const second = usMultiframe({ studyUid: study, seed: 2 });
    const up1 = await upload(exam.id, first, "cine-1.dcm");
    const up2 = await upload(exam.id, second, "cine-2.dcm");
    expect([up1.status, up2.status]).toEqual([202, 202]);
    const [c1, c2] = [await settled(up1.body.id), await settled(up2.body.id)];
    expect([c1.state, c2.state], `${c1.error} ${c2.error}`).toEqual(["ready", "ready"]);
    // Facts kept before removal: depth = 400 rows × 0.02 cm (the 2D tissue region), 5 MHz, 25 frames a second.
    expect(c1.dicom).toMatchObject({ depthCm: 8, depthSource: "regions", frequencyMHz: 5, transducerType: "CURVED LINEAR", frameRate: 25, frames: 10 });
    expect(c1.fps).toBeCloseTo(25, 1);
    expect(c1.frames).toBe(10);
    // The calibrated depth feeds the pre-check: 8 cm against the eFAST's typical 12–20 cm (its catalogue entry).
    expect(c1.precheck.depth).toMatchObject({ cm: 8, typicalCm: [12, 20], against: "shallower_than_typical" });

    const files = [await stored(c1.dicom_key, "us-1.dcm"), await stored(c2.dicom_key, "us-2.dcm"), await stored(c1.original_key, "us-1-original.dcm")];
    const keywords = [
      "PatientName",
      "PatientID",
      "PatientBirthDate",
      "OperatorsName",
      "InstitutionName",
      "AccessionNumber",
      "ReferringPhysicianName",
      "StudyInstanceUID",
      "SOPInstanceUID",
      "PatientIdentityRemoved",
      "DeidentificationMethod",
      "BurnedInAnnotation",
      "FrameTime",
    ];
    const [r1, r2, r0] = files.map((f) => pydicomRead(f, keywords));
    for (const r of [r1, r2, r0]) {
      // Z: emptied (Type 2 in the image IODs); X: removed; private tags removed.
      expect(r).toMatchObject({ PatientName: "", PatientID: "", PatientBirthDate: "", ReferringPhysicianName: "", AccessionNumber: "" });
      expect([r.OperatorsName, r.InstitutionName]).toEqual([null, null]);
      expect(r._private).toEqual([]);
      expect(r.PatientIdentityRemoved).toBe("YES");
      expect(r._codes).toContain("113100");
      // No boxes: no Clean Pixel Data Option, and Burned In Annotation stays as the device said.
      expect(r._codes).not.toContain("113101");
      expect(r.BurnedInAnnotation).toBe("YES");
      // Kept: the calibration and the frame timing.
      expect(r._regions).toEqual([0.02]);
      expect(Number(r.FrameTime)).toBe(40);
      expect(r._shape).toEqual([10, 400, 320]);
    }
    // U: one study stays one study within the exam, under a new UID; instances get new UIDs.
    expect(r1.StudyInstanceUID).toBe(r2.StudyInstanceUID);
    expect(r1.StudyInstanceUID).not.toBe(study);
    expect(String(r1.StudyInstanceUID)).toMatch(/^2\.25\.\d+$/);
    expect(r1.SOPInstanceUID).not.toBe(r2.SOPInstanceUID);
    // dcmdump (DCMTK) finds none of the invented identifiers in what is stored.
    for (const f of files) {
      const dump = execFileSync("dcmdump", [f], { encoding: "utf8", maxBuffer: 64 * 1024 * 1024 });
      for (const value of Object.values(INVENTED)) expect(dump).not.toContain(value);
      expect(dump).toMatch(/\(0012,0062\) CS \[YES\]/);
    }

    // Another exam with the same study gets unrelated UIDs.
    const other = await newExam();
    const up3 = await upload(other.id, usMultiframe({ studyUid: study, seed: 3 }), "cine-3.dcm");
    const c3 = await settled(up3.body.id);
    expect(pydicomRead(await stored(c3.dicom_key, "us-3.dcm"), ["StudyInstanceUID"]).StudyInstanceUID).not.toBe(r1.StudyInstanceUID);
  }, 120_000);

  it("with redaction boxes, blacks out the object's own pixels (Clean Pixel Data Option) and only then says Burned In Annotation NO", async () => {
    const exam = await newExam();
    const up = await upload(exam.id, usMultiframe({ frames: 4, seed: 5 }), "cine.dcm");
    expect(up.status).toBe(202);
    await settled(up.body.id);
    const patch = await request(kit.app)
      .patch(`/api/clips/${up.body.id}`)
      .set("Authorization", auth)
      .send({ redactions: [{ x: 0, y: 0, w: 0.5, h: 0.25 }] });
    expect(patch.status).toBe(200);
    const clip = await settled(up.body.id);
    expect(clip.state, clip.error).toBe("ready");
    const kept = await stored(clip.dicom_key, "cleaned.dcm");
    const r = pydicomRead(kept, ["BurnedInAnnotation", "DeidentificationMethod"]);
    expect(r.BurnedInAnnotation).toBe("NO");
    expect(r._codes).toEqual(["113100", "113101"]);
    // The pixels under the box are zero in every frame; outside it they are the picture's.
    const script = `
import sys, pydicom
a = pydicom.dcmread(sys.argv[1]).pixel_array
print(int(a[:, 0:100, 0:160].max()), int(a[:, 200:, 200:].min()))`;
    const [inside, outside] = execFileSync(PYTHON, ["-c", script, kept], { encoding: "utf8" }).trim().split(" ").map(Number);
    expect(inside).toBe(0);
    expect(outside).toBeGreaterThan(20);
  }, 120_000);

  it("refuses a truncated object, a non-image object and JPEG 2000 by name, and stores nothing", async () => {
    const exam = await newExam();
    const whole = usMultiframe({ frames: 3 });
    const cases: [string, Buffer, RegExp][] = [
      ["truncated", whole.subarray(0, Math.floor(whole.length * 0.6)), /cut short/],
      ["pydicom rtplan_truncated.dcm", fs.readFileSync(path.join(PYDICOM_FILES, "rtplan_truncated.dcm")), /DICOM/],
      ["RT Plan", fs.readFileSync(path.join(PYDICOM_FILES, "rtplan.dcm")), /an RT Plan object.*not an ultrasound image/],
      ["JPEG 2000", fs.readFileSync(path.join(PYDICOM_FILES, "JPEG2000.dcm")), /JPEG 2000 \(1\.2\.840\.10008\.1\.2\.4\.91\)/],
    ];
    for (const [what, content, message] of cases) {
      const res = await upload(exam.id, content, "scan.dcm");
      expect(res.status, what).toBe(415);
      expect(res.body.error.code, what).toBe("unsupported_media_type");
      expect(res.body.error.message, what).toMatch(/^file: /);
      expect(res.body.error.message, what).toMatch(message);
    }
    expect(await kit.db("clips").where("exam_id", exam.id).first("id")).toBeUndefined();
  }, 60_000);
});
