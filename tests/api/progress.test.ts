// Learner progress on seeded data: every figure the API answers with must equal a
// recomputation straight from the raw rows (exams, exam_results, finding_outcomes,
// confirmations), done here without the progress service. Also: who may see whose progress,
// confirmatory results, the roster, and the learning-curve settings.
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { EFAST_FINDING_KEYS, makeExam, makeKit, makeMember, makeProgram, type TestKit, type TestMember, tokenFor } from "./helpers";
import { queueSubmittedExam } from "../../server/services/queue";
import { mulberry32, wilsonInterval, cusum } from "../../shared/stats/index";
import type { Progress, RosterRow } from "../../shared/schemas/progress";

let kit: TestKit;
let programId: string;
let lead: TestMember;
let learner: TestMember;
let other: TestMember;
let reviewer: TestMember;
const EFAST = EFAST_FINDING_KEYS;
const DAY = 86_400_000;
const START = Date.parse("2026-06-01T09:00:00Z");

const bearer = async (m: TestMember) => `Bearer ${await tokenFor(kit, m)}`;

beforeAll(async () => {
  kit = makeKit();
  programId = (await makeProgram(kit.db)).id;
  lead = await makeMember(kit.db, programId, ["qa_lead"]);
  learner = await makeMember(kit.db, programId, ["sonographer"]);
  other = await makeMember(kit.db, programId, ["sonographer"]);
  reviewer = await makeMember(kit.db, programId, ["reviewer"]);
  // Single reads only, so every exam is settled by one review.
  await request(kit.app)
    .patch("/api/settings")
    .set("Authorization", await bearer(lead))
    .send({ doubleReadShare: 0, showReviewerName: false })
    .expect(200);

  const rand = mulberry32(11);
  const plan: { app: "efast" | "aorta"; day: number }[] = [];
  for (let i = 0; i < 22; i++) plan.push({ app: "efast", day: i * 2 });
  for (let i = 0; i < 8; i++) plan.push({ app: "aorta", day: i * 3 + 1 });
  for (const [i, p] of plan.entries()) {
    const exam = await makeExam(kit.db, programId, learner.id, { status: "submitted", application: p.app });
    const findings = p.app === "efast" ? EFAST : ["aneurysm"];
    await kit
      .db("exams")
      .where("id", exam.id)
      .update({ performed_at: new Date(START + p.day * DAY + i * 1000), setting: "educational" });
    await kit.db("exam_findings").insert(findings.map((key) => ({ exam_id: exam.id, finding_key: key, read: rand() < 0.8 ? "negative" : "positive" })));
    // Three exams stay submitted and unreviewed (never queued, so each claim below gets the
    // exam just made).
    if (i % 10 === 9) continue;
    await kit.db.transaction((trx) => queueSubmittedExam(trx, { id: exam.id, program_id: programId, setting: "educational" }, 0));
    const token = await bearer(reviewer);
    const claim = await request(kit.app).post("/api/queue/next").set("Authorization", token).send({});
    expect(claim.status).toBe(200);
    // Quality improves with practice, with noise; occasionally a flipped image (critical).
    const quality = String(Math.min(5, Math.max(1, 2 + Math.floor((i / plan.length) * 3 + rand() * 1.8))));
    const marker = rand() < 0.1 ? "does_not" : "follows";
    const plane = rand() < 0.3 ? "partly" : "standard";
    const reads = findings.map((key) => ({ key, read: rand() < 0.85 ? "negative" : "positive" }));
    const res = await request(kit.app)
      .post(`/api/assignments/${claim.body.assignment.id}/review`)
      .set("Authorization", token)
      .send({
        scores: { transducer: "suitable", marker, depth: rand() < 0.7 ? "fits" : "too_deep", gain: "balanced", plane, labels: "complete", quality },
        reads,
        feedback: "Tighten the depth.",
      });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
  }
}, 180_000);
afterAll(() => kit.close());

/** The learner's exams with their final results, straight from the tables, oldest first. */
async function rawExams(app: string) {
  return kit
    .db("exams as e")
    .join("applications as a", "a.id", "e.application_id")
    .leftJoin("exam_results as r", "r.exam_id", "e.id")
    .where({ "e.sonographer_id": learner.id, "a.code": app })
    .whereNot("e.status", "draft")
    .orderBy("e.performed_at")
    .select("e.id", "e.status", "r.credit", "r.scores");
}

