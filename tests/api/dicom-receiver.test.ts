// The DICOM receiver (issue 13) with DCMTK's echoscu and dcmsend as real clients: C-ECHO
// answers; an unknown called AE title is rejected at association; objects sent with dcmsend
// land in the program's inbox de-identified (read back with pydicom), grouped by study and
// matched to the clinician by operator name; a JPEG 2000 object and an RT plan are not
// accepted, and nothing of them is stored.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { execFile, execFileSync } from "node:child_process";
import { promisify } from "node:util";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import request from "supertest";
import sharp from "sharp";
import { makeKit, makeMember, efastExamBody, makeProgram, tokenFor, type TestKit, type TestMember } from "./helpers";
import { startDicomReceiver, type DicomReceiver } from "../../server/dicom/receiver";
import { usMultiframe } from "../fixtures/dicom";

const run = promisify(execFile);
/** Debian's python3-pydicom test files. */
const PYDICOM_FILES = "/usr/lib/python3/dist-packages/pydicom/data/test_files";
const PYTHON = process.env.SOUNDINGS_PYTHON ?? (fs.existsSync("/usr/bin/python3") ? "/usr/bin/python3" : "python3");

let kit: TestKit;
let receiver: DicomReceiver;
let programId: string;
let clinician: TestMember;
let lead: TestMember;
let ae: string;
let dir: string;
const logged: string[] = [];

