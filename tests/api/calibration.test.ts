// Calibration sets: blinded calibration reads for chosen reviewers, never deciding the exam,
// and results equal to the statistics module on the reads (Fleiss' kappa, Krippendorff's alpha).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { makeExam, makeKit, makeMember, makeProgram, tokenFor, type TestKit } from "./helpers";
import { fleissKappa, krippendorffAlpha } from "../../shared/stats/index";

let kit: TestKit;
beforeAll(() => {
  kit = makeKit();
});
afterAll(() => kit.close());

const EFAST = ["free_fluid_ruq", "free_fluid_luq", "free_fluid_pelvis", "pericardial_effusion", "pneumothorax_right", "pneumothorax_left"];
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
});
