// addClip is the one way a clip joins an exam: the upload route, the demo seed and any importer
// call it with a file on disk, not a request. These check what it promises such a caller.
import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeExam, makeKit, makeMember, makeProgram, type TestKit } from "./helpers";
import { fixtureDir, png, textFile } from "./media-fixtures";
import { addClip, type ClipDeps } from "../../server/services/clips";
import { originalKey } from "../../server/storage/keys";
import type { ClipJob } from "../../server/jobs/queue";

let kit: TestKit;
let dir: string;
beforeAll(() => {
  kit = makeKit();
  dir = fixtureDir();
});
afterAll(async () => {
  await kit.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

async function setup(maxClipsPerExam?: number) {
  const p = await makeProgram(kit.db);
  const sono = await makeMember(kit.db, p.id, ["sonographer"]);
  const exam = await makeExam(kit.db, p.id, sono.id);
  const sent: ClipJob[] = [];
  const deps: ClipDeps = { db: kit.db, storage: kit.storage, jobs: { enqueueClip: async (j) => void sent.push(j) }, log: () => {}, maxClipsPerExam };
  return { p, sono, exam, sent, deps };
}

describe("addClip", () => {
  it("stores the original under its key with its SHA-256, numbers positions, audits the actor and sends the job", async () => {
    const { p, sono, exam, sent, deps } = await setup();
    const files = [await png(dir, "a.png", 1), await png(dir, "b.png", 2)];
    const actor = { programId: p.id, userId: sono.id, ip: "192.0.2.7" };
    const rows = [];
    for (const file of files)
      rows.push(
        await addClip(deps, actor, {
          exam: { id: exam.id, programId: p.id },
          path: file,
          originalName: "../x/scan.png",
          sizeBytes: fs.statSync(file).size,
          view: "ruq",
        }),
      );
    expect(rows.map((r) => r.position)).toEqual([0, 1]);
    for (const [i, r] of rows.entries()) {
      expect(r).toMatchObject({
        kind: "still",
        mime: "image/png",
        state: "queued",
        view_key: "ruq",
        original_name: "scan.png",
        original_key: originalKey(p.id, r.id),
      });
      expect(r.sha256).toBe(crypto.createHash("sha256").update(fs.readFileSync(files[i])).digest("hex"));
      expect(await kit.storage.size(originalKey(p.id, r.id))).toBe(fs.statSync(files[i]).size);
    }
    expect(sent).toEqual(rows.map((r) => ({ clipId: r.id, version: 1 })));
    const audit = await kit.db("audit_log").where({ program_id: p.id, action: "clip.uploaded" }).orderBy("id");
    expect(audit.map((a) => [a.actor_user_id, a.entity_id, a.ip])).toEqual(rows.map((r) => [sono.id, r.id, "192.0.2.7"]));
    // The file stays where the caller put it.
    expect(files.every((f) => fs.existsSync(f))).toBe(true);
  });

  it("without an actor writes no audit entry, and a clip dated in the past never moves the exam's updated_at back", async () => {
    const { p, exam, deps } = await setup();
    const before = (await kit.db("exams").where("id", exam.id).first("updated_at")).updated_at as Date;
    const file = await png(dir, "c.png", 3);
    const createdAt = new Date(before.getTime() - 86400_000);
    const row = await addClip(deps, null, {
      exam: { id: exam.id, programId: p.id },
      path: file,
      originalName: "c.png",
      sizeBytes: fs.statSync(file).size,
      view: null,
      createdAt,
    });
    expect((row.created_at as Date).getTime()).toBe(createdAt.getTime());
    expect(((await kit.db("exams").where("id", exam.id).first("updated_at")).updated_at as Date).getTime()).toBe(before.getTime());
    expect(await kit.db("audit_log").where({ program_id: p.id, action: "clip.uploaded" })).toHaveLength(0);
  });

  it("refuses content that is not media, the same bytes twice and a clip past the limit, keeping nothing", async () => {
    const { p, exam, sent, deps } = await setup(1);
    const target = { exam: { id: exam.id, programId: p.id }, originalName: "x", view: null };
    const text = textFile(dir);
    await expect(addClip(deps, null, { ...target, path: text, sizeBytes: fs.statSync(text).size })).rejects.toMatchObject({
      status: 415,
      code: "unsupported_media_type",
    });
    const file = await png(dir, "d.png", 4);
    await addClip(deps, null, { ...target, path: file, sizeBytes: fs.statSync(file).size });
    await expect(addClip(deps, null, { ...target, path: file, sizeBytes: fs.statSync(file).size })).rejects.toMatchObject({
      status: 409,
      code: "duplicate_clip",
    });
    const other = await png(dir, "e.png", 5);
    await expect(addClip(deps, null, { ...target, path: other, sizeBytes: fs.statSync(other).size })).rejects.toMatchObject({
      status: 413,
      code: "too_many_clips",
    });
    expect(await kit.db("clips").where("exam_id", exam.id)).toHaveLength(1);
    expect(sent).toHaveLength(1);
    // The refused upload's original was removed again: only the kept clip's file is stored.
    const stored = fs.readdirSync(path.join(kit.config.storageDir, "programs", p.id), { recursive: true, withFileTypes: true }).filter((e) => e.isFile());
    expect(stored.map((e) => path.join(e.parentPath, e.name))).toEqual([path.join(kit.config.storageDir, originalKey(p.id, sent[0].clipId))]);
  });
});
