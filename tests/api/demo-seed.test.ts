// The demo seed makes clinical sense (issue 12): every exam records each required view of its
// application; a fluid finding the case has shows as dark fluid in the clip of its view and is
// absent elsewhere; reviews come through the real services with double reads that mostly agree
// and one that goes to adjudication; drafts, a queue, one failed clip; a calibration set with
// reads and reference answers; learning histories whose eFAST exams have all their views.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import sharp from "sharp";
import { makeKit, makeMember, makeProgram, type TestKit } from "./helpers";
import { CEDAR_HOLLOW_CASES, TAMSIN_RIDGE_CASES, seedDemoExams } from "../../seeds/demo-exams";
import { seedLearningHistory } from "../../seeds/demo-history";
import { computeProgress } from "../../server/services/progress";
import { calibrationSetResults } from "../../server/services/calibration";
import { startMediaWorker, type MediaWorker } from "../../server/jobs/worker";
import { insertCatalogue } from "../../server/repositories/applications";
import { updateSettings } from "../../server/repositories/settings";
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

async function programWith(codes: string[]) {
  const p = await makeProgram(kit.db);
  await kit.db("applications").where("program_id", p.id).delete();
  await insertCatalogue(
    kit.db,
    p.id,
    DEFAULT_CATALOGUE.filter((a) => codes.includes(a.code)),
  );
  return p;
}
const noJobs = { enqueueClip: async () => {} };

/** Share of near-black pixels in the middle of the imaging area of a still (the anechoic part). */
async function darkShare(file: string): Promise<number> {
  const { data, info } = await sharp(file).greyscale().raw().toBuffer({ resolveWithObject: true });
  let dark = 0;
  let n = 0;
  for (let y = Math.round(info.height * 0.2); y < info.height * 0.8; y++)
    for (let x = Math.round(info.width * 0.3); x < info.width * 0.7; x++, n++) if (data[y * info.width + x] < 12) dark++;
  return dark / n;
}