describe("GET /api/me/progress", () => {
  let progress: Progress;
  beforeAll(async () => {
    const res = await request(kit.app)
      .get("/api/me/progress?window=5")
      .set("Authorization", await bearer(learner));
    expect(res.status).toBe(200);
    progress = res.body;
  });

  it("counts submitted, reviewed and credited exams per application as the raw rows do", async () => {
    for (const code of ["efast", "aorta"]) {
      const raw = await rawExams(code);
      const reviewed = raw.filter((r) => r.status === "reviewed");
      const a = progress.applications.find((x) => x.application.code === code)!;
      expect(a.submitted).toBe(raw.length);
      expect(a.reviewed).toBe(reviewed.length);
      expect(a.credited).toBe(reviewed.filter((r) => r.credit).length);
      expect(a.threshold).toBe(25); // programSettingsSchema default
      expect(a.remaining).toBe(Math.max(0, 25 - a.credited));
      const quality: Record<string, number> = {};
      for (const r of reviewed) quality[r.scores.quality] = (quality[r.scores.quality] ?? 0) + 1;
      expect(a.qualityDistribution).toEqual(quality);
      // Credit rate with its Wilson interval (Wilson 1927; the module is checked against
      // Newcombe 1998, Table I, in shared/stats/wilson.test.ts).
      expect(a.creditRate.ci95).toEqual(wilsonInterval(a.credited, a.reviewed));
    }
    expect(progress.total.submitted).toBe(30);
    expect(progress.total.reviewed).toBe(27);
    expect(progress.applications.filter((a) => a.submitted === 0)).toHaveLength(progress.applications.length - 2);
  });

  it("draws the learning curve over reviewed exams in the order performed, failure = no credit", async () => {
    const raw = (await rawExams("efast")).filter((r) => r.status === "reviewed");
    const a = progress.applications.find((x) => x.application.code === "efast")!;
    const outcomes = raw.map((r) => !r.credit);
    expect(a.cusum.points.map((p) => p.failed)).toEqual(outcomes);
    expect(a.cusum.points.map((p) => p.examId)).toEqual(raw.map((r) => r.id));
    // Step by step: each success takes s off, each failure adds 1 − s (Wald's SPRT in the
    // learning-curve form; s for p0 = .1, p1 = .2 is .145244, worked in cusum.test.ts).
    let value = 0;
    for (const [i, p] of a.cusum.points.entries()) {
      value += outcomes[i] ? 1 - 0.145244 : -0.145244;
      expect(p.value).toBeCloseTo(value, 4);
    }
    const expected = cusum(outcomes, { p0: 0.1, p1: 0.2, alpha: 0.1, beta: 0.1 });
    expect(a.cusum.signal).toBe(expected.signal);
    expect(a.cusum.signalAtAttempt).toBe(expected.signalAt === null ? null : expected.signalAt + 1);
    expect([a.cusum.p0, a.cusum.p1, a.cusum.alpha, a.cusum.beta]).toEqual([0.1, 0.2, 0.1, 0.1]);
  });

  it("matches the reviewer comparison in finding_outcomes, with Wilson intervals", async () => {
    const rows = await kit
      .db("finding_outcomes as o")
      .join("exams as e", "e.id", "o.exam_id")
      .join("applications as a", "a.id", "e.application_id")
      .where({ "e.sonographer_id": learner.id, "a.code": "efast" })
      .select("o.outcome");
    const n = (o: string) => rows.filter((r) => r.outcome === o).length;
    const acc = progress.applications.find((x) => x.application.code === "efast")!.accuracyVsReviewer;
    expect([acc.tp, acc.fp, acc.tn, acc.fn, acc.indeterminate]).toEqual([n("TP"), n("FP"), n("TN"), n("FN"), n("indeterminate")]);
    expect(acc.sensitivity.n).toBe(n("TP") + n("FN"));
    expect(acc.specificity.value).toBeCloseTo(n("TN") / (n("TN") + n("FP")), 12);
    expect(acc.ppv.ci95).toEqual(wilsonInterval(n("TP"), n("TP") + n("FP")));
    expect(acc.npv.ci95).toEqual(wilsonInterval(n("TN"), n("TN") + n("FN")));
  });

  it("gives the rolling mean of each criterion's attainment over the window", async () => {
    // Attainment of the default quality levels: the ideal levels 4 and 5 score 1; 3, 2 and 1
    // are one, two and three steps away (the furthest): 2/3, 1/3, 0.
    const attainment: Record<string, number> = { "1": 0, "2": 1 / 3, "3": 2 / 3, "4": 1, "5": 1 };
    const raw = (await rawExams("efast")).filter((r) => r.status === "reviewed");
    const values = raw.map((r) => attainment[r.scores.quality]);
    const series = progress.applications.find((x) => x.application.code === "efast")!.trends.find((t) => t.criterionKey === "quality")!;
    expect(series.points.map((p) => p.value)).toEqual(values.map((v) => expect.closeTo(v, 12)));
    values.forEach((_, i) => {
      const win = values.slice(Math.max(0, i - 4), i + 1);
      expect(series.points[i].rolling).toBeCloseTo(win.reduce((a, b) => a + b, 0) / win.length, 12);
    });
  });

  it("names the weakest recent criteria as focus areas with their advice, and strengths apart", () => {
    expect(progress.focusAreas.length).toBeGreaterThan(0);
    for (const f of progress.focusAreas) {
      expect(f.mean).toBeLessThan(0.9);
      expect(f.advice.length).toBeGreaterThan(0);
    }
    const means = progress.focusAreas.map((f) => f.mean);
    expect(means).toEqual([...means].sort((a, b) => a - b));
    for (const s of progress.strengths) expect(progress.focusAreas.map((f) => f.criterionKey)).not.toContain(s.criterionKey);
    // Gain was ideal on every exam, so the strongest criterion scores 1.
    expect(progress.strengths[0].mean).toBe(1);
    for (const s of progress.strengths) expect(s.mean).toBeGreaterThanOrEqual(0.75);
  });

  it("filters by the day performed", async () => {
    const res = await request(kit.app)
      .get("/api/me/progress?from=2026-06-01&to=2026-06-10")
      .set("Authorization", await bearer(learner));
    // efast on days 0, 2, 4, 6, 8, 10 (the last at 09:00 on June 11: outside) and aorta on days 1, 4, 7.
    expect(res.body.applications.find((a: { application: { code: string } }) => a.application.code === "efast").submitted).toBe(5);
    expect(res.body.applications.find((a: { application: { code: string } }) => a.application.code === "aorta").submitted).toBe(3);
    const bad = await request(kit.app)
      .get("/api/me/progress?from=June")
      .set("Authorization", await bearer(learner));
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/^from:/);
  });
});

