// The reviewer's side of the sonographer's questions: one reviewed exam as its reviewer read
// it (blinded), who may see it (404 for anyone who did not read it), the list of threads with
// the ones awaiting an answer, and an answer reaching the sonographer.
// Expected criterion labels and levels come from the default rubric (shared/rubric/default-rubric.ts), the
// finding labels from the demo catalogue's eFAST findings (shared/catalogue.ts).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { EFAST_FINDING_KEYS, makeExam, makeKit, makeMember, makeProgram, type TestKit, type TestMember, tokenFor } from "./helpers";
import { queueSubmittedExam } from "../../server/services/queue";

let kit: TestKit;
beforeAll(() => {
  kit = makeKit();
});
afterAll(() => kit.close());

const EFAST_FINDINGS = EFAST_FINDING_KEYS;
// Depth "too deep" and quality 4: both non-default levels, so the labels shown must be looked up.
const SCORES = { transducer: "suitable", marker: "follows", depth: "too_deep", gain: "balanced", plane: "standard", labels: "complete", quality: "4" };
const READS = EFAST_FINDINGS.map((key) => ({ key, read: key === "free_fluid_ruq" ? "positive" : "negative" }));
const FEEDBACK = "Reduce the depth so the kidney fills the screen.";

interface Setup {
  programId: string;
  sonographer: TestMember;
  lead: TestMember;
  reader: TestMember;
  other: TestMember;
}

async function setup(): Promise<Setup> {
  const p = await makeProgram(kit.db);
  return {
    programId: p.id,
    sonographer: await makeMember(kit.db, p.id, ["sonographer"]),
    lead: await makeMember(kit.db, p.id, ["qa_lead"]),
    reader: await makeMember(kit.db, p.id, ["reviewer"]),
    other: await makeMember(kit.db, p.id, ["reviewer"]),
  };
}

const auth = async (m: TestMember) => `Bearer ${await tokenFor(kit, m)}`;
const get = async (m: TestMember, path: string) =>
  request(kit.app)
    .get(path)
    .set("Authorization", await auth(m));
const post = async (m: TestMember, path: string, body: object) =>
  request(kit.app)
    .post(path)
    .set("Authorization", await auth(m))
    .send(body);

/** An educational eFAST exam, queued for one read, which `s.reader` claims and reviews; the feedback is then final. */
async function reviewedExam(s: Setup) {
  const exam = await makeExam(kit.db, s.programId, s.sonographer.id, { status: "submitted" });
  await kit.db("exams").where("id", exam.id).update({ setting: "educational" });
  // The clinician's reads match the reviewer's (a misread would block credit on any setting).
  await kit.db("exam_findings").insert(READS.map((r) => ({ exam_id: exam.id, finding_key: r.key, read: r.read })));
  await kit.db.transaction((trx) => queueSubmittedExam(trx, { id: exam.id, program_id: s.programId, setting: "educational" }, 0));
  const claim = await post(s.reader, "/api/queue/next", {});
  expect(claim.status, JSON.stringify(claim.body)).toBe(200);
  expect(claim.body.exam.id).toBe(exam.id);
  const review = await post(s.reader, `/api/assignments/${claim.body.assignment.id}/review`, {
    scores: SCORES,
    reads: READS,
    feedback: FEEDBACK,
    timeSpentSeconds: 60,
  });
  expect(review.status, JSON.stringify(review.body)).toBe(201);
  return exam;
}

const ask = async (s: Setup, examId: string, body: string) => {
  const res = await post(s.sonographer, `/api/exams/${examId}/messages`, { body });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
};

