// Reports on seeded data: the agreement API must equal the statistics module (itself
// checked against published examples and statsmodels/sklearn) applied to the raw rows.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { EFAST_FINDING_KEYS, makeExam, makeKit, makeMember, makeProgram, type TestKit, type TestMember, tokenFor } from "./helpers";
import { queueSubmittedExam } from "../../server/services/queue";
import { cohensKappa, gwetAC1, krippendorffAlpha, mulberry32, percentAgreement } from "../../shared/stats/index";
import { DEFAULT_CRITERIA } from "../../shared/rubric/default-rubric";

let kit: TestKit;
let lead: TestMember;
let programId: string;
const EFAST = EFAST_FINDING_KEYS;
const EXAMS = 30;

beforeAll(async () => {
  kit = makeKit();
  programId = (await makeProgram(kit.db)).id;
  lead = await makeMember(kit.db, programId, ["qa_lead"]);
  const sonographer = await makeMember(kit.db, programId, ["sonographer"]);
  const reviewers = [
    await makeMember(kit.db, programId, ["reviewer"]),
    await makeMember(kit.db, programId, ["reviewer"]),
    await makeMember(kit.db, programId, ["reviewer"]),
  ];
  const rand = mulberry32(7);
  for (let i = 0; i < EXAMS; i++) {
    const exam = await makeExam(kit.db, programId, sonographer.id, { status: "submitted" });
    await kit.db("exam_findings").insert(EFAST.map((key) => ({ exam_id: exam.id, finding_key: key, read: "negative" })));
    await kit.db.transaction((trx) => queueSubmittedExam(trx, { id: exam.id, program_id: programId, setting: "educational" }, 1));
    // Two different reviewers read it; values drawn so that reviewers often, not always, agree.
    const pair = [reviewers[i % 3], reviewers[(i + 1) % 3]];
    const base = 1 + Math.floor(rand() * 5);
    for (const r of pair) {
      const token = `Bearer ${await tokenFor(kit, r)}`;
      const claim = await request(kit.app).post("/api/queue/next").set("Authorization", token).send({});
      expect(claim.status).toBe(200);
      const quality = String(Math.min(5, Math.max(1, base + (rand() < 0.4 ? (rand() < 0.5 ? -1 : 1) : 0))));
      const depth = rand() < 0.8 ? "fits" : rand() < 0.5 ? "too_deep" : "too_shallow";
      const reads = EFAST.map((key) => ({ key, read: rand() < 0.9 ? "negative" : "positive" }));
      const res = await request(kit.app)
        .post(`/api/assignments/${claim.body.assignment.id}/review`)
        .set("Authorization", token)
        .send({
          scores: { transducer: "suitable", marker: "follows", depth, gain: "balanced", plane: "standard", labels: "complete", quality },
          reads,
          feedback: "",
        });
      expect(res.status).toBe(201);
    }
  }
}, 120_000);
afterAll(() => kit.close());

/** The raw first/second read pairs straight from the tables, independent of the report's SQL. */
async function rawPairs() {
  const rows = await kit
    .db("reviews as r")
    .join("assignments as a", "a.id", "r.assignment_id")
    .where("r.program_id", programId)
    .whereIn("a.kind", ["primary", "second"])
    .select("r.exam_id", "a.kind", "r.scores", "r.reads", "r.reviewer_id");
  const byExam = new Map<string, { primary?: (typeof rows)[number]; second?: (typeof rows)[number] }>();
  for (const r of rows) byExam.set(r.exam_id, { ...byExam.get(r.exam_id), [r.kind]: r });
  return [...byExam.values()].filter((x) => x.primary && x.second) as { primary: (typeof rows)[number]; second: (typeof rows)[number] }[];
}