describe("who sees whose progress", () => {
  it("a sonographer sees only their own", async () => {
    const mine = await request(kit.app)
      .get("/api/me/progress")
      .set("Authorization", await bearer(other));
    expect(mine.body.sonographer.id).toBe(other.id);
    expect(mine.body.total.submitted).toBe(0);
    for (const path of [`/api/roster/${learner.id}/progress`, `/api/roster/${learner.id}/feedback`, "/api/roster"]) {
      const res = await request(kit.app)
        .get(path)
        .set("Authorization", await bearer(other));
      expect(res.status, path).toBe(403);
    }
    const exam = await kit.db("exams").where("sonographer_id", learner.id).first("id");
    const conf = await request(kit.app)
      .get(`/api/exams/${exam.id}/confirmations`)
      .set("Authorization", await bearer(other));
    expect(conf.status).toBe(404);
  });

  it("a QA lead sees any sonographer of the program, with reviewer names, and no one elsewhere", async () => {
    const res = await request(kit.app)
      .get(`/api/roster/${learner.id}/progress?window=5`)
      .set("Authorization", await bearer(lead));
    expect(res.status).toBe(200);
    const own = await request(kit.app)
      .get("/api/me/progress?window=5")
      .set("Authorization", await bearer(learner));
    expect(res.body).toEqual(own.body);
    const feedback = await request(kit.app)
      .get(`/api/roster/${learner.id}/feedback`)
      .set("Authorization", await bearer(lead));
    expect(feedback.body.items).toHaveLength(27);
    // The program hides reviewer names from learners; the QA lead still sees them.
    expect(feedback.body.items[0].comments[0]).toMatchObject({ reviewer: reviewer.name, text: "Tighten the depth." });
    const learnerView = await request(kit.app)
      .get("/api/me/feedback")
      .set("Authorization", await bearer(learner));
    expect(learnerView.body.items[0].comments[0].reviewer).toBeNull();
    // The list is built in one batch; each item must equal the exam's own feedback page.
    for (const item of learnerView.body.items.slice(0, 5)) {
      const one = await request(kit.app)
        .get(`/api/me/feedback/${item.examId}`)
        .set("Authorization", await bearer(learner));
      const { unread: _unread, ...listed } = item;
      expect(one.body).toEqual(listed);
      expect(one.body.findings.length).toBeGreaterThan(0);
    }
    const elsewhere = await makeProgram(kit.db);
    const foreignLead = await makeMember(kit.db, elsewhere.id, ["qa_lead"]);
    const denied = await request(kit.app)
      .get(`/api/roster/${learner.id}/progress`)
      .set("Authorization", await bearer(foreignLead));
    expect(denied.status).toBe(404);
  });
});