beforeAll(async () => {
  kit = makeKit();
  programId = (await makeProgram(kit.db)).id;
  ae = `RCV${Math.floor(Math.random() * 1e9)}`.slice(0, 16);
  await kit.db("programs").where("id", programId).update({ dicom_ae_title: ae });
  clinician = await makeMember(kit.db, programId, ["sonographer"]);
  lead = await makeMember(kit.db, programId, ["qa_lead"]);
  // The QA lead records the name the clinician's machine writes (compared without case or "^").
  const set = await request(kit.app)
    .put(`/api/users/${clinician.id}/dicom-operator-names`)
    .set("Authorization", `Bearer ${await tokenFor(kit, lead)}`)
    .send({ names: ["varga tobias"] });
  expect(set.status, JSON.stringify(set.body)).toBe(200);
  expect(set.body.member.dicomOperatorNames).toEqual(["varga tobias"]);
  receiver = await startDicomReceiver({ db: kit.db, storage: kit.storage, log: (e) => logged.push(String(e)) }, { host: "127.0.0.1", port: 0 });
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "soundings-dicom-rcv-"));
});
afterAll(async () => {
  await receiver.close();
  await kit.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

const send = (file: string, calledAe = ae) =>
  run("dcmsend", ["-aet", "BEDSIDE_US", "-aec", calledAe, "127.0.0.1", String(receiver.port), file]).then(
    (r) => ({ ok: true, out: r.stdout + r.stderr }),
    (e: { stdout?: string; stderr?: string }) => ({ ok: false, out: `${e.stdout ?? ""}${e.stderr ?? ""}` }),
  );
const objects = () => kit.db("dicom_inbox_objects").where("program_id", programId);

describe("DICOM receiver", () => {
  it("answers C-ECHO for the program's AE title and rejects an unknown one at association", async () => {
    await expect(run("echoscu", ["-aec", ae, "127.0.0.1", String(receiver.port)])).resolves.toBeDefined();
    const refused = await run("echoscu", ["-aec", "NOSUCHPROGRAM", "127.0.0.1", String(receiver.port)]).catch((e: { stderr: string }) => e);
    expect("stderr" in refused ? refused.stderr : "").toMatch(/Called AE Title Not Recognized/i);
    expect(logged.some((l) => /unknown called AE title NOSUCHPROGRAM/.test(l))).toBe(true);
  });

  it("stores what dcmsend sends, de-identified, grouped by study and matched by operator name", async () => {
    const study = "2.25.200000000000000000000000000000000088";
    const files = [1, 2].map((seed) => {
      const f = path.join(dir, `cine-${seed}.dcm`);
      fs.writeFileSync(f, usMultiframe({ studyUid: study, seed, frames: 3 }));
      return f;
    });
    for (const f of files) expect((await send(f)).ok).toBe(true);
    const jpeg = await send(path.join(PYDICOM_FILES, "JPEG-lossy.dcm"));
    expect(jpeg.ok, jpeg.out).toBe(true);

    const studies = await kit.db("dicom_inbox_studies").where("program_id", programId).orderBy("first_received_at");
    expect(studies).toHaveLength(2);
    const [cine] = studies;
    expect(cine.calling_ae).toBe("BEDSIDE_US");
    expect(cine.matched_user_id).toBe(clinician.id);
    const stored = await objects().where("study_id", cine.id);
    expect(stored).toHaveLength(2);
    expect(stored[0].facts).toMatchObject({ depthCm: 8, frames: 3, frameRate: 25 });
    // Nothing identifying is kept (pydicom reads the stored object); one study keeps one new UID.
    const uids: string[] = [];
    for (const [i, o] of stored.entries()) {
      const f = path.join(dir, `stored-${i}.dcm`);
      await kit.storage.download(o.storage_key, f);
      const script =
        "import sys,json,pydicom;d=pydicom.dcmread(sys.argv[1]);print(json.dumps([str(d.PatientName),str(d.PatientID),d.get('OperatorsName') is None,str(d.StudyInstanceUID),d.PatientIdentityRemoved]))";
      const [name, id, noOperator, uid, removed] = JSON.parse(execFileSync(PYTHON, ["-c", script, f], { encoding: "utf8" })) as [
        string,
        string,
        boolean,
        string,
        string,
      ];
      expect([name, id, noOperator, removed]).toEqual(["", "", true, "YES"]);
      uids.push(uid);
    }
    expect(uids[0]).toBe(uids[1]);
    expect(uids[0]).not.toBe(study);
  });

  it("does not take JPEG 2000 or a non-image object, and stores nothing of them", async () => {
    const before = (await objects()).length;
    await send(path.join(PYDICOM_FILES, "JPEG2000.dcm"));
    await send(path.join(PYDICOM_FILES, "rtplan.dcm"));
    expect((await objects()).length).toBe(before);
  });

  it("lists a study for the clinician it matched, lets another claim an unmatched one, and makes an exam of it in one step", async () => {
    const other = await makeMember(kit.db, programId, ["sonographer"]);
    const as = async (m: TestMember) => `Bearer ${await tokenFor(kit, m)}`;
    // One operator name belongs to one member: giving it to another is refused, naming the field.
    const twice = await request(kit.app)
      .put(`/api/users/${other.id}/dicom-operator-names`)
      .set("Authorization", await as(lead))
      .send({ names: ["Someone^Else", "VARGA^TOBIAS"] });
    expect(twice.status).toBe(409);
    expect(twice.body.error).toMatchObject({ code: "operator_name_taken" });
    expect(twice.body.error.message).toMatch(/^names\.1: /);
    const inbox = async (m: TestMember) =>
      (
        await request(kit.app)
          .get("/api/dicom-inbox")
          .set("Authorization", await as(m))
      ).body.items as { id: string; objects: unknown[]; matchedTo: { id: string } | null }[];

    const mine = await inbox(clinician);
    const matched = mine.find((s) => s.matchedTo?.id === clinician.id)!;
    const unmatched = mine.find((s) => s.matchedTo === null)!;
    expect(matched.objects).toHaveLength(2);
    expect(JSON.stringify(mine)).not.toMatch(/Varga|Quillfeather|CH-000417/);
    // Each object has a preview (a JPEG of its middle frame, from the de-identified object);
    // another clinician cannot open the preview of a study matched to someone else.
    const objectId = (matched.objects[0] as { id: string; hasPreview: boolean }).id;
    expect((matched.objects[0] as { hasPreview: boolean }).hasPreview).toBe(true);
    const previewPath = `/api/dicom-inbox/${matched.id}/objects/${objectId}/preview`;
    const preview = await request(kit.app)
      .get(previewPath)
      .set("Authorization", await as(clinician))
      .buffer(true)
      .parse((res, cb) => {
        const chunks: Buffer[] = [];
        res.on("data", (c: Buffer) => chunks.push(c));
        res.on("end", () => cb(null, Buffer.concat(chunks)));
      });
    expect(preview.status).toBe(200);
    expect(preview.headers["content-type"]).toMatch(/image\/jpeg/);
    const meta = await sharp(preview.body as Buffer).metadata();
    expect([meta.format, meta.width, meta.height]).toEqual(["jpeg", 320, 400]);
    expect(
      (
        await request(kit.app)
          .get(previewPath)
          .set("Authorization", await as(other))
      ).status,
    ).toBe(404);
    // Someone else's match is not shown to another clinician; the unassigned study is; a QA lead sees both.
    expect((await inbox(other)).map((s) => s.id)).toEqual([unmatched.id]);
    expect((await inbox(lead)).map((s) => s.id).sort()).toEqual([matched.id, unmatched.id].sort());

    const claim = await request(kit.app)
      .post(`/api/dicom-inbox/${unmatched.id}/claim`)
      .set("Authorization", await as(other));
    expect(claim.status).toBe(200);
    expect(claim.body.study.claimedBy.id).toBe(other.id);
    expect((await inbox(clinician)).map((s) => s.id)).toEqual([matched.id]);
    const taken = await request(kit.app)
      .post(`/api/dicom-inbox/${unmatched.id}/claim`)
      .set("Authorization", await as(clinician));
    expect(taken.status).toBe(404);

    const made = await request(kit.app)
      .post(`/api/dicom-inbox/${matched.id}/exam`)
      .set("Authorization", await as(clinician))
      .send(efastExamBody());
    expect(made.status, JSON.stringify(made.body)).toBe(201);
    expect(made.body.exam.clips).toHaveLength(2);
    expect(made.body.exam.clips[0].dicom).toMatchObject({ depthCm: 8, frames: 3 });
    expect((await inbox(clinician)).map((s) => s.id)).toEqual([]);
    expect((await kit.db("dicom_inbox_studies").where("id", matched.id).first()).exam_id).toBe(made.body.exam.id);
  });

  it("makes the exam all or nothing: an object that cannot become a clip leaves no draft and the study in the inbox", async () => {
    const study = "2.25.200000000000000000000000000000000099";
    for (const seed of [4, 5]) {
      const f = path.join(dir, `pair-${seed}.dcm`);
      fs.writeFileSync(f, usMultiframe({ studyUid: study, seed, frames: 2, operator: "Nobody^Known" }));
      expect((await send(f)).ok).toBe(true);
    }
    const row = await kit
      .db("dicom_inbox_studies")
      .where("program_id", programId)
      .whereNull("exam_id")
      .whereNull("matched_user_id")
      .whereNull("claimed_by")
      .orderBy("first_received_at", "desc")
      .first();
    const [, second] = await objects().where("study_id", row.id).orderBy("received_at");
    // The second stored object is damaged (as a disk fault would): it is no DICOM any more.
    const junk = path.join(dir, "junk.txt");
    fs.writeFileSync(junk, "not a DICOM object");
    await kit.storage.put(second.storage_key, junk, "application/dicom");
    const examsBefore = (await kit.db("exams").where("program_id", programId)).length;
    const made = await request(kit.app)
      .post(`/api/dicom-inbox/${row.id}/exam`)
      .set("Authorization", `Bearer ${await tokenFor(kit, clinician)}`)
      .send(efastExamBody());
    expect(made.status).toBe(415);
    expect(made.body.error.message).toMatch(/^file: /);
    expect((await kit.db("exams").where("program_id", programId)).length).toBe(examsBefore);
    expect(await kit.db("dicom_inbox_studies").where("id", row.id).first()).toMatchObject({ exam_id: null, claimed_by: null });
  });
});
