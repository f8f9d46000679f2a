// Uploads under stress and bad input: malformed multipart, non-ASCII names, the per-exam
// limit under parallel uploads, a storage that fails, and how media answers a bad Range.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { makeClip, makeExam, makeKit, makeMember, makeProgram, tokenFor, type TestKit, type TestMember } from "./helpers";

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