describe("demo exam seed", () => {
  it("records every required view, draws fluid only where the case has it, reviews through the services, and seeds once", async () => {
    const p = await programWith(["dvt", "soft_tissue"]);
    const clinicians = [await makeMember(kit.db, p.id, ["sonographer"]), await makeMember(kit.db, p.id, ["sonographer", "reviewer"])];
    await makeMember(kit.db, p.id, ["reviewer"]);
    await makeMember(kit.db, p.id, ["reviewer", "qa_lead"]);
    const deps = { db: kit.db, storage: kit.storage, jobs: await kit.queue() };
    const cases = CEDAR_HOLLOW_CASES.filter((c) => ["dvt", "soft_tissue"].includes(c.app));
    expect(await seedDemoExams(deps, { libraryDir: dir, programId: p.id, apps: ["dvt", "soft_tissue"] })).toBe(cases.length);
    expect(await seedDemoExams(deps, { libraryDir: dir, programId: p.id, apps: ["dvt", "soft_tissue"] })).toBe(0);

    const exams = await kit.db("exams as e").join("applications as a", "a.id", "e.application_id").where("e.program_id", p.id).select("e.*", "a.code as app");
    expect(exams.map((e) => e.indication).sort()).toEqual(cases.map((c) => c.indication).sort());
    expect(new Set(exams.map((e) => e.sonographer_id))).toEqual(new Set(clinicians.map((c) => c.id)));
    expect(exams.filter((e) => e.status === "draft")).toHaveLength(cases.filter((c) => c.stage === "draft").length);

    // Each exam has a clip of every required view of its application.
    for (const e of exams) {
      const required = await kit.db("application_views").where({ application_id: e.application_id, required: true }).pluck("key");
      const have = await kit.db("clips").where("exam_id", e.id).whereNotNull("view_key").pluck("view_key");
      expect(new Set(have)).toEqual(new Set(required));
    }

    // The abscess case: the clinician read it positive, and both planes show dark fluid that
    // the cellulitis case's planes do not.
    const abscess = exams.find((e) => e.indication === "Red, painful swelling of the forearm")!;
    const cellulitis = exams.find((e) => e.indication === "Spreading redness and warmth of the lower leg")!;
    const read = async (examId: string, key: string) => (await kit.db("exam_findings").where({ exam_id: examId, finding_key: key }).first("read")).read;
    expect(await read(abscess.id, "abscess")).toBe("positive");
    expect(await read(cellulitis.id, "abscess")).toBe("negative");
    const files = async (examId: string) => (await kit.db("clips").where("exam_id", examId).pluck("original_name")).map((n: string) => path.join(dir, n));
    for (const f of await files(abscess.id)) expect(await darkShare(f)).toBeGreaterThan(0.01);
    for (const f of await files(cellulitis.id)) expect(await darkShare(f)).toBeLessThan(0.002);

    // Reviews through the real services: never the clinician's own, two on a double read.
    const sent = exams.filter((e) => e.status !== "draft" && e.status !== "submitted" && e.status !== "in_review");
    expect(sent.length).toBe(cases.filter((c) => !c.stage).length);
    const reviews = await kit.db("reviews").whereIn(
      "exam_id",
      exams.map((e) => e.id),
    );
    expect(reviews.every((r) => r.reviewer_id !== exams.find((e) => e.id === r.exam_id)!.sonographer_id)).toBe(true);
    const doubles = cases.filter((c) => c.double && !c.stage).map((c) => exams.find((e) => e.indication === c.indication)!.id);
    for (const id of doubles) expect(reviews.filter((r) => r.exam_id === id)).toHaveLength(2);

    // Clips end ready except the one broken upload on the last draft.
    const settled = async () => kit.db("clips").where("program_id", p.id).whereIn("state", ["queued", "processing"]).count<{ c: string }[]>("* as c");
    for (let i = 0; i < 600 && Number((await settled())[0].c) > 0; i++) await new Promise((r) => setTimeout(r, 200));
    const clips = await kit.db("clips").where("program_id", p.id);
    expect(clips.filter((c) => c.state === "failed").map((c) => c.original_name)).toEqual(["broken.mp4"]);
    expect(clips.filter((c) => c.state === "ready").length).toBe(clips.length - 1);
    expect(clips.some((c) => c.kind === "still" && c.state === "ready")).toBe(true);
  }, 180_000);

  it("gives the second program its exams, an adjudication, and a calibration set with reads and reference answers", async () => {
    const apps = ["lung", "shock", "vascular_access"];
    const p = await programWith(apps);
    await makeMember(kit.db, p.id, ["sonographer"]);
    await makeMember(kit.db, p.id, ["sonographer"]);
    await makeMember(kit.db, p.id, ["reviewer"]);
    await makeMember(kit.db, p.id, ["reviewer"]);
    await makeMember(kit.db, p.id, ["admin", "qa_lead"]);
    const cases = TAMSIN_RIDGE_CASES.filter((c) => apps.includes(c.app));
    const n = await seedDemoExams({ db: kit.db, storage: kit.storage, jobs: noJobs }, { libraryDir: dir, programId: p.id, cases });
    expect(n).toBe(cases.length);

    const exams = await kit.db("exams").where("program_id", p.id);
    const byIndication = (s: string) => exams.find((e) => e.indication === s)!;
    // The shock case's reviewers disagree on free fluid: it waits for the QA lead.
    expect(byIndication("Undifferentiated hypotension on admission").status).toBe("adjudication");
    expect(byIndication("Hypotension after a fall at home").status).toBe("in_review");
    expect(exams.filter((e) => e.status === "reviewed").length).toBeGreaterThanOrEqual(3);

    const [set] = await kit.db("calibration_sets").where("program_id", p.id);
    expect(set.name).toBe("Quarterly calibration");
    const items = await kit.db("calibration_items").where("set_id", set.id).orderBy("position");
    expect(items).toHaveLength(cases.filter((c) => c.calibrate).length);
    expect(items.filter((i) => i.reference !== null).length).toBeGreaterThan(0);
    const reads = await kit.db("assignments").where("calibration_set_id", set.id);
    expect(reads.filter((r) => r.state === "submitted")).toHaveLength(reads.length - 1);
    const results = await calibrationSetResults(kit.db, p.id, set.id);
    expect(results.reviewers).toHaveLength(2);
  }, 120_000);

  it("seeds learning histories whose eFAST exams have every view and whose progress the demo screens can show", async () => {
    const p = await programWith(["efast"]);
    const improving = await makeMember(kit.db, p.id, ["sonographer"]);
    const clean = await makeMember(kit.db, p.id, ["sonographer"]);
    await makeMember(kit.db, p.id, ["reviewer"]);
    await makeMember(kit.db, p.id, ["reviewer", "qa_lead"]);
    // Half the history is read twice, so second reads are exercised.
    await updateSettings(kit.db, p.id, { doubleReadShare: 0.5 });
    const made = await seedLearningHistory(
      { db: kit.db, storage: kit.storage, jobs: noJobs },
      {
        libraryDir: dir,
        programId: p.id,
        learners: [
          { email: improving.email, exams: 12, failures: [2, 5], slips: [0.5, 0.1] },
          { email: clean.email, exams: 22, failures: [], slips: [0.2, 0.05] },
        ],
      },
    );
    expect(made).toBe(34);
    const views = await kit.db("clips").where("program_id", p.id).groupBy("exam_id").select("exam_id", kit.db.raw("count(distinct view_key)::int as n"));
    expect(views.map((v) => v.n)).toEqual(Array(34).fill(7));
    // Second reads that differ stay within tolerance: no history exam goes to adjudication.
    expect(await kit.db("exams").where({ program_id: p.id, status: "adjudication" }).first("id")).toBeUndefined();

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
