// What the review tests share: a program with a clinician, a QA lead and reviewers, a
// submitted eFAST exam in the queue, a good read of it, and the calls a reviewer makes.
import request from "supertest";
import { EFAST_FINDING_KEYS, makeExam, makeMember, makeProgram, tokenFor, type TestKit, type TestMember } from "./helpers";
import { queueSubmittedExam } from "../../server/services/queue";

export const GOOD = { transducer: "suitable", marker: "follows", depth: "fits", gain: "balanced", plane: "standard", labels: "complete", quality: "4" };
export const negatives = () => EFAST_FINDING_KEYS.map((key) => ({ key, read: "negative" }));
export const body = (over: { scores?: Record<string, string>; reads?: { key: string; read: string }[]; feedback?: string } = {}) => ({
  scores: { ...GOOD, ...over.scores },
  reads: over.reads ?? negatives(),
  feedback: over.feedback ?? "Well fanned views.",
  timeSpentSeconds: 95,
});

export interface Setup {
  programId: string;
  sonographer: TestMember;
  lead: TestMember;
  reviewers: TestMember[];
}

/** The helpers, for the kit `getKit` returns when called (tests make their kit in beforeAll). */
export function reviewKit(getKit: () => TestKit) {
  const setup = async (reviewerCount = 2): Promise<Setup> => {
    const p = await makeProgram(getKit().db);
    const sonographer = await makeMember(getKit().db, p.id, ["sonographer"]);
    const lead = await makeMember(getKit().db, p.id, ["qa_lead"]);
    const reviewers = [];
    for (let i = 0; i < reviewerCount; i++) reviewers.push(await makeMember(getKit().db, p.id, ["reviewer"]));
    return { programId: p.id, sonographer, lead, reviewers };
  };
  /** A submitted exam in the queue; `double` forces a second read or not. */
  const queued = async (s: Setup, opts: { double?: boolean; setting?: string; sonographerReads?: string } = {}) => {
    const exam = await makeExam(getKit().db, s.programId, s.sonographer.id, { status: "submitted" });
    await getKit()
      .db("exams")
      .where("id", exam.id)
      .update({ setting: opts.setting ?? "clinical" });
    await getKit()
      .db("exam_findings")
      .insert(EFAST_FINDING_KEYS.map((key) => ({ exam_id: exam.id, finding_key: key, read: opts.sonographerReads ?? "negative" })));
    await getKit().db.transaction((trx) =>
      queueSubmittedExam(trx, { id: exam.id, program_id: s.programId, setting: opts.setting ?? "clinical" }, opts.double ? 1 : 0),
    );
    return exam;
  };
  const auth = async (m: TestMember) => `Bearer ${await tokenFor(getKit(), m)}`;
  const next = async (m: TestMember) =>
    request(getKit().app)
      .post("/api/queue/next")
      .set("Authorization", await auth(m))
      .send({});
  const review = async (m: TestMember, assignmentId: string, b: object) =>
    request(getKit().app)
      .post(`/api/assignments/${assignmentId}/review`)
      .set("Authorization", await auth(m))
      .send(b);
  return { setup, queued, auth, next, review };
}
