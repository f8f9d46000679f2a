// Calibration sets: blinded calibration reads for chosen reviewers, never deciding the exam,
// and results equal to the statistics module on the reads (Fleiss' kappa, Krippendorff's alpha).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { EFAST_FINDING_KEYS, makeExam, makeKit, makeMember, makeProgram, type TestKit, tokenFor } from "./helpers";
import { fleissKappa, krippendorffAlpha } from "../../shared/stats/index";

let kit: TestKit;
beforeAll(() => {
  kit = makeKit();
});
afterAll(() => kit.close());

const EFAST = EFAST_FINDING_KEYS;
const scores = (quality: string, depth = "fits") => ({
  transducer: "suitable",
  marker: "follows",
  depth,
  gain: "balanced",
  plane: "standard",
  labels: "complete",
  quality,
});

describe("calibration sets", () => {
  it("sends blinded calibration reads to the chosen reviewers and reports agreement and matches with the reference", async () => {
    const p = await makeProgram(kit.db);
    const lead = await makeMember(kit.db, p.id, ["qa_lead"]);
    const sono = await makeMember(kit.db, p.id, ["sonographer"]);
    const reviewers = [
      await makeMember(kit.db, p.id, ["reviewer"]),
      await makeMember(kit.db, p.id, ["reviewer"]),
      await makeMember(kit.db, p.id, ["reviewer"]),
    ];
    const exams = [];
    for (let i = 0; i < 4; i++) {
      const e = await makeExam(kit.db, p.id, sono.id, { status: "submitted" });
      await kit.db("exams").where("id", e.id).update({ status: "reviewed" });
      await kit.db("exam_findings").insert(EFAST.map((key) => ({ exam_id: e.id, finding_key: key, read: "negative" })));
      exams.push(e);
    }
    const L = `Bearer ${await tokenFor(kit, lead)}`;
    const bad = await request(kit.app)
      .post("/api/calibration-sets")
      .set("Authorization", L)
      .send({ name: "x", exams: [{ examId: exams[0].id }] });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/^exams:/);
    const created = await request(kit.app)
      .post("/api/calibration-sets")
      .set("Authorization", L)
      .send({
        name: "Autumn calibration",
        exams: exams.map((e, i) => ({ examId: e.id, ...(i === 0 ? { reference: { scores: scores("4"), reads: [] } } : {}) })),
      });
    expect(created.status).toBe(201);

    // Quality each reviewer gives the four exams.
    const plan = [
      ["4", "3", "2", "5"],
      ["4", "3", "3", "5"],
      ["3", "3", "2", "4"],
    ];
    for (const [ri, r] of reviewers.entries()) {
      const auth = `Bearer ${await tokenFor(kit, r)}`;
      for (let k = 0; k < 4; k++) {
        const claim = await request(kit.app).post("/api/queue/next").set("Authorization", auth).send({});
        expect(claim.status).toBe(200);
        expect(JSON.stringify(claim.body)).not.toContain(sono.name);
        const idx = exams.findIndex((e) => e.id === claim.body.exam.id);
        const res = await request(kit.app)
          .post(`/api/assignments/${claim.body.assignment.id}/review`)
          .set("Authorization", auth)
          .send({ scores: scores(plan[ri][idx]), reads: EFAST.map((key) => ({ key, read: "negative" })) });
        expect(res.status).toBe(201);
        expect(res.body.examState).toBe("calibration");
      }
      expect((await request(kit.app).post("/api/queue/next").set("Authorization", auth).send({})).status).toBe(204);
    }
    // Calibration never writes an exam's result.
    expect(
      await kit.db("exam_results").whereIn(
        "exam_id",
        exams.map((e) => e.id),
      ),
    ).toHaveLength(0);

    const results = await request(kit.app).get(`/api/calibration-sets/${created.body.id}/results`).set("Authorization", L);
    expect(results.status).toBe(200);
    const order = results.body.reviewers.map((r: { id: string }) => reviewers.findIndex((x) => x.id === r.id));
    const matrix = exams.map((_, e) => order.map((ri: number) => Number(plan[ri][e]) - 1));
    const quality = results.body.criteria.find((c: { key: string }) => c.key === "quality");
    expect(quality.units).toBe(4);
    expect(quality.fleiss.value).toBeCloseTo(fleissKappa(matrix, { categories: [0, 1, 2, 3, 4] }).value!, 12);
    expect(quality.alpha.value).toBeCloseTo(krippendorffAlpha(matrix, { level: "ordinal" }).value!, 12);
    // Reference on exam 0: all seven scores; reviewer 3 gave quality 3 there instead of 4.
    const vs = Object.fromEntries(
      results.body.vsReference.map((v: { reviewer: { id: string }; matched: number; compared: number }) => [v.reviewer.id, [v.matched, v.compared]]),
    );
    expect(vs[reviewers[0].id]).toEqual([7, 7]);
    expect(vs[reviewers[2].id]).toEqual([6, 7]);
    const list = await request(kit.app).get("/api/calibration-sets").set("Authorization", L);
    expect(list.body.items[0]).toMatchObject({ name: "Autumn calibration", exams: 4, reads: 12, done: 12 });
  });

  it("gives the QA lead an exam's reference form: the criteria calibration reads use and the application's findings", async () => {
    const p = await makeProgram(kit.db);
    const other = await makeProgram(kit.db);
    const lead = await makeMember(kit.db, p.id, ["qa_lead"]);
    const sono = await makeMember(kit.db, p.id, ["sonographer"]);
    const foreignSono = await makeMember(kit.db, other.id, ["sonographer"]);
    const submitted = await makeExam(kit.db, p.id, sono.id, { application: "aorta", status: "submitted" });
    const draft = await makeExam(kit.db, p.id, sono.id, { application: "aorta" });
    const foreign = await makeExam(kit.db, other.id, foreignSono.id, { status: "submitted" });
    const L = `Bearer ${await tokenFor(kit, lead)}`;

    const res = await request(kit.app).get(`/api/calibration-sets/exams/${submitted.id}`).set("Authorization", L);
    expect(res.status).toBe(200);
    expect(res.body.exam).toEqual({ id: submitted.id, code: submitted.code, application: { code: "aorta", name: "Abdominal aorta" } });
    expect(res.body.rubric.version).toBe(1);
    // The default rubric applies all seven criteria to every application.
    expect(res.body.criteria.map((c: { key: string }) => c.key)).toEqual(["transducer", "marker", "depth", "gain", "plane", "labels", "quality"]);
    expect(res.body.criteria.find((c: { key: string }) => c.key === "quality").levels[0]).toMatchObject({ value: "1", anchor: "No recognizable structures." });
    expect(res.body.findings).toEqual([{ key: "aneurysm", label: "Aneurysm (3 cm or more)" }]);
    // A draft is not yet an exam anyone may calibrate on; another program's exam does not exist here.
    expect((await request(kit.app).get(`/api/calibration-sets/exams/${draft.id}`).set("Authorization", L)).status).toBe(404);
    expect((await request(kit.app).get(`/api/calibration-sets/exams/${foreign.id}`).set("Authorization", L)).status).toBe(404);
  });

  it("refuses a reference answer a reviewer could not give, naming the field", async () => {
    const p = await makeProgram(kit.db);
    const lead = await makeMember(kit.db, p.id, ["qa_lead"]);
    const sono = await makeMember(kit.db, p.id, ["sonographer"]);
    await makeMember(kit.db, p.id, ["reviewer"]);
    await makeMember(kit.db, p.id, ["reviewer"]);
    const efast = await makeExam(kit.db, p.id, sono.id, { status: "submitted" });
    const aorta = await makeExam(kit.db, p.id, sono.id, { application: "aorta", status: "submitted" });
    const L = `Bearer ${await tokenFor(kit, lead)}`;
    const post = (exams: object[]) => request(kit.app).post("/api/calibration-sets").set("Authorization", L).send({ name: "Checks", exams });
    const paths = (res: request.Response) => (res.body.error.details as { path: string }[]).map((d) => d.path);

    const badValues = await post([
      { examId: efast.id, reference: { scores: { colour: "blue", quality: "4" }, reads: [{ key: "aneurysm", read: "positive" }] } },
      { examId: aorta.id, reference: { scores: { quality: "6" }, reads: [] } },
    ]);
    expect(badValues.status).toBe(400);
    expect(badValues.body.error.code).toBe("validation_failed");
    expect(badValues.body.error.message).toMatch(/^exams\.0\.reference\.scores\.colour: /);
    // The aneurysm is an aorta finding, not an eFAST one.
    expect(paths(badValues)).toEqual(["exams.0.reference.scores.colour", "exams.0.reference.reads.0.key", "exams.1.reference.scores.quality"]);

    const empty = await post([{ examId: efast.id, reference: { scores: {}, reads: [] } }, { examId: aorta.id }]);
    expect(empty.status).toBe(400);
    expect(paths(empty)).toEqual(["exams.0.reference"]);

    const badRead = await post([{ examId: efast.id }, { examId: aorta.id, reference: { scores: {}, reads: [{ key: "aneurysm", read: "maybe" }] } }]);
    expect(badRead.status).toBe(400);
    expect(paths(badRead)[0]).toBe("exams.1.reference.reads.0.read");

    const twice = await post([{ examId: efast.id }, { examId: efast.id }]);
    expect(twice.status).toBe(400);
    expect(twice.body.error.message).toMatch(/^exams: Pick each exam once/);

    const unknown = await post([{ examId: efast.id }, { examId: "00000000-0000-4000-8000-000000000000" }]);
    expect(unknown.status).toBe(400);
    expect(paths(unknown)).toEqual(["exams.1.examId"]);
    expect(await kit.db("calibration_sets").where("program_id", p.id)).toHaveLength(0);
  });

  it("compares each reviewer's scores and finding reads with the reference, and reports agreement on the reads", async () => {
    const p = await makeProgram(kit.db);
    const lead = await makeMember(kit.db, p.id, ["qa_lead"]);
    const sono = await makeMember(kit.db, p.id, ["sonographer"]);
    const r1 = await makeMember(kit.db, p.id, ["reviewer"]);
    const r2 = await makeMember(kit.db, p.id, ["reviewer"]);
    const efast = await makeExam(kit.db, p.id, sono.id, { status: "submitted" });
    const aorta = await makeExam(kit.db, p.id, sono.id, { application: "aorta", status: "submitted" });
    await kit
      .db("exam_findings")
      .insert([
        ...EFAST.map((key) => ({ exam_id: efast.id, finding_key: key, read: "negative" })),
        { exam_id: aorta.id, finding_key: "aneurysm", read: "positive" },
      ]);
    const L = `Bearer ${await tokenFor(kit, lead)}`;
    const created = await request(kit.app)
      .post("/api/calibration-sets")
      .set("Authorization", L)
      .send({
        name: "Reads",
        exams: [
          {
            examId: efast.id,
            reference: {
              scores: { quality: "4", depth: "fits" },
              reads: [
                { key: "free_fluid_ruq", read: "positive" },
                { key: "pericardial_effusion", read: "negative" },
              ],
            },
          },
          { examId: aorta.id, reference: { scores: { quality: "3", transducer: "suitable" }, reads: [{ key: "aneurysm", read: "positive" }] } },
        ],
      });
    expect(created.status).toBe(201);

    // r1 reads every eFAST finding negative; r2 sees free fluid in the right upper quadrant. Both see the aneurysm.
    const plan = new Map([
      [r1.id, { efast: { quality: "4", ruq: "negative" }, aorta: "3" }],
      [r2.id, { efast: { quality: "3", ruq: "positive" }, aorta: "3" }],
    ]);
    for (const r of [r1, r2]) {
      const auth = `Bearer ${await tokenFor(kit, r)}`;
      const mine = plan.get(r.id)!;
      for (let k = 0; k < 2; k++) {
        const claim = await request(kit.app).post("/api/queue/next").set("Authorization", auth).send({});
        expect(claim.status).toBe(200);
        const isEfast = claim.body.exam.id === efast.id;
        const body = isEfast
          ? { scores: scores(mine.efast.quality), reads: EFAST.map((key) => ({ key, read: key === "free_fluid_ruq" ? mine.efast.ruq : "negative" })) }
          : { scores: scores(mine.aorta), reads: [{ key: "aneurysm", read: "positive" }] };
        const res = await request(kit.app).post(`/api/assignments/${claim.body.assignment.id}/review`).set("Authorization", auth).send(body);
        expect(res.status, JSON.stringify(res.body)).toBe(201);
      }
    }

    const results = await request(kit.app).get(`/api/calibration-sets/${created.body.id}/results`).set("Authorization", L);
    expect(results.status).toBe(200);
    expect(results.body.exams).toEqual([
      { id: efast.id, code: efast.code, application: { code: "efast", name: "Trauma (FAST / eFAST)" }, hasReference: true },
      { id: aorta.id, code: aorta.code, application: { code: "aorta", name: "Abdominal aorta" }, hasReference: true },
    ]);
    const vs = Object.fromEntries(
      results.body.vsReference.map((v: { reviewer: { id: string }; matched: number; compared: number; reads: { matched: number; compared: number } }) => [
        v.reviewer.id,
        { scores: [v.matched, v.compared], reads: [v.reads.matched, v.reads.compared] },
      ]),
    );
    // Counted by hand from the plan (both give the transducer "suitable", as scores() does): r1 misses the
    // reference's free fluid; r2 scores quality 3 where the reference says 4.
    expect(vs[r1.id]).toEqual({ scores: [4, 4], reads: [2, 3] });
    expect(vs[r2.id]).toEqual({ scores: [3, 4], reads: [3, 3] });

    const detail = results.body.referenceDetail as {
      examId: string;
      rows: { kind: string; key: string; label: string; reference: { label: string }; given: { reviewerId: string; label: string; matches: boolean }[] }[];
    }[];
    expect(detail.map((d) => d.examId)).toEqual([efast.id, aorta.id]);
    // Rows follow the rubric (transducer before quality) and then the catalogue, not the order stored.
    expect(detail[1].rows.map((r) => r.key)).toEqual(["transducer", "quality", "aneurysm"]);
    const ruq = detail[0].rows.find((r) => r.kind === "read" && r.key === "free_fluid_ruq")!;
    expect(ruq.label).toBe("Free fluid, right upper quadrant");
    expect(ruq.reference.label).toBe("Positive");
    expect(Object.fromEntries(ruq.given.map((g) => [g.reviewerId, [g.label, g.matches]]))).toEqual({
      [r1.id]: ["Negative", false],
      [r2.id]: ["Positive", true],
    });
    const quality = detail[0].rows.find((r) => r.kind === "score" && r.key === "quality")!;
    expect(quality.label).toBe("Overall image quality");
    expect(Object.fromEntries(quality.given.map((g) => [g.reviewerId, g.matches]))).toEqual({ [r1.id]: true, [r2.id]: false });

    // Agreement on the reads: 9 units (8 eFAST findings, the aneurysm); one splits, 7 are both
    // negative, 1 both positive. By hand with Fleiss (1971), eq. for P-bar and P-bar-e:
    // P = 8/9, Pe = (15² + 3²)/18² = 13/18, kappa = (8/9 − 13/18)/(1 − 13/18) = 3/5.
    // Krippendorff's nominal alpha from the coincidence matrix (Krippendorff 2011, "Computing
    // Krippendorff's Alpha-Reliability", section C): 1 − (n − 1)·Σo(c≠k)/Σ n_c n_k(c≠k) = 1 − 17·2/(2·15·3) = 28/45.
    const read = results.body.criteria.find((c: { key: string }) => c.key === "read");
    expect(read.units).toBe(9);
    expect(read.fleiss.value).toBeCloseTo(3 / 5, 12);
    expect(read.alpha.value).toBeCloseTo(28 / 45, 12);
  });
});