describe("GET /api/reviews/exams/:id", () => {
  it("shows the reviewer the exam and their own review, and never the sonographer's name, e-mail or id", async () => {
    const s = await setup();
    const exam = await reviewedExam(s);
    await ask(s, exam.id, "Which depth would you use for the right upper quadrant?");

    const res = await get(s.reader, `/api/reviews/exams/${exam.id}`);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.exam).toEqual({
      id: exam.id,
      code: exam.code,
      application: { code: "efast", name: "Trauma (FAST / eFAST)" },
      performedAt: expect.any(String),
      setting: "educational",
      status: "reviewed",
    });
    expect(res.body.myReview.feedback).toBe(FEEDBACK);
    // shared/rubric/default-rubric.ts: seven criteria in this order; "too deep" is a Depth level, quality 4 is labelled "4".
    expect(res.body.myReview.criteria.map((c: { label: string }) => c.label)).toEqual([
      "Transducer and preset",
      "Orientation marker",
      "Depth",
      "Gain",
      "Scan plane",
      "Labeling",
      "Overall image quality",
    ]);
    expect(res.body.myReview.criteria).toContainEqual({ key: "depth", label: "Depth", value: "too_deep", levelLabel: "Too deep" });
    expect(res.body.myReview.criteria).toContainEqual({ key: "quality", label: "Overall image quality", value: "4", levelLabel: "4" });
    expect(res.body.myReview.reads[0]).toEqual({ key: "free_fluid_ruq", label: "Free fluid, right upper quadrant", read: "positive" });
    expect(res.body.myReview.reads).toHaveLength(EFAST_FINDINGS.length);
    // One read settles it; quality 4 ≥ 3 and the marker follows convention (the default credit rule, README "Review rules").
    expect(res.body.final).toEqual({ credit: true, source: "single_read", decidedAt: expect.any(String) });

    const json = JSON.stringify(res.body);
    for (const secret of [s.sonographer.name, s.sonographer.email, s.sonographer.id]) expect(json).not.toContain(secret);
  });

  it("marks the reviewer's question notification for that exam read", async () => {
    const s = await setup();
    const exam = await reviewedExam(s);
    await ask(s, exam.id, "Was the pelvis view enough?");
    const before = await get(s.reader, "/api/notifications");
    expect(before.body.items.filter((n: { kind: string; read: boolean }) => n.kind === "feedback_reply" && !n.read)).toHaveLength(1);
    expect((await get(s.reader, `/api/reviews/exams/${exam.id}`)).status).toBe(200);
    const after = await get(s.reader, "/api/notifications");
    expect(after.body.items.filter((n: { kind: string; read: boolean }) => n.kind === "feedback_reply" && !n.read)).toHaveLength(0);
  });

  it("answers 404 to a reviewer who did not read the exam and to another program, 403 to a sonographer, and shows a QA lead the exam without a review", async () => {
    const s = await setup();
    const exam = await reviewedExam(s);
    expect((await get(s.other, `/api/reviews/exams/${exam.id}`)).status).toBe(404);
    expect((await get(s.reader, "/api/reviews/exams/00000000-0000-4000-8000-000000000000")).status).toBe(404);
    expect((await get(s.reader, "/api/reviews/exams/not-a-uuid")).status).toBe(400);
    const sono = await get(s.sonographer, `/api/reviews/exams/${exam.id}`);
    expect(sono.status).toBe(403);
    expect(sono.body.error.code).toBe("forbidden");

    const elsewhere = await makeProgram(kit.db);
    const outsider = await makeMember(kit.db, elsewhere.id, ["reviewer", "qa_lead"]);
    expect((await get(outsider, `/api/reviews/exams/${exam.id}`)).status).toBe(404);

    const lead = await get(s.lead, `/api/reviews/exams/${exam.id}`);
    expect(lead.status).toBe(200);
    expect(lead.body.myReview).toBeNull();
    expect(lead.body.exam.code).toBe(exam.code);
    expect(JSON.stringify(lead.body)).not.toContain(s.sonographer.name);
  });
});

