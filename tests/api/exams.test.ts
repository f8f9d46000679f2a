// Exams and clips through the API: validation, uploads and their refusals, processing by a
// real media worker on the real queue, authorized media with Range, submission.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import fs from "node:fs";
import path from "node:path";
import sharp from "sharp";
import { makeKit, makeMember, makeProgram, tokenFor, type TestKit, type TestMember } from "./helpers";
import { fixtureDir, h264Mp4, png, textFile, truncatedMp4 } from "./media-fixtures";
import { startMediaWorker, type MediaWorker } from "../../server/jobs/worker";

let kit: TestKit;
let worker: MediaWorker;
let program: { id: string; name: string };
let owner: TestMember;
let auth: string;
let dir: string;

beforeAll(async () => {
  kit = makeKit({ JOB_RETRY_LIMIT: "1", JOB_RETRY_DELAY_SECONDS: "1" });
  worker = await startMediaWorker({ db: kit.db, storage: kit.storage, config: kit.config, queue: await kit.queue(), log: () => {} });
  program = await makeProgram(kit.db);
  owner = await makeMember(kit.db, program.id, ["sonographer"]);
  auth = `Bearer ${await tokenFor(kit, owner)}`;
  dir = fixtureDir();
});
afterAll(async () => {
  await worker.stop();
  await kit.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

const anHourAgo = () => new Date(Date.now() - 3600_000).toISOString();
const newExam = async (as = auth, extra: object = {}) => {
  const res = await request(kit.app)
    .post("/api/exams")
    .set("Authorization", as)
    .send({
      applicationCode: "efast",
      performedAt: anHourAgo(),
      setting: "clinical",
      transducer: "curvilinear",
      preset: "Abdomen",
      indication: "Blunt trauma",
      findings: [{ key: "free_fluid_ruq", read: "negative" }],
      ...extra,
    });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.exam as { id: string; code: string };
};
const uploadFile = (examId: string, file: string, as = auth, view?: string) => {
  const req = request(kit.app).post(`/api/exams/${examId}/clips`).set("Authorization", as).attach("file", file);
  return view ? req.field("view", view) : req;
};
async function waitForClip(examId: string, clipId: string, states = ["ready", "failed"], timeoutMs = 30_000) {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const res = await request(kit.app).get(`/api/exams/${examId}`).set("Authorization", auth);
    const clip = res.body.exam.clips.find((c: { id: string }) => c.id === clipId);
    if (states.includes(clip.state)) return clip;
    if (Date.now() > deadline) throw new Error(`clip stayed ${clip.state}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

describe("creating exams", () => {
  it("creates a draft with a blinded code and the sonographer's reads", async () => {
    const res = await request(kit.app)
      .post("/api/exams")
      .set("Authorization", auth)
      .send({
        applicationCode: "cardiac",
        performedAt: anHourAgo(),
        setting: "educational",
        transducer: "phased",
        findings: [{ key: "pericardial_effusion", read: "positive" }],
      });
    expect(res.status).toBe(201);
    expect(res.body.exam).toMatchObject({
      status: "draft",
      application: { code: "cardiac" },
      findings: [{ key: "pericardial_effusion", read: "positive" }],
      sonographer: { id: owner.id },
    });
    expect(res.body.exam.code).toMatch(/^EX-[0-9A-HJKMNP-TV-Z]{6}$/);
  });

  it("refuses a scan in the future, an unknown application and an unknown finding, naming the field", async () => {
    const base = { applicationCode: "efast", performedAt: anHourAgo(), setting: "clinical", transducer: "linear", findings: [] };
    const future = await request(kit.app)
      .post("/api/exams")
      .set("Authorization", auth)
      .send({ ...base, performedAt: new Date(Date.now() + 3600_000).toISOString() });
    expect(future.status).toBe(400);
    expect(future.body.error.message).toMatch(/^performedAt: .*future/);
    const app = await request(kit.app)
      .post("/api/exams")
      .set("Authorization", auth)
      .send({ ...base, applicationCode: "xray" });
    expect(app.status).toBe(400);
    expect(app.body.error.message).toMatch(/^applicationCode:/);
    const finding = await request(kit.app)
      .post("/api/exams")
      .set("Authorization", auth)
      .send({ ...base, findings: [{ key: "gallstones", read: "positive" }] });
    expect(finding.status).toBe(400);
    expect(finding.body.error.message).toMatch(/^findings\.0\.key:/);
    const transducer = await request(kit.app)
      .post("/api/exams")
      .set("Authorization", auth)
      .send({ ...base, transducer: "laser" });
    expect(transducer.body.error.message).toMatch(/^transducer:/);
    expect(await kit.db("exams").where("sonographer_id", owner.id).andWhere("transducer", "laser").first()).toBeUndefined();
  });

  it("lists my exams with server-side filters, sorting and paging, never someone else's", async () => {
    const me = await makeMember(kit.db, program.id, ["sonographer"]);
    const other = await makeMember(kit.db, program.id, ["sonographer"]);
    const mine = `Bearer ${await tokenFor(kit, me)}`;
    for (let i = 0; i < 3; i++) await newExam(mine, { performedAt: new Date(Date.UTC(2026, 10, 10 + i, 9)).toISOString() });
    await newExam(mine, { applicationCode: "aorta", findings: [], performedAt: new Date(Date.UTC(2026, 10, 20, 9)).toISOString() });
    await newExam(`Bearer ${await tokenFor(kit, other)}`);
    const all = await request(kit.app).get("/api/exams?sort=performedAt").set("Authorization", mine);
    expect(all.body.total).toBe(4);
    expect(all.body.items.map((e: { performedAt: string }) => e.performedAt.slice(0, 10))).toEqual(["2026-11-10", "2026-11-11", "2026-11-12", "2026-11-20"]);
    const page = await request(kit.app).get("/api/exams?sort=-performedAt&limit=2&offset=1").set("Authorization", mine);
    expect(page.body.items.map((e: { performedAt: string }) => e.performedAt.slice(0, 10))).toEqual(["2026-11-12", "2026-11-11"]);
    const aorta = await request(kit.app).get("/api/exams?application=aorta").set("Authorization", mine);
    expect(aorta.body.items).toHaveLength(1);
    const range = await request(kit.app).get("/api/exams?from=2026-11-11&to=2026-11-12").set("Authorization", mine);
    expect(range.body.total).toBe(2);
    const bad = await request(kit.app).get("/api/exams?sort=name").set("Authorization", mine);
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/^sort:/);
  });
});

describe("uploads", () => {
  it("refuses a text file named .mp4 with 415 saying what was found", async () => {
    const exam = await newExam();
    const res = await uploadFile(exam.id, textFile(dir));
    expect(res.status).toBe(415);
    expect(res.body.error.message).toMatch(/found plain text/);
    expect(await kit.db("clips").where("exam_id", exam.id)).toHaveLength(0);
  });

  it("refuses an empty file, a second file in one request, and a missing file", async () => {
    const exam = await newExam();
    const empty = path.join(dir, "empty.mp4");
    fs.writeFileSync(empty, "");
    expect((await uploadFile(exam.id, empty)).body.error.code).toBe("empty_file");
    const two = await request(kit.app)
      .post(`/api/exams/${exam.id}/clips`)
      .set("Authorization", auth)
      .attach("file", h264Mp4(dir, "a.mp4"))
      .attach("file", h264Mp4(dir, "b.mp4", { seed: 1 }));
    expect(two.status).toBe(400);
    expect(two.body.error.code).toBe("too_many_files");
    const none = await request(kit.app).post(`/api/exams/${exam.id}/clips`).set("Authorization", auth).field("view", "ruq");
    expect(none.status).toBe(400);
    expect(none.body.error.message).toMatch(/^file:/);
    expect(await kit.db("clips").where("exam_id", exam.id)).toHaveLength(0);
  });

  it("refuses an oversized file with 413 and too many clips per exam", async () => {
    const small = makeKit({ MAX_UPLOAD_MB: "1", MAX_CLIPS_PER_EXAM: "1" });
    try {
      const exam = await newExam();
      const big = path.join(dir, "big.mp4");
      fs.writeFileSync(big, Buffer.concat([fs.readFileSync(h264Mp4(dir, "seed.mp4")), Buffer.alloc(1024 * 1024 + 10)]));
      const res = await request(small.app).post(`/api/exams/${exam.id}/clips`).set("Authorization", auth).attach("file", big);
      expect(res.status).toBe(413);
      expect(res.body.error.code).toBe("file_too_large");
      expect(
        (
          await request(small.app)
            .post(`/api/exams/${exam.id}/clips`)
            .set("Authorization", auth)
            .attach("file", await png(dir))
        ).status,
      ).toBe(202);
      const second = await request(small.app)
        .post(`/api/exams/${exam.id}/clips`)
        .set("Authorization", auth)
        .attach("file", await png(dir, "other.png", 9));
      expect(second.status).toBe(413);
      expect(second.body.error.code).toBe("too_many_clips");
    } finally {
      await small.close();
    }
  });

  it("keeps a path-traversal file name as a display name only, and refuses the same file twice", async () => {
    const exam = await newExam();
    const file = h264Mp4(dir, "trav.mp4", { seed: 3 });
    const res = await request(kit.app).post(`/api/exams/${exam.id}/clips`).set("Authorization", auth).attach("file", file, "../../../../etc/evil.mp4");
    expect(res.status).toBe(202);
    const row = await kit.db("clips").where("id", res.body.id).first();
    expect(row.original_name).toBe("evil.mp4");
    expect(row.original_key).toBe(`programs/${program.id}/clips/${row.id}/original`);
    expect(fs.existsSync(path.join(kit.config.storageDir, "..", "..", "..", "..", "etc", "evil.mp4"))).toBe(false);
    const again = await uploadFile(exam.id, file);
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe("duplicate_clip");
  });

  it("answers 404 for another program's exam and 403 for a QA lead who is not the owner", async () => {
    const exam = await newExam();
    const other = await makeProgram(kit.db);
    const stranger = await makeMember(kit.db, other.id, ["sonographer", "qa_lead"]);
    const res = await uploadFile(exam.id, await png(dir, "x.png", 3), `Bearer ${await tokenFor(kit, stranger)}`);
    expect(res.status).toBe(404);
    expect(
      (
        await request(kit.app)
          .get(`/api/exams/${exam.id}`)
          .set("Authorization", `Bearer ${await tokenFor(kit, stranger)}`)
      ).status,
    ).toBe(404);
    const lead = await makeMember(kit.db, program.id, ["sonographer", "qa_lead"]);
    const leadAuth = `Bearer ${await tokenFor(kit, lead)}`;
    expect((await request(kit.app).get(`/api/exams/${exam.id}`).set("Authorization", leadAuth)).status).toBe(200);
    expect((await uploadFile(exam.id, await png(dir, "y.png", 4), leadAuth)).status).toBe(403);
  });

  it("takes ten uploads at once", async () => {
    const exam = await newExam();
    const files = await Promise.all(Array.from({ length: 10 }, (_, i) => png(dir, `many-${i}.png`, i * 7)));
    const results = await Promise.all(files.map((f) => uploadFile(exam.id, f)));
    expect(results.map((r) => r.status)).toEqual(Array(10).fill(202));
    expect(new Set(results.map((r) => r.body.id)).size).toBe(10);
    const rows = await kit.db("clips").where("exam_id", exam.id).orderBy("position");
    expect(rows.map((r) => r.position)).toEqual([...Array(10).keys()]);
  });
});

describe("processing and media", () => {
  it("processes an MP4 to a playable clip with poster and strip, served with Range to those allowed", async () => {
    const exam = await newExam();
    const up = await uploadFile(exam.id, h264Mp4(dir, "play.mp4", { seconds: 2, seed: 5 }), auth, "ruq");
    expect(up.status).toBe(202);
    expect(up.body.state).toBe("queued");
    const clip = await waitForClip(exam.id, up.body.id);
    expect(clip.state).toBe("ready");
    expect(clip.view).toBe("ruq");
    expect(clip.seconds).toBeGreaterThan(1.5);
    const video = await request(kit.app).get(clip.media.video).set("Authorization", auth).buffer(true);
    expect(video.status).toBe(200);
    expect(video.headers["content-type"]).toBe("video/mp4");
    expect(video.headers["accept-ranges"]).toBe("bytes");
    const size = Number(video.headers["content-length"]);
    const part = await request(kit.app).get(clip.media.video).set("Authorization", auth).set("Range", "bytes=0-99").buffer(true);
    expect(part.status).toBe(206);
    expect(part.headers["content-range"]).toBe(`bytes 0-99/${size}`);
    expect(Number(part.headers["content-length"])).toBe(100);
    const tail = await request(kit.app).get(clip.media.video).set("Authorization", auth).set("Range", "bytes=-10");
    expect(tail.headers["content-range"]).toBe(`bytes ${size - 10}-${size - 1}/${size}`);
    const beyond = await request(kit.app)
      .get(clip.media.video)
      .set("Authorization", auth)
      .set("Range", `bytes=${size + 5}-`);
    expect(beyond.status).toBe(416);
    expect(beyond.headers["content-range"]).toBe(`bytes */${size}`);
    const poster = await request(kit.app).get(clip.media.poster).set("Authorization", auth).buffer(true);
    expect((await sharp(poster.body).metadata()).format).toBe("jpeg");
    const strip = await request(kit.app).get(clip.media.strip).set("Authorization", auth);
    expect(strip.status).toBe(200);

    const peer = await makeMember(kit.db, program.id, ["sonographer", "reviewer"]);
    expect(
      (
        await request(kit.app)
          .get(clip.media.video)
          .set("Authorization", `Bearer ${await tokenFor(kit, peer)}`)
      ).status,
    ).toBe(404);
    expect((await request(kit.app).get(clip.media.video)).status).toBe(401);
  });

  it("fails a truncated MP4 with a readable reason, keeps the server up, and retries on request", async () => {
    const exam = await newExam();
    const up = await uploadFile(exam.id, truncatedMp4(dir));
    expect(up.status).toBe(202);
    const clip = await waitForClip(exam.id, up.body.id, ["failed"], 45_000);
    expect(clip.error).toMatch(/could not be read|video/i);
    expect(clip.error).not.toMatch(/\/tmp\//);
    expect((await request(kit.app).get("/api/health")).status).toBe(200);
    const retry = await request(kit.app).post(`/api/clips/${clip.id}/retry`).set("Authorization", auth);
    expect(retry.status).toBe(202);
    expect(retry.body.clip.state).toBe("queued");
    const submit = await request(kit.app).post(`/api/exams/${exam.id}/submit`).set("Authorization", auth).send({ attestNoIdentifiers: true });
    expect(submit.status).toBe(409);
  });

  it("blacks out redaction boxes and reprocesses the clip", async () => {
    const exam = await newExam();
    const up = await uploadFile(exam.id, await png(dir, "redact.png", 50));
    await waitForClip(exam.id, up.body.id);
    const patch = await request(kit.app)
      .patch(`/api/clips/${up.body.id}`)
      .set("Authorization", auth)
      .send({ redactions: [{ x: 0, y: 0, w: 0.5, h: 0.5 }] });
    expect(patch.status).toBe(200);
    expect(patch.body.clip.state).toBe("queued");
    const clip = await waitForClip(exam.id, up.body.id);
    expect(clip.redactions).toEqual([{ x: 0, y: 0, w: 0.5, h: 0.5 }]);
    const img = await request(kit.app).get(clip.media.image).set("Authorization", auth).buffer(true);
    const { data, info } = await sharp(img.body).greyscale().raw().toBuffer({ resolveWithObject: true });
    const at = (x: number, y: number) => data[y * info.width + x];
    expect(at(10, 10)).toBeLessThan(8);
    expect(at(info.width / 2 - 2, info.height / 2 - 2)).toBeLessThan(8);
    expect(at(info.width - 5, info.height - 5)).toBeGreaterThan(20);
    const bad = await request(kit.app)
      .patch(`/api/clips/${up.body.id}`)
      .set("Authorization", auth)
      .send({ redactions: [{ x: 0.8, y: 0, w: 0.5, h: 0.5 }] });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/^redactions\.0/);
  });
});

describe("submitting", () => {
  it("needs the attestation and a ready clip; then deletes the original and freezes the exam", async () => {
    const exam = await newExam();
    const none = await request(kit.app).post(`/api/exams/${exam.id}/submit`).set("Authorization", auth).send({ attestNoIdentifiers: true });
    expect(none.status).toBe(409);
    expect(none.body.error.code).toBe("no_ready_clip");
    const up = await uploadFile(exam.id, h264Mp4(dir, "submit.mp4", { seed: 11 }));
    await waitForClip(exam.id, up.body.id);
    const noAttest = await request(kit.app).post(`/api/exams/${exam.id}/submit`).set("Authorization", auth).send({ attestNoIdentifiers: false });
    expect(noAttest.status).toBe(400);
    expect(noAttest.body.error.message).toMatch(/^attestNoIdentifiers:/);
    const originalKey = (await kit.db("clips").where("id", up.body.id).first()).original_key;
    expect(await kit.storage.size(originalKey)).toBeGreaterThan(0);
    const ok = await request(kit.app).post(`/api/exams/${exam.id}/submit`).set("Authorization", auth).send({ attestNoIdentifiers: true });
    expect(ok.status).toBe(200);
    expect(ok.body.exam.status).toBe("in_review");
    expect(await kit.storage.size(originalKey)).toBeNull();
    expect((await kit.db("clips").where("id", up.body.id).first()).original_key).toBeNull();
    const edit = await request(kit.app).patch(`/api/exams/${exam.id}`).set("Authorization", auth).send({ indication: "changed" });
    expect(edit.status).toBe(409);
    expect((await uploadFile(exam.id, await png(dir, "late.png", 77))).status).toBe(409);
  });
});
