// The demo exam seed: invented clips generated with ffmpeg, stored, sent through the real
// queue and pipeline; drafts and submitted exams; one clip that fails; seeded only once.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { makeKit, makeMember, makeProgram, type TestKit } from "./helpers";
import { seedDemoExams } from "../../seeds/demo-exams";
import { seedLearningHistory } from "../../seeds/demo-history";
import { computeProgress } from "../../server/services/progress";
import { startMediaWorker, type MediaWorker } from "../../server/jobs/worker";
import { insertCatalogue } from "../../server/repositories/applications";
import { DEFAULT_CATALOGUE } from "../../shared/catalogue";

let kit: TestKit;
let worker: MediaWorker;
let dir: string;
beforeAll(async () => {
  kit = makeKit({ JOB_SCHEMA: "pgboss_demotest", JOB_RETRY_LIMIT: "0" });
  worker = await startMediaWorker({ db: kit.db, storage: kit.storage, config: kit.config, queue: await kit.queue(), log: () => {} });
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "soundings-demo-lib-"));
});
afterAll(async () => {
  await worker.stop();
  await kit.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

describe("demo exam seed", () => {
  it("seeds drafts and submitted exams whose clips end ready, with one failed clip, and only once", async () => {
    const p = await makeProgram(kit.db);
    await kit.db("applications").where("program_id", p.id).delete();
    await insertCatalogue(
      kit.db,
      p.id,
      DEFAULT_CATALOGUE.filter((a) => ["dvt", "soft_tissue"].includes(a.code)),
    );
    await makeMember(kit.db, p.id, ["sonographer"]);
    await makeMember(kit.db, p.id, ["sonographer", "reviewer"]);
    await makeMember(kit.db, p.id, ["reviewer"]);
    await makeMember(kit.db, p.id, ["reviewer", "qa_lead"]);
    const deps = { db: kit.db, storage: kit.storage, jobs: await kit.queue() };
    const n = await seedDemoExams(deps, { libraryDir: dir, programId: p.id, apps: ["dvt", "soft_tissue"], count: 12 });
    expect(n).toBe(12);
    expect(await seedDemoExams(deps, { libraryDir: dir, programId: p.id, apps: ["dvt", "soft_tissue"], count: 12 })).toBe(0);

    const exams = await kit.db("exams").where("program_id", p.id);
    expect(exams.filter((e) => e.status === "draft")).toHaveLength(10);
    const sent = exams.filter((e) => e.status !== "draft");
    expect(sent).toHaveLength(2);
    // The older sent exams are already reviewed through the real services (or await adjudication).
    expect(sent.every((e) => ["reviewed", "adjudication"].includes(e.status))).toBe(true);
    const results = await kit.db("exam_results").whereIn(
      "exam_id",
      sent.map((e) => e.id),
    );
    expect(results.length).toBe(sent.filter((e) => e.status === "reviewed").length);
    const reviews = await kit.db("reviews").whereIn(
      "exam_id",
      sent.map((e) => e.id),
    );
    expect(reviews.every((r) => r.reviewer_id !== sent.find((e) => e.id === r.exam_id)!.sonographer_id)).toBe(true);
    expect(new Set(exams.map((e) => e.sonographer_id)).size).toBe(2);

    const settled = async () => kit.db("clips").where("program_id", p.id).whereIn("state", ["queued", "processing"]).count<{ c: string }[]>("* as c");
    for (let i = 0; i < 300 && Number((await settled())[0].c) > 0; i++) await new Promise((r) => setTimeout(r, 200));
    const clips = await kit.db("clips").where("program_id", p.id);
    expect(clips.filter((c) => c.state === "failed")).toHaveLength(1);
    expect(clips.filter((c) => c.state === "ready").length).toBe(clips.length - 1);
    const stills = clips.filter((c) => c.kind === "still" && c.state === "ready");
    expect(stills.length).toBeGreaterThan(0);
    // Submitted exams keep no originals once their clips are done.
    const submittedIds = new Set(exams.filter((e) => e.status === "submitted").map((e) => e.id));
    expect(clips.filter((c) => submittedIds.has(c.exam_id)).every((c) => c.original_key === null)).toBe(true);
  }, 120_000);

  it("seeds learning histories whose progress the demo screens can show", async () => {
    const p = await makeProgram(kit.db);
    const improving = await makeMember(kit.db, p.id, ["sonographer"]);
    const clean = await makeMember(kit.db, p.id, ["sonographer"]);
    await makeMember(kit.db, p.id, ["reviewer"]);
    await makeMember(kit.db, p.id, ["reviewer", "qa_lead"]);
    const deps = { db: kit.db, storage: kit.storage, jobs: await kit.queue() };
    // The library clip comes from the exam seed (efast is part of the default catalogue).
    await seedDemoExams(deps, { libraryDir: dir, programId: (await makeProgram(kit.db)).id, apps: ["efast"], count: 0 });
    const made = await seedLearningHistory(deps, {
      libraryDir: dir,
      programId: p.id,
      learners: [
        { email: improving.email, exams: 12, failures: [2, 5], slips: [0.5, 0.1] },
        { email: clean.email, exams: 22, failures: [], slips: [0.2, 0.05] },
      ],
    });
    expect(made).toBe(34);
    const [a, b] = await computeProgress(kit.db, p.id, [improving.id, clean.id], { window: 10 });
    const efastA = a.applications.find((x) => x.application.code === "efast")!;
    expect([efastA.reviewed, efastA.credited]).toEqual([12, 10]);
    expect(efastA.cusum.points.filter((x) => x.failed).map((x) => x.n)).toEqual([2, 5]);
    // p0 = .1, p1 = .2, alpha = beta = .1: s = .145244 and h0 = -2.709511 (Wald 1945, worked
    // in shared/stats/cusum.test.ts), so an unbroken run first reaches h0 at the 19th success.
    const efastB = b.applications.find((x) => x.application.code === "efast")!;
    expect(efastB.cusum.signal).toBe("competent");
    expect(efastB.cusum.signalAtAttempt).toBe(19);
    expect(b.total.credited).toBe(22);
    expect(a.focusAreas.length + a.strengths.length).toBeGreaterThan(0);
    const confirmations = await kit.db("confirmations").where("program_id", p.id);
    expect(confirmations.length).toBeGreaterThan(0);
  }, 120_000);
});
