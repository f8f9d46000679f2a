// The credit rule per application, on each edge a privileging committee asks about: a misread
// on an educational exam, the cap on simulated and educational exams, the minimum of exams
// with a positive finding, a study missing a required view, and a study marked technically
// limited by patient factors; the indeterminate-read rate beside accuracy; the CSV stating the
// rule applied. The rule is the project's own (README "Application catalogue" and "Progress
// and credentialing"); the labels come from the built-in catalogue (shared/catalogue.ts).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { parse } from "csv-parse/sync";
import { callAs, EFAST_FINDING_KEYS, makeClip, makeExam, makeKit, makeMember, makeProgram, type TestKit, type TestMember } from "./helpers";
import { queueSubmittedExam } from "../../server/services/queue";
import { LIMITED_REASON } from "../../shared/rubric/logic";

let kit: TestKit;
beforeAll(() => {
  kit = makeKit();
});
afterAll(() => kit.close());

type Read = "positive" | "negative" | "indeterminate";
type Setting = "clinical" | "educational" | "simulated";

interface Setup {
  programId: string;
  lead: TestMember;
  reviewer: TestMember;
  clinician: TestMember;
}

async function setup(): Promise<Setup> {
  const p = await makeProgram(kit.db);
  return {
    programId: p.id,
    lead: await makeMember(kit.db, p.id, ["qa_lead"]),
    reviewer: await makeMember(kit.db, p.id, ["reviewer"]),
    clinician: await makeMember(kit.db, p.id, ["sonographer"]),
  };
}

const call = (m: TestMember, method: "get" | "post" | "put", path: string, body?: object) => callAs(kit, m, method, path, body);

/** Sets the eFAST application's credit rule (a new version of it). */
async function setRule(s: Setup, rule: { threshold?: number | null; nonClinicalCap?: number | null; minPositive?: number; requireComplete?: boolean }) {
  const list = await call(s.lead, "get", "/api/applications");
  const {
    id,
    code: _c,
    version: _v,
    status: _s,
    publishedAt: _p,
    creditRule,
    ...body
  } = list.body.applications.find((a: { code: string }) => a.code === "efast");
  const res = await call(s.lead, "put", `/api/applications/${id}`, { ...body, creditRule: { ...creditRule, ...rule } });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
}

const negative = (): Record<string, Read> => Object.fromEntries(EFAST_FINDING_KEYS.map((k) => [k, "negative"]));

/**
 * An eFAST exam the clinician read as `mine`, reviewed in one read as `theirs`, with overall
 * quality `quality`, ready clips of `views`, and the reviewer's limited mark. Returns the
 * exam and the review's answer.
 */
async function reviewedExam(
  s: Setup,
  o: { setting?: Setting; mine?: Record<string, Read>; theirs?: Record<string, Read>; quality?: string; limited?: boolean; views?: string[] } = {},
) {
  const exam = await makeExam(kit.db, s.programId, s.clinician.id, { status: "submitted" });
  const setting = o.setting ?? "clinical";
  await kit.db("exams").where("id", exam.id).update({ setting });
  const mine = { ...negative(), ...o.mine };
  await kit.db("exam_findings").insert(Object.entries(mine).map(([key, read]) => ({ exam_id: exam.id, finding_key: key, read })));
  for (const view of o.views ?? []) {
    const clip = await makeClip(kit, exam, "ready");
    await kit.db("clips").where("id", clip.id).update({ view_key: view });
  }
  await kit.db.transaction((trx) => queueSubmittedExam(trx, { id: exam.id, program_id: s.programId, setting }, 0));
  const claim = await call(s.reviewer, "post", "/api/queue/next", {});
  expect(claim.status, JSON.stringify(claim.body)).toBe(200);
  expect(claim.body.exam.id).toBe(exam.id);
  const theirs = { ...negative(), ...o.theirs };
  const review = await call(s.reviewer, "post", `/api/assignments/${claim.body.assignment.id}/review`, {
    scores: { transducer: "suitable", marker: "follows", depth: "fits", gain: "balanced", plane: "standard", labels: "complete", quality: o.quality ?? "4" },
    reads: Object.entries(theirs).map(([key, read]) => ({ key, read })),
    feedback: "",
    timeSpentSeconds: 30,
    limited: o.limited ?? false,
  });
  expect(review.status, JSON.stringify(review.body)).toBe(201);
  return { exam, review: review.body };
}

const feedbackOf = async (s: Setup, examId: string) => (await call(s.clinician, "get", `/api/me/feedback/${examId}`)).body;
const efastProgress = async (s: Setup) => {
  const res = await call(s.clinician, "get", "/api/me/progress");
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body.applications.find((a: { application: { code: string } }) => a.application.code === "efast");
};