describe("confirmatory results", () => {
  it("are validated, stored, and counted apart from the reviewer comparison", async () => {
    const exam = await kit
      .db("exams as e")
      .join("applications as a", "a.id", "e.application_id")
      .where({ "e.sonographer_id": learner.id, "a.code": "aorta", "e.status": "reviewed" })
      .first("e.id");
    const [read] = await kit.db("exam_findings").where({ exam_id: exam.id, finding_key: "aneurysm" }).pluck("read");
    const url = `/api/exams/${exam.id}/confirmations`;
    const token = await bearer(learner);
    const missing = await request(kit.app)
      .put(url)
      .set("Authorization", token)
      .send({ items: [{ findingKey: "aneurysm", method: "ct" }] });
    expect(missing.status).toBe(400);
    expect(missing.body.error.message).toMatch(/^items\.0\.result:/);
    const unknown = await request(kit.app)
      .put(url)
      .set("Authorization", token)
      .send({ items: [{ findingKey: "spleen", method: "none" }] });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.message).toMatch(/^items\.0\.findingKey:/);
    expect(await kit.db("confirmations").where("exam_id", exam.id)).toHaveLength(0);

    const ok = await request(kit.app)
      .put(url)
      .set("Authorization", token)
      .send({ items: [{ findingKey: "aneurysm", method: "ct", result: "positive", note: "CT angiogram" }] });
    expect(ok.status).toBe(200);
    expect(ok.body.items[0]).toMatchObject({ findingKey: "aneurysm", method: "ct", result: "positive", sonographerRead: read });

    const p = await request(kit.app).get("/api/me/progress").set("Authorization", token);
    const acc = p.body.applications.find((a: { application: { code: string } }) => a.application.code === "aorta").accuracyVsConfirmatory;
    expect(acc.byMethod).toEqual({ ct: 1 });
    expect(acc.tp + acc.fn + acc.indeterminate).toBe(1);
    expect(read === "positive" ? acc.tp : acc.fn).toBe(1);

    // The QA lead may correct it; "none" records that no test was done and counts nowhere.
    const byLead = await request(kit.app)
      .put(url)
      .set("Authorization", await bearer(lead))
      .send({ items: [{ findingKey: "aneurysm", method: "none", result: null }] });
    expect(byLead.status).toBe(200);
    const after = await request(kit.app).get("/api/me/progress").set("Authorization", token);
    const acc2 = after.body.applications.find((a: { application: { code: string } }) => a.application.code === "aorta").accuracyVsConfirmatory;
    expect(acc2.byMethod).toEqual({ none: 1 });
    expect(acc2.tp + acc2.fp + acc2.tn + acc2.fn).toBe(0);

    // method null clears the entry.
    const cleared = await request(kit.app)
      .put(url)
      .set("Authorization", token)
      .send({ items: [{ findingKey: "aneurysm", method: null, result: null }] });
    expect(cleared.status).toBe(200);
    expect(cleared.body.items[0]).toMatchObject({ method: null, result: null, enteredBy: null });
    expect(await kit.db("confirmations").where("exam_id", exam.id)).toHaveLength(0);
  });
});

describe("roster and settings", () => {
  it("lists every sonographer with per-application progress and an open follow-up flag", async () => {
    const exam = await kit.db("exams").where("sonographer_id", learner.id).whereNot("status", "draft").first("id");
    await kit.db("follow_ups").insert({ program_id: programId, exam_id: exam.id, reason: "Discuss the missed finding" });
    const res = await request(kit.app)
      .get("/api/roster")
      .set("Authorization", await bearer(lead));
    expect(res.status).toBe(200);
    const rows: RosterRow[] = res.body.items;
    expect(rows.map((r) => r.id).sort()).toEqual([learner.id, other.id].sort());
    const l = rows.find((r) => r.id === learner.id)!;
    expect(l.flags).toContain("follow_up_open");
    expect(l.total).toEqual({
      submitted: 30,
      reviewed: 27,
      credited: (await kit.db("exam_results as r").join("exams as e", "e.id", "r.exam_id").where({ "e.sonographer_id": learner.id, "r.credit": true })).length,
    });
    expect(rows.find((r) => r.id === other.id)!.flags).not.toContain("follow_up_open");
  });

  it("refuses an unacceptable failure rate that is not above the acceptable one, naming the field", async () => {
    const res = await request(kit.app)
      .patch("/api/settings")
      .set("Authorization", await bearer(lead))
      .send({ cusumAcceptableRate: 0.2, cusumUnacceptableRate: 0.15 });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/^cusumUnacceptableRate:/);
    const s = await request(kit.app)
      .get("/api/settings")
      .set("Authorization", await bearer(lead));
    expect(s.body.settings.cusumAcceptableRate).toBe(0.1);
  });
});

