// Uploads under stress and bad input: malformed multipart, non-ASCII names, the per-exam
// limit under parallel uploads, a storage that fails, and how media answers a bad Range.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { makeClip, makeExam, makeKit, makeMember, makeProgram, tokenFor, type TestKit, type TestMember } from "./helpers";
import { fixtureDir, png } from "./media-fixtures";

const tmpRoot = fs.mkdtempSync(path.join(os.tmpdir(), "soundings-uploads-test-"));
/** A kit with its own storage and temporary folders, so leftovers can be counted. */
const isolatedKit = (name: string, env: Record<string, string> = {}, opts?: Parameters<typeof makeKit>[1]) =>
  makeKit({ STORAGE_DIR: path.join(tmpRoot, name, "storage"), UPLOAD_TMP_DIR: path.join(tmpRoot, name, "tmp"), ...env }, opts);

let kit: TestKit;
let programId: string;
let sono: TestMember;
let auth: string;
beforeAll(async () => {
  kit = isolatedKit("main");
  programId = (await makeProgram(kit.db)).id;
  sono = await makeMember(kit.db, programId, ["sonographer"]);
  auth = `Bearer ${await tokenFor(kit, sono)}`;
});
afterAll(async () => {
  await kit.close();
  fs.rmSync(tmpRoot, { recursive: true, force: true });
});

describe("Range on media", () => {
  // RFC 9110 section 15.5.17 (416 Range Not Satisfiable) and 14.4 (Content-Range "bytes */length").
  it("answers 416 as a JSON error with Content-Range bytes */size", async () => {
    const exam = await makeExam(kit.db, programId, sono.id);
    const clip = await makeClip(kit, exam, "ready"); // a 10-byte stored video
    const res = await request(kit.app).get(`/api/clips/${clip.id}/media/video`).set("Authorization", auth).set("Range", "bytes=50-");
    expect(res.status).toBe(416);
    expect(res.headers["content-type"]).toMatch(/^application\/json/);
    expect(res.headers["content-range"]).toBe("bytes */10");
    expect(res.body.error.code).toBe("range_not_satisfiable");
    const ok = await request(kit.app).get(`/api/clips/${clip.id}/media/video`).set("Authorization", auth).set("Range", "bytes=2-4");
    expect(ok.status).toBe(206);
    expect(ok.headers["content-type"]).toBe("video/mp4");
  });
});

/** Every file below `dir` (recursively); an absent folder has none. */
const filesUnder = (dir: string): string[] =>
  fs.existsSync(dir) ? (fs.readdirSync(dir, { recursive: true, withFileTypes: true }) as fs.Dirent[]).filter((d) => d.isFile()).map((d) => d.name) : [];
const storedFor = (k: TestKit, examProgram: string) => filesUnder(path.join(k.config.storageDir, "programs", examProgram));
const clipCount = async (k: TestKit, examId: string) =>
  Number((await k.db("clips").where("exam_id", examId).count<{ count: string }[]>("* as count"))[0].count);

/** A hand-made multipart/form-data body (RFC 7578) around a small PNG. */
function multipart(boundary: string, fileName: string, content: Buffer, extra = "") {
  return Buffer.concat([
    Buffer.from(`${extra}--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${fileName}"\r\nContent-Type: image/png\r\n\r\n`, "latin1"),
    content,
    Buffer.from(`\r\n--${boundary}--\r\n`),
  ]);
}