describe("GET /api/reports/agreement", () => {
  it("equals the statistics module on the raw rows for an ordinal and a nominal criterion and the reads", async () => {
    const res = await request(kit.app)
      .get("/api/reports/agreement?criterion=quality")
      .set("Authorization", `Bearer ${await tokenFor(kit, lead)}`);
    expect(res.status).toBe(200);
    const pairs = await rawPairs();
    expect(pairs).toHaveLength(EXAMS);

    const quality = DEFAULT_CRITERIA.find((c) => c.key === "quality")!;
    const rank = (v: string) => quality.levels.findIndex((l) => l.value === v);
    const q = pairs.map((p) => [rank(p.primary.scores.quality), rank(p.second.scores.quality)]);
    const row = res.body.criteria.find((c: { key: string }) => c.key === "quality");
    expect(row.units).toBe(EXAMS);
    expect(row.kappa.weights).toBe("quadratic");
    expect(row.kappa.value).toBeCloseTo(cohensKappa(q, { weights: "quadratic", categories: [0, 1, 2, 3, 4] }).value!, 12);
    // Alpha's bootstrap interval: the report draws a bounded, seeded number of resamples;
    // the module on the raw rows with the same resamples and seed gives the same interval.
    expect(row.alpha.bootstrap).toMatchObject({ samples: 1000, used: 1000 });
    const alphaRaw = krippendorffAlpha(q, { level: "ordinal", bootstrap: { samples: row.alpha.bootstrap.samples, seed: row.alpha.bootstrap.seed } });
    expect(row.alpha.value).toBeCloseTo(alphaRaw.value!, 12);
    expect(row.alpha.ci95[0]).toBeCloseTo(alphaRaw.ci95![0], 12);
    expect(row.alpha.ci95[1]).toBeCloseTo(alphaRaw.ci95![1], 12);
    expect(row.alpha.ci95[0]).toBeLessThan(row.alpha.value);
    expect(row.alpha.ci95[1]).toBeGreaterThan(row.alpha.value);
    expect(row.ac1.value).toBeCloseTo(gwetAC1(q, { categories: [0, 1, 2, 3, 4] }).value!, 12);
    expect(row.percentAgreement).toBeCloseTo(percentAgreement(q).value!, 12);

    const d = pairs.map((p) => [p.primary.scores.depth, p.second.scores.depth]);
    const depth = res.body.criteria.find((c: { key: string }) => c.key === "depth");
    expect(depth.kappa.weights).toBe("unweighted");
    expect(depth.kappa.value).toBeCloseTo(cohensKappa(d, { categories: ["too_shallow", "fits", "too_deep"] }).value!, 12);
    const depthAlpha = krippendorffAlpha(d, { level: "nominal", bootstrap: { samples: depth.alpha.bootstrap.samples, seed: depth.alpha.bootstrap.seed } });
    expect(depth.alpha.value).toBeCloseTo(depthAlpha.value!, 12);
    expect(depth.alpha.ci95[0]).toBeCloseTo(depthAlpha.ci95![0], 12);
    expect(depth.alpha.ci95[1]).toBeCloseTo(depthAlpha.ci95![1], 12);

    const reads = pairs.flatMap((p) =>
      p.primary.reads.map((r: { key: string; read: string }) => [r.read, p.second.reads.find((s: { key: string }) => s.key === r.key).read]),
    );
    const interpretation = res.body.criteria.find((c: { key: string }) => c.key === "read");
    expect(interpretation.units).toBe(EXAMS * EFAST.length);
    expect(interpretation.kappa.value).toBeCloseTo(cohensKappa(reads, { categories: ["positive", "negative", "indeterminate"] }).value!, 12);

    const readsAlpha = krippendorffAlpha(reads, {
      level: "nominal",
      bootstrap: { samples: interpretation.alpha.bootstrap.samples, seed: interpretation.alpha.bootstrap.seed },
    });
    expect(interpretation.alpha.value).toBeCloseTo(readsAlpha.value!, 12);
    expect(interpretation.alpha.ci95[0]).toBeCloseTo(readsAlpha.ci95![0], 12);
    expect(interpretation.alpha.ci95[1]).toBeCloseTo(readsAlpha.ci95![1], 12);

    // Each reviewer pair's figures equal the module on that pair's raw rows, oriented as the
    // report orients the pair (reviewer a's value first).
    for (const pair of res.body.pairs as { a: { id: string }; b: { id: string }; units: number; percentAgreement: number; kappa: number }[]) {
      const mine = pairs
        .filter((p) => [p.primary.reviewer_id, p.second.reviewer_id].sort().join() === [pair.a.id, pair.b.id].sort().join())
        .map((p) => (p.primary.reviewer_id === pair.a.id ? [p.primary, p.second] : [p.second, p.primary]))
        .map(([x, y]) => [rank(x.scores.quality), rank(y.scores.quality)]);
      expect(pair.units).toBe(mine.length);
      expect(pair.percentAgreement).toBeCloseTo(percentAgreement(mine).value!, 12);
      expect(pair.kappa).toBeCloseTo(cohensKappa(mine, { weights: "quadratic", categories: [0, 1, 2, 3, 4] }).value!, 12);
    }

    // Every pair of first and second read lands in exactly one reviewer pair and one confusion cell.
    expect(res.body.pairs.reduce((s: number, p: { units: number }) => s + p.units, 0)).toBe(EXAMS);
    const cells: number[][] = res.body.confusion.counts;
    expect(cells.flat().reduce((s, x) => s + x, 0)).toBe(EXAMS);
    expect(cells.reduce((s, r, i) => s + r[i], 0)).toBe(q.filter(([a, b]) => a === b).length);
    expect(res.body.disagreements).toHaveLength(q.filter(([a, b]) => a !== b).length);
    // Bias against consensus balances out over all reviewers (each pair's differences cancel).
    const total = res.body.bias.reduce((s: number, b: { n: number; meanDifference: number }) => s + b.n * b.meanDifference, 0);
    expect(total).toBeCloseTo(0, 10);
  });

  it("filters by application and date range", async () => {
    const auth = `Bearer ${await tokenFor(kit, lead)}`;
    const none = await request(kit.app).get("/api/reports/agreement?application=cardiac").set("Authorization", auth);
    expect(none.body.criteria.find((c: { key: string }) => c.key === "quality")).toMatchObject({ units: 0, kappa: { value: null } });
    const past = await request(kit.app).get("/api/reports/agreement?from=2020-01-01&to=2020-12-31").set("Authorization", auth);
    expect(past.body.criteria.every((c: { units: number }) => c.units === 0)).toBe(true);
    const bad = await request(kit.app).get("/api/reports/agreement?from=yesterday").set("Authorization", auth);
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/^from:/);
  });
});

describe("GET /api/reports/program", () => {
  it("counts the backlog, weekly results and reviewer workload from the rows", async () => {
    const res = await request(kit.app)
      .get("/api/reports/program")
      .set("Authorization", `Bearer ${await tokenFor(kit, lead)}`);
    expect(res.status).toBe(200);
    const waiting = await kit
      .db("exams")
      .where("program_id", programId)
      .whereIn("status", ["submitted", "in_review", "adjudication"])
      .count<{ c: string }[]>("* as c");
    expect(res.body.backlog.reduce((s: number, b: { count: number }) => s + b.count, 0)).toBe(Number(waiting[0].c));
    const results = await kit.db("exam_results").where("program_id", programId).count<{ c: string }[]>("* as c");
    expect(res.body.weekly.reduce((s: number, w: { reviewed: number }) => s + w.reviewed, 0)).toBe(Number(results[0].c));
    expect(res.body.reviewers.reduce((s: number, r: { reviews: number }) => s + r.reviews, 0)).toBe(EXAMS * 2);
    expect(res.body.volume.reduce((s: number, v: { count: number }) => s + v.count, 0)).toBe(EXAMS);
  });
});