describe("credit on one exam", () => {
  it("a misread on an educational exam blocks credit, and opens no patient follow-up (that stays for clinical exams)", async () => {
    const s = await setup();
    const { exam, review } = await reviewedExam(s, { setting: "educational", mine: { free_fluid_ruq: "negative" }, theirs: { free_fluid_ruq: "positive" } });
    expect(review.review.credit).toBe(false);
    expect((await feedbackOf(s, exam.id)).creditReasons).toEqual(["Misread: Free fluid, right upper quadrant"]);
    expect(await kit.db("follow_ups").where("exam_id", exam.id)).toEqual([]);

    // The same misread on a clinical exam also opens the follow-up, named by the finding's label.
    const clinical = await reviewedExam(s, { setting: "clinical", mine: { free_fluid_ruq: "negative" }, theirs: { free_fluid_ruq: "positive" } });
    const [followUp] = await kit.db("follow_ups").where("exam_id", clinical.exam.id);
    expect(followUp.reason).toContain("Free fluid, right upper quadrant");
    expect(followUp.reason).not.toContain("free_fluid_ruq");
  });

  it("a study missing a required view earns no credit when the application asks for a complete study, naming the views", async () => {
    const s = await setup();
    await setRule(s, { requireComplete: true });
    const all = ["ruq", "luq", "pelvis_long", "pelvis_trans", "subxiphoid", "chest_right", "chest_left"];
    const partial = await reviewedExam(s, { views: all.filter((v) => v !== "luq" && v !== "chest_left") });
    expect(partial.review.review.credit).toBe(false);
    expect((await feedbackOf(s, partial.exam.id)).creditReasons).toEqual(["Incomplete study: no clip of Left upper quadrant, Left anterior chest"]);
    const complete = await reviewedExam(s, { views: all });
    expect(complete.review.review.credit).toBe(true);
  });

  it("a study marked technically limited earns no credit and is not a failure on the learning curve", async () => {
    const s = await setup();
    const limited = await reviewedExam(s, { quality: "2", limited: true });
    expect(limited.review.review.credit).toBe(false);
    expect((await feedbackOf(s, limited.exam.id)).creditReasons).toEqual([LIMITED_REASON]);
    const poor = await reviewedExam(s, { quality: "2" });
    expect((await feedbackOf(s, poor.exam.id)).creditReasons).toEqual(["Image quality below 3"]);

    const p = await efastProgress(s);
    expect(p).toMatchObject({ reviewed: 2, credited: 0, limited: 1 });
    // Only the poor study is a learning-curve attempt, and a failure; the limited one is neither.
    expect(p.cusum.points.map((x: { examId: string; failed: boolean }) => [x.examId, x.failed])).toEqual([[poor.exam.id, true]]);
    expect(p.creditRate).toMatchObject({ successes: 0, n: 1 });
  });
});

describe("counting toward the threshold", () => {
  it("counts educational and simulated exams only up to the cap", async () => {
    const s = await setup();
    await setRule(s, { threshold: 3, nonClinicalCap: 1 });
    await reviewedExam(s, { setting: "clinical" });
    await reviewedExam(s, { setting: "simulated" });
    await reviewedExam(s, { setting: "simulated" });
    await reviewedExam(s, { setting: "educational" });
    let p = await efastProgress(s);
    expect(p).toMatchObject({ credited: 4, counted: 2, threshold: 3, remaining: 1, met: false });
    expect(p.creditedBySetting).toEqual({ clinical: 1, educational: 1, simulated: 2 });
    expect(p.creditRule).toEqual({ threshold: 3, nonClinicalCap: 1, minPositive: 0, requireComplete: false });

    await reviewedExam(s, { setting: "clinical" });
    p = await efastProgress(s);
    expect(p).toMatchObject({ credited: 5, counted: 3, remaining: 0, met: true });
  });

  it("needs the minimum of credited exams with a positive finding", async () => {
    const s = await setup();
    await setRule(s, { threshold: 2, minPositive: 1 });
    await reviewedExam(s);
    await reviewedExam(s);
    let p = await efastProgress(s);
    expect(p).toMatchObject({ counted: 2, positives: 0, remaining: 0, met: false });
    // A positive finding read right by the clinician: credited, and positive.
    await reviewedExam(s, { mine: { pericardial_effusion: "positive" }, theirs: { pericardial_effusion: "positive" } });
    p = await efastProgress(s);
    expect(p).toMatchObject({ counted: 3, positives: 1, met: true });
    // The application's threshold, not the program's 25 (the default), decides.
    expect(p.threshold).toBe(2);
  });

  it("shows the indeterminate-read rate beside accuracy, and the CSV states the rule applied", async () => {
    const s = await setup();
    await setRule(s, { threshold: 4, nonClinicalCap: 1, minPositive: 2, requireComplete: false });
    await reviewedExam(s, { mine: { free_fluid_luq: "indeterminate", hemothorax_left: "indeterminate" } });
    const p = await efastProgress(s);
    // 2 of the clinician's 8 reads were indeterminate.
    expect(p.indeterminateRate).toMatchObject({ successes: 2, n: EFAST_FINDING_KEYS.length });

    const csv = await call(s.lead, "get", `/api/reports/credentialing?format=csv&userId=${s.clinician.id}`);
    expect(csv.status).toBe(200);
    const rows = parse(csv.text.replace(/^\ufeff/, ""), { columns: true }) as Record<string, string>[];
    const efast = rows.find((r) => r.application_code === "efast")!;
    expect(efast).toMatchObject({
      threshold: "4",
      counted: "1",
      rule_non_clinical_cap: "1",
      rule_min_positive: "2",
      rule_require_complete: "no",
      indeterminate_rate: "0.2500",
    });
    expect(efast.credit_rule).toContain("4 credited exams; at most 1 of them educational or simulated; at least 2 with a positive finding");
    expect(efast.credit_rule).toContain("no misread finding (any setting)");
  });
});