describe("GET /api/reviews/questions", () => {
  it("lists the threads on exams I reviewed, newest message first, and says whose turn it is", async () => {
    const s = await setup();
    const first = await reviewedExam(s);
    const second = await reviewedExam(s);
    const silent = await reviewedExam(s);
    await ask(s, first.id, "Why was the depth too deep?");
    await ask(s, second.id, "Should I add a pelvis transverse view?");
    // The reader answers the first question: its thread is now the newest and no longer waits.
    const answer = await post(s.reader, `/api/exams/${first.id}/messages`, { body: "Aim for about 14 cm here." });
    expect(answer.status).toBe(201);

    const res = await get(s.reader, "/api/reviews/questions");
    expect(res.status).toBe(200);
    expect(res.body.items).toEqual([
      {
        examId: first.id,
        code: first.code,
        application: { code: "efast", name: "Trauma (FAST / eFAST)" },
        lastMessageAt: expect.any(String),
        lastFromSonographer: false,
        messages: 2,
      },
      {
        examId: second.id,
        code: second.code,
        application: { code: "efast", name: "Trauma (FAST / eFAST)" },
        lastMessageAt: expect.any(String),
        lastFromSonographer: true,
        messages: 1,
      },
    ]);
    expect(new Date(res.body.items[0].lastMessageAt).getTime()).toBeGreaterThan(new Date(res.body.items[1].lastMessageAt).getTime());
    expect(res.body.items.map((i: { examId: string }) => i.examId)).not.toContain(silent.id);
    const json = JSON.stringify(res.body);
    for (const secret of [s.sonographer.name, s.sonographer.email, s.sonographer.id]) expect(json).not.toContain(secret);

    // The sonographer asks again: the second thread waits, the first waits once more and leads.
    await ask(s, first.id, "And for the pelvis?");
    const again = await get(s.reader, "/api/reviews/questions");
    expect(
      again.body.items.map((i: { examId: string; lastFromSonographer: boolean; messages: number }) => [i.examId, i.lastFromSonographer, i.messages]),
    ).toEqual([
      [first.id, true, 3],
      [second.id, true, 1],
    ]);

    // The reader's home page counts the threads waiting for an answer; another reviewer's does not.
    const waitingCard = async (who: TestMember) =>
      (await get(who, "/api/home")).body.sections
        .flatMap((section: { cards: { key: string; count: number }[] }) => section.cards)
        .find((c: { key: string }) => c.key === "questions_waiting");
    expect(await waitingCard(s.reader)).toMatchObject({ count: 2, href: "/reviews/questions" });
    expect(await waitingCard(s.other)).toBeUndefined();

    // Another reviewer read none of them; a QA lead sees every thread of the program; a sonographer meets the role gate.
    expect((await get(s.other, "/api/reviews/questions")).body.items).toEqual([]);
    expect((await get(s.lead, "/api/reviews/questions")).body.items.map((i: { examId: string }) => i.examId)).toEqual([first.id, second.id]);
    expect((await get(s.sonographer, "/api/reviews/questions")).status).toBe(403);
  });

  it("delivers the reviewer's answer to the sonographer's feedback thread, named as the program shows reviewers", async () => {
    const s = await setup();
    const exam = await reviewedExam(s);
    await ask(s, exam.id, "Could the free fluid have been a fat pad?");
    const thread = await get(s.reader, `/api/exams/${exam.id}/messages`);
    expect(thread.body.items.map((m: { author: string }) => m.author)).toEqual(["Clinician"]);

    const answer = await post(s.reader, `/api/exams/${exam.id}/messages`, { body: "Fluid is anechoic and layers; a fat pad is echogenic." });
    expect(answer.status).toBe(201);
    const fb = await get(s.sonographer, `/api/me/feedback/${exam.id}`);
    expect(fb.status).toBe(200);
    expect(fb.body.messages.map((m: { author: string; body: string }) => [m.author, m.body])).toEqual([
      ["you", "Could the free fluid have been a fat pad?"],
      [s.reader.name, "Fluid is anechoic and layers; a fat pad is echogenic."],
    ]);
    const notes = await get(s.sonographer, "/api/notifications");
    expect(notes.body.items.some((n: { kind: string; examId: string }) => n.kind === "feedback_answer" && n.examId === exam.id)).toBe(true);
  });
});

describe("calibration readers and the learner's thread", () => {
  it("keeps a reader whose only read was a calibration read out of the thread, the final result and the learner's feedback, but lets them see the exam", async () => {
    const s = await setup();
    const exam = await reviewedExam(s);
    const spare = await reviewedExam(s);
    const extra = await makeMember(kit.db, s.programId, ["reviewer"]);
    const set = await post(s.lead, "/api/calibration-sets", {
      name: "Thread check",
      exams: [{ examId: exam.id }, { examId: spare.id }],
      reviewerIds: [s.other.id, extra.id],
    });
    expect(set.status, JSON.stringify(set.body)).toBe(201);
    for (let k = 0; k < 2; k++) {
      const claim = await post(s.other, "/api/queue/next", {});
      expect(claim.status).toBe(200);
      // What the calibration read needs: the blinded exam.
      expect((await get(s.other, `/api/exams/${claim.body.exam.id}`)).status).toBe(200);
      const done = await post(s.other, `/api/assignments/${claim.body.assignment.id}/review`, {
        scores: SCORES,
        reads: READS,
        feedback: "Calibration comment only for the QA lead.",
        timeSpentSeconds: 30,
      });
      expect(done.body.examState).toBe("calibration");
    }
    await ask(s, exam.id, "Is a question seen by the calibration readers?");

    expect((await get(s.other, `/api/exams/${exam.id}/messages`)).status).toBe(404);
    expect((await post(s.other, `/api/exams/${exam.id}/messages`, { body: "Not mine to answer" })).status).toBe(404);
    expect((await get(s.other, `/api/reviews/exams/${exam.id}`)).status).toBe(404);
    expect((await get(s.other, "/api/reviews/questions")).body.items).toEqual([]);
    const notes = await get(s.other, "/api/notifications");
    expect(notes.body.items.filter((n: { kind: string }) => n.kind === "feedback_reply")).toEqual([]);
    // The learner sees the deciding reviewer's comment only.
    const fb = await get(s.sonographer, `/api/me/feedback/${exam.id}`);
    expect(fb.body.comments.map((c: { text: string }) => c.text)).toEqual([FEEDBACK]);
    // The real reader keeps the thread.
    expect((await get(s.reader, `/api/exams/${exam.id}/messages`)).status).toBe(200);
    expect((await get(s.reader, `/api/reviews/exams/${exam.id}`)).status).toBe(200);
  });
});