describe("malformed multipart", () => {
  let dir: string;
  let pngBytes: Buffer;
  beforeAll(async () => {
    dir = fixtureDir();
    pngBytes = fs.readFileSync(await png(dir, "raw.png", 3));
  });

  const post = (examId: string, contentType: string, body: Buffer) =>
    request(kit.app).post(`/api/exams/${examId}/clips`).set("Authorization", auth).set("Content-Type", contentType).send(body);

  it("answers 400 and stores nothing for a truncated body, a missing boundary, or control characters in the file name", async () => {
    const b = "----soundings-test-boundary";
    const whole = multipart(b, "scan.png", pngBytes);
    const cases: [string, string, Buffer][] = [
      ["truncated", `multipart/form-data; boundary=${b}`, whole.subarray(0, whole.length - 40)],
      ["no boundary", "multipart/form-data", whole],
      ["NUL in the name", `multipart/form-data; boundary=${b}`, multipart(b, "sc\u0000an.png", pngBytes)],
      ["control characters in the name", `multipart/form-data; boundary=${b}`, multipart(b, "sc\u0001an\u007f.png", pngBytes)],
      ["a tab in the name", `multipart/form-data; boundary=${b}`, multipart(b, "sc\tan.png", pngBytes)],
      [
        "NUL in the view field",
        `multipart/form-data; boundary=${b}`,
        multipart(b, "scan.png", pngBytes, `--${b}\r\nContent-Disposition: form-data; name="view"\r\n\r\nru\u0000q\r\n`),
      ],
    ];
    for (const [what, type, body] of cases) {
      const exam = await makeExam(kit.db, programId, sono.id);
      const res = await post(exam.id, type, body);
      expect(res.status, `${what}: ${JSON.stringify(res.body)}`).toBe(400);
      expect(res.type).toBe("application/json");
      expect(res.body.error.message, what).toMatch(/^(file|view|multipart)/);
      expect(await clipCount(kit, exam.id), what).toBe(0);
      expect(
        storedFor(kit, programId).filter((f) => f === "original"),
        what,
      ).toEqual([]);
      expect(filesUnder(kit.config.uploads.tempDir), what).toEqual([]);
    }
  });

  it("keeps a non-ASCII file name as sent (UTF-8, RFC 7578 section 4.2)", async () => {
    const exam = await makeExam(kit.db, programId, sono.id);
    const name = "Lébé—出血.png";
    const res = await request(kit.app).post(`/api/exams/${exam.id}/clips`).set("Authorization", auth).attach("file", pngBytes, name);
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    expect(res.body.clip.originalName).toBe(name);
    const shown = await request(kit.app).get(`/api/exams/${exam.id}`).set("Authorization", auth);
    expect(JSON.stringify(shown.body)).toContain(name);
    const row = await kit.db("clips").where("id", res.body.id).first("original_name");
    expect(row.original_name).toBe(name);
  });
});

describe("the per-exam clip limit under parallel uploads", () => {
  it("keeps exactly MAX_CLIPS_PER_EXAM (20) of 30 parallel uploads and refuses the rest with 413, leaving no orphan file", async () => {
    const dir = fixtureDir();
    const files = await Promise.all(Array.from({ length: 30 }, (_, i) => png(dir, `p${i}.png`, i)));
    const exam = await makeExam(kit.db, programId, sono.id);
    const before = storedFor(kit, programId).length;
    const answers = await Promise.all(files.map((f) => request(kit.app).post(`/api/exams/${exam.id}/clips`).set("Authorization", auth).attach("file", f)));
    const statuses = answers.map((r) => r.status).sort();
    expect(statuses.filter((s) => s === 202)).toHaveLength(20);
    expect(statuses.filter((s) => s === 413)).toHaveLength(10);
    for (const r of answers.filter((a) => a.status === 413)) expect(r.body.error.code).toBe("too_many_clips");
    expect(await clipCount(kit, exam.id)).toBe(20);
    const positions = (await kit.db("clips").where("exam_id", exam.id).orderBy("position").pluck("position")) as number[];
    expect(positions).toEqual(Array.from({ length: 20 }, (_, i) => i));
    // One stored original per kept clip, none for a refused one; no temporary files.
    const originals = fs.readdirSync(path.join(kit.config.storageDir, "programs", programId, "clips")).filter((id) => answers.some((a) => a.body?.id === id));
    expect(originals).toHaveLength(20);
    expect(storedFor(kit, programId).length - before).toBe(20);
    expect(filesUnder(kit.config.uploads.tempDir)).toEqual([]);
  }, 60_000);
});

describe("a storage that fails while storing", () => {
  it("answers 507 storage_full and keeps no clip row and no part of the file", async () => {
    const failing = isolatedKit(
      "failing",
      {},
      {
        // Writes the object, then fails like a disk that filled up during the write.
        wrapStorage: (real) => ({
          ...real,
          driver: real.driver,
          put: async (key, source, type) => {
            await real.put(key, source, type);
            throw Object.assign(new Error("ENOSPC: no space left on device, write"), { code: "ENOSPC" });
          },
          get: real.get.bind(real),
          size: real.size.bind(real),
          download: real.download.bind(real),
          delete: real.delete.bind(real),
        }),
      },
    );
    try {
      const exam = await makeExam(failing.db, programId, sono.id);
      const dir = fixtureDir();
      const res = await request(failing.app)
        .post(`/api/exams/${exam.id}/clips`)
        .set("Authorization", `Bearer ${await tokenFor(failing, sono)}`)
        .attach("file", await png(dir, "full.png", 77));
      expect(res.status, JSON.stringify(res.body)).toBe(507);
      expect(res.body.error.code).toBe("storage_full");
      expect(res.body.error.message).toMatch(/^file: /);
      expect(await clipCount(failing, exam.id)).toBe(0);
      expect(storedFor(failing, programId)).toEqual([]);
      // Nor an empty clips/<id>/ folder: the program's folder holds nothing, so it is gone.
      expect(fs.existsSync(path.join(failing.config.storageDir, "programs", programId))).toBe(false);
      expect(filesUnder(failing.config.uploads.tempDir)).toEqual([]);
    } finally {
      await failing.close();
    }
  });
});