describe("GET /api/reports/credentialing", () => {
  const pdfText = (pdf: Buffer) => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "soundings-report-"));
    const file = path.join(dir, "report.pdf");
    fs.writeFileSync(file, pdf);
    // pdftotext from Debian's poppler-utils (installed by scripts/ensure-deps.sh --test).
    const text = execFileSync("pdftotext", ["-layout", file, "-"], { encoding: "utf8" });
    fs.rmSync(dir, { recursive: true, force: true });
    return text;
  };
  const binary = (res: request.Response, cb: (err: Error | null, body: Buffer) => void) => {
    const chunks: Buffer[] = [];
    res.on("data", (c: Buffer) => chunks.push(c));
    res.on("end", () => cb(null, Buffer.concat(chunks)));
  };

  it("gives a sonographer their own PDF, whose text holds the counts recomputed from the raw rows", async () => {
    const res = await request(kit.app)
      .get("/api/reports/credentialing?format=pdf")
      .set("Authorization", await bearer(learner))
      .buffer(true)
      .parse(binary);
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toBe("application/pdf");
    expect(res.headers["content-disposition"]).toMatch(/^attachment; filename="?credentialing-[a-z0-9-]+\.pdf"?$/);
    const text = pdfText(res.body as Buffer);
    expect(text).toContain(learner.name);
    for (const code of ["efast", "aorta"]) {
      const raw = await rawExams(code);
      const reviewed = raw.filter((r) => r.status === "reviewed");
      const credited = reviewed.filter((r) => r.credit).length;
      const { name } = await kit.db("applications").where({ program_id: programId, code }).first("name");
      expect(text).toMatch(new RegExp(`${name.replace(/[()/]/g, "\\$&")}\\s+${raw.length}\\s+${reviewed.length}\\s+${credited} / 25`));
    }
    expect(text.replace(/\s+/g, " ")).toContain("Local policy and licensed practice govern");
    expect(text).toMatch(/Program director/i);
  });

  it("lets a QA lead export the whole program as CSV, and one sonographer as PDF", async () => {
    const token = await bearer(lead);
    const csv = await request(kit.app).get("/api/reports/credentialing?format=csv").set("Authorization", token);
    expect(csv.status).toBe(200);
    expect(csv.headers["content-type"]).toMatch(/^text\/csv/);
    expect(csv.text).toContain(learner.email);
    expect(csv.text).toContain(other.email);
    const pdf = await request(kit.app)
      .get(`/api/reports/credentialing?format=pdf&userId=${learner.id}&from=2026-06-01&to=2026-06-10`)
      .set("Authorization", token)
      .buffer(true)
      .parse(binary);
    expect(pdf.status).toBe(200);
    const text = pdfText(pdf.body as Buffer);
    expect(text).toContain("2026-06-01");
    expect(text).not.toContain(other.name);
  });

  it("refuses another person's report to a sonographer, and bad input by field", async () => {
    const forbidden = await request(kit.app)
      .get(`/api/reports/credentialing?format=pdf&userId=${learner.id}`)
      .set("Authorization", await bearer(other));
    expect(forbidden.status).toBe(403);
    const token = await bearer(lead);
    const format = await request(kit.app).get("/api/reports/credentialing?format=docx").set("Authorization", token);
    expect(format.status).toBe(400);
    expect(format.body.error.message).toMatch(/^format:/);
    const order = await request(kit.app).get("/api/reports/credentialing?format=csv&from=2026-07-01&to=2026-06-01").set("Authorization", token);
    expect(order.status).toBe(400);
    expect(order.body.error.message).toMatch(/^to:/);
    const stranger = await request(kit.app).get(`/api/reports/credentialing?format=csv&userId=${reviewer.id}`).set("Authorization", token);
    expect(stranger.status).toBe(404);
  });
});
