// The review queue and scoring: atomic claims under concurrency, leases, blinding, rubric
// versions, double reads and adjudication, derived results, feedback delivery, bad input.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { mailsFor, makeClip, makeExam, makeKit, makeMember, type TestKit, type TestMember, waitForMail } from "./helpers";
import { queueSubmittedExam, sampledForSecondRead } from "../../server/services/queue";
import { GOOD, body, negatives, reviewKit } from "./review-kit";
import { sendOverdueDigests } from "../../server/services/notify";

let kit: TestKit;
beforeAll(() => {
  kit = makeKit();
});
afterAll(() => kit.close());

const { setup, queued, auth, next, review } = reviewKit(() => kit);

describe("claiming", () => {
  it("gives 20 reviewers claiming at once 20 distinct assignments and loses none", async () => {
    const s = await setup(20);
    for (let i = 0; i < 25; i++) await queued(s);
    const results = await Promise.all(s.reviewers.map((r) => next(r)));
    expect(results.map((r) => r.status)).toEqual(Array(20).fill(200));
    const ids = results.map((r) => r.body.assignment.id);
    expect(new Set(ids).size).toBe(20);
    const rows = await kit.db("assignments").where("program_id", s.programId);
    expect(rows.filter((a) => a.state === "claimed")).toHaveLength(20);
    expect(rows.filter((a) => a.state === "open")).toHaveLength(5);
    expect(new Set(rows.filter((a) => a.state === "claimed").map((a) => a.reviewer_id)).size).toBe(20);
  });

  it("answers 204 when nothing waits, never offers a reviewer their own exam, and reads clinical exams first", async () => {
    const s = await setup(1);
    expect((await next(s.reviewers[0])).status).toBe(204);
    const both = await makeMember(kit.db, s.programId, ["sonographer", "reviewer"]);
    const own = await makeExam(kit.db, s.programId, both.id, { status: "submitted" });
    await kit.db.transaction((trx) => queueSubmittedExam(trx, { id: own.id, program_id: s.programId, setting: "clinical" }, 0));
    expect((await next(both)).status).toBe(204);
    await kit.db("assignments").where("exam_id", own.id).update({ state: "cancelled" });
    const educational = await queued(s, { setting: "educational" });
    const clinical = await queued(s, { setting: "clinical" });
    await kit
      .db("assignments")
      .where("exam_id", educational.id)
      .update({ due_at: new Date(Date.now() - 86400_000) });
    const first = await next(s.reviewers[0]);
    expect(first.body.exam.id).toBe(clinical.id);
  });

  it("returns the held claim on a second 'start next', and lets a released or expired claim go back", async () => {
    const s = await setup(2);
    await queued(s);
    const a = await next(s.reviewers[0]);
    expect((await next(s.reviewers[0])).body.assignment.id).toBe(a.body.assignment.id);
    expect((await next(s.reviewers[1])).status).toBe(204);
    await kit
      .db("assignments")
      .where("id", a.body.assignment.id)
      .update({ lease_expires_at: new Date(Date.now() - 1000) });
    const b = await next(s.reviewers[1]);
    expect(b.body.assignment.id).toBe(a.body.assignment.id);
    const late = await review(s.reviewers[0], a.body.assignment.id, body());
    expect(late.status).toBe(404);
    const rel = await request(kit.app)
      .post(`/api/assignments/${b.body.assignment.id}/release`)
      .set("Authorization", await auth(s.reviewers[1]));
    expect(rel.status).toBe(204);
    expect((await next(s.reviewers[0])).body.assignment.id).toBe(a.body.assignment.id);
  });
});

describe("blinding", () => {
  it("never shows a reviewer the sonographer's name, e-mail or id, nor their reads or upload names", async () => {
    const s = await setup(1);
    const exam = await queued(s);
    await kit.db("clips").insert({
      exam_id: exam.id,
      program_id: s.programId,
      kind: "video",
      state: "queued",
      sha256: "a".repeat(64),
      size_bytes: 1,
      mime: "video/mp4",
      original_name: `${s.sonographer.name}-scan.mp4`,
    });
    const r = s.reviewers[0];
    const a = await next(r);
    const A = await auth(r);
    const responses = [
      a.body,
      (await request(kit.app).get(`/api/assignments/${a.body.assignment.id}`).set("Authorization", A)).body,
      (await request(kit.app).get("/api/queue").set("Authorization", A)).body,
      (await request(kit.app).get(`/api/exams/${exam.id}`).set("Authorization", A)).body,
      (await request(kit.app).get("/api/adjudications").set("Authorization", A)).body,
      (await request(kit.app).get("/api/home").set("Authorization", A)).body,
    ];
    for (const json of responses.map((x) => JSON.stringify(x))) {
      expect(json).not.toContain(s.sonographer.id);
      expect(json).not.toContain(s.sonographer.email);
      expect(json).not.toContain(s.sonographer.name);
    }
    expect(a.body.exam.code).toBe(exam.code);
    expect(responses[3].exam.findings).toEqual([]);
    expect(responses[3].exam.sonographer).toBeNull();
    // A QA lead may switch blinding off for the program.
    await request(kit.app)
      .patch("/api/settings")
      .set("Authorization", await auth(s.lead))
      .send({ blindSonographer: false });
    const open = await request(kit.app).get(`/api/assignments/${a.body.assignment.id}`).set("Authorization", A);
    expect(open.body.exam.sonographer).toEqual({ name: s.sonographer.name });
  });

  it("never shows a reviewer another reviewer's scores before their own are in", async () => {
    const s = await setup(2);
    const exam = await queued(s, { double: true });
    const a = await next(s.reviewers[0]);
    const b = await next(s.reviewers[1]);
    expect(a.body.assignment.id).not.toBe(b.body.assignment.id);
    await review(s.reviewers[0], a.body.assignment.id, body({ feedback: "SECRET-FIRST-READ" }));
    const B = await auth(s.reviewers[1]);
    for (const path of [`/api/assignments/${b.body.assignment.id}`, `/api/exams/${exam.id}`, "/api/adjudications", "/api/queue"]) {
      const res = await request(kit.app).get(path).set("Authorization", B);
      expect(res.status, path).toBe(200);
      expect(JSON.stringify(res.body), path).not.toContain("SECRET-FIRST-READ");
      expect(JSON.stringify(res.body), path).not.toContain('"quality":"4"');
    }
  });
});

describe("scoring and results", () => {
  it("settles a single read: final result, credit, outcomes, feedback notification and e-mail", async () => {
    const s = await setup(1);
    const exam = await queued(s, { sonographerReads: "negative" });
    const a = await next(s.reviewers[0]);
    const reads = negatives().map((r) => (r.key === "free_fluid_ruq" ? { ...r, read: "positive" } : r));
    const res = await review(s.reviewers[0], a.body.assignment.id, body({ reads }));
    expect(res.status).toBe(201);
    expect(res.body.examState).toBe("final");
    // A missed positive on a clinical exam is a significant disagreement: no credit, a follow-up.
    expect(res.body.review.credit).toBe(false);
    const result = await kit.db("exam_results").where("exam_id", exam.id).first();
    expect(result).toMatchObject({ source: "single_read", credit: false });
    const outcomes = Object.fromEntries((await kit.db("finding_outcomes").where("exam_id", exam.id)).map((o) => [o.finding_key, o.outcome]));
    expect(outcomes).toMatchObject({ free_fluid_ruq: "FN", free_fluid_luq: "TN" });
    const followUps = await request(kit.app)
      .get("/api/follow-ups")
      .set("Authorization", await auth(s.lead));
    expect(followUps.body.items.map((f: { examId: string }) => f.examId)).toContain(exam.id);
    const mail = await waitForMail(s.sonographer.email, "Feedback on your");
    expect(mail.text).toContain(exam.code);
    expect(mail.text).toContain(`/feedback/${exam.id}`);
    const fb = await request(kit.app)
      .get(`/api/me/feedback/${exam.id}`)
      .set("Authorization", await auth(s.sonographer));
    expect(fb.status).toBe(200);
    expect(fb.body.criteria.find((c: { key: string }) => c.key === "quality").level.anchor).toMatch(/Good, with minor flaws/);
    expect(fb.body.comments[0]).toMatchObject({ text: "Well fanned views.", reviewer: s.reviewers[0].name });
    expect(fb.body.creditReasons).toEqual(["Misread: Free fluid, right upper quadrant"]);
  });

  it("gives credit by the program's rule: quality at least 3, no failing critical level", async () => {
    const s = await setup(3);
    const cases: [Record<string, string>, boolean][] = [
      [{ quality: "3" }, true],
      [{ quality: "2" }, false],
      [{ marker: "does_not" }, false],
    ];
    for (const [i, [scores, credit]] of cases.entries()) {
      await queued(s, { setting: "educational" });
      const a = await next(s.reviewers[i]);
      const res = await review(s.reviewers[i], a.body.assignment.id, body({ scores }));
      expect(res.body.review.credit, JSON.stringify(scores)).toBe(credit);
    }
  });

  it("agrees a double read within tolerance (primary stands) and sends a disagreement to adjudication", async () => {
    const s = await setup(2);
    const agreed = await queued(s, { double: true, setting: "educational" });
    let a = await next(s.reviewers[0]);
    let b = await next(s.reviewers[1]);
    expect((await review(s.reviewers[0], a.body.assignment.id, body({ scores: { quality: "4" } }))).body.examState).toBe("waiting");
    expect((await review(s.reviewers[1], b.body.assignment.id, body({ scores: { quality: "3" } }))).body.examState).toBe("final");
    const primaryKind = (await kit.db("assignments").where("id", a.body.assignment.id).first()).kind;
    const result = await kit.db("exam_results").where("exam_id", agreed.id).first();
    expect(result.source).toBe("double_read_agreed");
    expect(result.scores.quality).toBe(primaryKind === "primary" ? "4" : "3");

    const split = await queued(s, { double: true, setting: "clinical" });
    a = await next(s.reviewers[0]);
    b = await next(s.reviewers[1]);
    await review(s.reviewers[0], a.body.assignment.id, body({ scores: { quality: "4" } }));
    const second = await review(s.reviewers[1], b.body.assignment.id, body({ scores: { quality: "1", depth: "too_deep" } }));
    expect(second.body.examState).toBe("adjudication");
    expect((await kit.db("exams").where("id", split.id).first()).status).toBe("adjudication");
    const L = await auth(s.lead);
    const list = await request(kit.app).get("/api/adjudications").set("Authorization", L);
    const item = list.body.items.find((x: { examId: string }) => x.examId === split.id);
    expect(item.disagreements.sort()).toEqual(["depth", "quality"]);
    expect(item.reads.map((r: { reviewer: string }) => r.reviewer).sort()).toEqual([s.reviewers[0].name, s.reviewers[1].name].sort());
    const missing = await request(kit.app)
      .post(`/api/exams/${split.id}/adjudicate`)
      .set("Authorization", L)
      .send({ scores: { ...GOOD, quality: undefined }, reads: negatives() });
    expect(missing.status).toBe(400);
    expect(missing.body.error.message).toMatch(/^scores\.quality:/);
    const done = await request(kit.app)
      .post(`/api/exams/${split.id}/adjudicate`)
      .set("Authorization", L)
      .send({ scores: { ...GOOD, quality: "3" }, reads: negatives(), note: "Depth acceptable on review." });
    expect(done.status).toBe(200);
    const final = await kit.db("exam_results").where("exam_id", split.id).first();
    expect(final).toMatchObject({ source: "adjudicated", decided_by: s.lead.id, note: "Depth acceptable on review.", credit: true });
    expect((await kit.db("exams").where("id", split.id).first()).status).toBe("reviewed");
    const again = await request(kit.app).post(`/api/exams/${split.id}/adjudicate`).set("Authorization", L).send({ scores: GOOD, reads: negatives() });
    expect(again.status).toBe(409);
    const audit = await kit.db("audit_log").where({ program_id: s.programId }).pluck("action");
    expect(audit).toEqual(expect.arrayContaining(["review.submitted", "exam.sent_to_adjudication", "exam.adjudicated", "exam.result_final"]));
  });
});

describe("rubric versions", () => {
  it("keeps the version a claim was made under; editing makes a new version and never changes past reviews", async () => {
    const s = await setup(2);
    await queued(s);
    await queued(s);
    const L = await auth(s.lead);
    const v1 = (await request(kit.app).get("/api/rubrics").set("Authorization", L)).body.rubrics.find((r: { status: string }) => r.status === "published");
    const held = await next(s.reviewers[0]);
    expect(held.body.rubric.id).toBe(v1.id);
    const done = await next(s.reviewers[1]);
    await review(s.reviewers[1], done.body.assignment.id, body());

    const full = (await request(kit.app).get(`/api/rubrics/${v1.id}`).set("Authorization", L)).body.rubric;
    const criteria = full.criteria.map((c: { key: string; tolerance: number }) => (c.key === "quality" ? { ...c, tolerance: 0 } : c));
    criteria.push({
      key: "needle",
      label: "Needle visible",
      kind: "yes_no",
      levels: [
        { value: "yes", label: "Yes" },
        { value: "no", label: "No" },
      ],
      required: false,
    });
    const saved = await request(kit.app).put(`/api/rubrics/${v1.id}`).set("Authorization", L).send({ name: full.name, criteria });
    expect(saved.status).toBe(200);
    expect(saved.body.rubric).toMatchObject({ version: 2, status: "published", familyId: v1.familyId });
    expect(saved.body.rubric.id).not.toBe(v1.id);
    expect((await request(kit.app).get(`/api/rubrics/${v1.id}`).set("Authorization", L)).body.rubric.status).toBe("archived");
    expect((await kit.db("reviews").where("assignment_id", done.body.assignment.id).first()).rubric_id).toBe(v1.id);

    // The held claim still scores under version 1: a version-2 criterion is refused, and so is version 2's id.
    const extra = await review(s.reviewers[0], held.body.assignment.id, { ...body(), scores: { ...GOOD, needle: "yes" } });
    expect(extra.status).toBe(400);
    expect(extra.body.error.message).toMatch(/^scores\.needle: .*version 1/);
    const otherVersion = await review(s.reviewers[0], held.body.assignment.id, { ...body(), rubricId: saved.body.rubric.id });
    expect(otherVersion.status).toBe(400);
    expect(otherVersion.body.error.message).toMatch(/^rubricId:/);
    expect((await review(s.reviewers[0], held.body.assignment.id, { ...body(), rubricId: v1.id })).status).toBe(201);
    const actions = await kit.db("audit_log").where({ program_id: s.programId }).pluck("action");
    expect(actions).toContain("rubric.new_version");
  });
});

describe("bad input", () => {
  it("names a missing required criterion and a level out of range", async () => {
    const s = await setup(1);
    await queued(s);
    const a = await next(s.reviewers[0]);
    const { gain: _gain, ...noGain } = GOOD;
    const missing = await review(s.reviewers[0], a.body.assignment.id, { ...body(), scores: noGain });
    expect(missing.status).toBe(400);
    expect(missing.body.error.message).toMatch(/^scores\.gain: Gain is required/);
    const range = await review(s.reviewers[0], a.body.assignment.id, body({ scores: { quality: "7" } }));
    expect(range.body.error.message).toMatch(/^scores\.quality:/);
    const noReads = await review(s.reviewers[0], a.body.assignment.id, { ...body(), reads: [] });
    expect(noReads.body.error.message).toMatch(/^reads:/);
    expect(await kit.db("reviews").where("assignment_id", a.body.assignment.id)).toHaveLength(0);
  });

  it("refuses someone else's assignment, a second submission and a reassignment to the sonographer", async () => {
    const s = await setup(2);
    await queued(s);
    const a = await next(s.reviewers[0]);
    expect((await review(s.reviewers[1], a.body.assignment.id, body())).status).toBe(404);
    expect((await review(s.reviewers[0], a.body.assignment.id, body())).status).toBe(201);
    const twice = await review(s.reviewers[0], a.body.assignment.id, body());
    expect(twice.status).toBe(409);
    expect(twice.body.error.code).toBe("already_submitted");
    const other = await queued(s);
    const open = await kit.db("assignments").where("exam_id", other.id).first("id");
    const both = await makeMember(kit.db, s.programId, ["reviewer"]);
    await kit.db("exams").where("id", other.id).update({ sonographer_id: both.id });
    const own = await request(kit.app)
      .post(`/api/assignments/${open.id}/reassign`)
      .set("Authorization", await auth(s.lead))
      .send({ reviewerId: both.id });
    expect(own.status).toBe(409);
    const ok = await request(kit.app)
      .post(`/api/assignments/${open.id}/reassign`)
      .set("Authorization", await auth(s.lead))
      .send({ reviewerId: s.reviewers[1].id });
    expect(ok.status).toBe(200);
    // Only the chosen reviewer can now claim it.
    expect((await next(s.reviewers[0])).status).toBe(204);
    expect((await next(s.reviewers[1])).body.assignment.id).toBe(open.id);
  });
});

describe("drafts, replies and digests", () => {
  it("autosaves a draft that survives a reload, and extends the claim", async () => {
    const s = await setup(1);
    await queued(s);
    const a = await next(s.reviewers[0]);
    const A = await auth(s.reviewers[0]);
    const saved = await request(kit.app)
      .put(`/api/assignments/${a.body.assignment.id}/draft`)
      .set("Authorization", A)
      .send({ scores: { quality: "2" }, feedback: "half done" });
    expect(saved.status).toBe(200);
    expect(new Date(saved.body.leaseExpiresAt).getTime()).toBeGreaterThan(Date.now() + 25 * 60_000);
    const reload = await request(kit.app).get(`/api/assignments/${a.body.assignment.id}`).set("Authorization", A);
    expect(reload.body.draft).toMatchObject({ scores: { quality: "2" }, feedback: "half done" });
  });

  it("lets the sonographer acknowledge and ask a question that reaches the reviewer by e-mail", async () => {
    const s = await setup(1);
    const exam = await queued(s, { setting: "educational" });
    const a = await next(s.reviewers[0]);
    await review(s.reviewers[0], a.body.assignment.id, body());
    const S = await auth(s.sonographer);
    const ack = await request(kit.app).post(`/api/exams/${exam.id}/acknowledge`).set("Authorization", S);
    expect(ack.status).toBe(200);
    const ask = await request(kit.app).post(`/api/exams/${exam.id}/messages`).set("Authorization", S).send({ body: "Which depth would you use here?" });
    expect(ask.status).toBe(201);
    const mail = await waitForMail(s.reviewers[0].email, "A question about exam");
    expect(mail.text).toContain("Which depth would you use here?");
    const notes = await request(kit.app)
      .get("/api/notifications")
      .set("Authorization", await auth(s.reviewers[0]));
    expect(notes.body.unread).toBe(1);
    const thread = await request(kit.app)
      .get(`/api/exams/${exam.id}/messages`)
      .set("Authorization", await auth(s.reviewers[0]));
    expect(thread.body.items).toEqual([{ id: expect.any(String), body: "Which depth would you use here?", at: expect.any(String), author: "Clinician" }]);
    const answer = await request(kit.app)
      .post(`/api/exams/${exam.id}/messages`)
      .set("Authorization", await auth(s.reviewers[0]))
      .send({ body: "Fit the whole pelvis, about 14 cm." });
    expect(answer.status).toBe(201);
    const mine = await request(kit.app).get(`/api/exams/${exam.id}/messages`).set("Authorization", S);
    expect(mine.body.items.map((m: { author: string }) => m.author)).toEqual(["you", s.reviewers[0].name]);
  });

  it("mails reviewers a digest of reads waiting past the turnaround target", async () => {
    const s = await setup(1);
    const exam = await queued(s);
    await kit
      .db("assignments")
      .where("exam_id", exam.id)
      .update({ due_at: new Date(Date.now() - 80 * 3600_000) });
    await sendOverdueDigests(kit.db, "http://127.0.0.1");
    const mail = await waitForMail(s.reviewers[0].email, "waiting past the turnaround target");
    expect(mail.text).toMatch(/Trauma \(FAST \/ eFAST\): 1/);
    expect(await mailsFor(s.sonographer.email)).toEqual([]);
  });
});

describe("sampling for a second read", () => {
  it("is reproducible and takes about the configured share", () => {
    const ids = Array.from({ length: 2000 }, (_, i) => `00000000-0000-4000-8000-${String(i).padStart(12, "0")}`);
    const picked = ids.filter((id) => sampledForSecondRead(id, 0.2));
    expect(ids.filter((id) => sampledForSecondRead(id, 0.2))).toEqual(picked);
    // Binomial(2000, 0.2): mean 400, sd ≈ 17.9; ±4 sd.
    expect(picked.length).toBeGreaterThan(400 - 72);
    expect(picked.length).toBeLessThan(400 + 72);
    expect(ids.some((id) => sampledForSecondRead(id, 0))).toBe(false);
    expect(ids.every((id) => sampledForSecondRead(id, 1))).toBe(true);
  });
});

describe("access through a claim or a handed adjudication", () => {
  const get = async (m: TestMember, path: string) =>
    request(kit.app)
      .get(path)
      .set("Authorization", await auth(m));

  it("lets the reviewer a QA lead handed an adjudication open the blinded exam and its clip media, and nobody else", async () => {
    const s = await setup(4);
    const exam = await queued(s, { double: true, setting: "clinical" });
    const clip = await makeClip(kit, { id: exam.id, program_id: s.programId }, "ready");
    const a = await next(s.reviewers[0]);
    const b = await next(s.reviewers[1]);
    await review(s.reviewers[0], a.body.assignment.id, body({ scores: { quality: "4" } }));
    expect((await review(s.reviewers[1], b.body.assignment.id, body({ scores: { quality: "1", depth: "too_deep" } }))).body.examState).toBe("adjudication");
    const adj = await kit.db("assignments").where({ exam_id: exam.id, kind: "adjudication" }).first("id");
    const handed = await request(kit.app)
      .post(`/api/assignments/${adj.id}/reassign`)
      .set("Authorization", await auth(s.lead))
      .send({ reviewerId: s.reviewers[2].id });
    expect(handed.status).toBe(200);

    const seen = await get(s.reviewers[2], `/api/exams/${exam.id}`);
    expect(seen.status, JSON.stringify(seen.body)).toBe(200);
    const json = JSON.stringify(seen.body);
    for (const secret of [s.sonographer.name, s.sonographer.email, s.sonographer.id]) expect(json).not.toContain(secret);
    expect((await get(s.reviewers[2], `/api/clips/${clip.id}/media/video`)).status).toBe(200);
    // A reviewer without a read or a handed adjudication still meets 404.
    expect((await get(s.reviewers[3], `/api/exams/${exam.id}`)).status).toBe(404);
    expect((await get(s.reviewers[3], `/api/clips/${clip.id}/media/video`)).status).toBe(404);
  });

  it("takes the exam, its media, autosave and submission away from a claim whose lease ran out, even before anyone re-claims it", async () => {
    const s = await setup(1);
    const exam = await queued(s);
    const clip = await makeClip(kit, { id: exam.id, program_id: s.programId }, "ready");
    const r = s.reviewers[0];
    const a = await next(r);
    const id = a.body.assignment.id;
    expect((await get(r, `/api/exams/${exam.id}`)).status).toBe(200);
    expect((await get(r, `/api/clips/${clip.id}/media/video`)).status).toBe(200);
    const past = new Date(Date.now() - 1000);
    await kit.db("assignments").where("id", id).update({ lease_expires_at: past });

    expect((await get(r, `/api/exams/${exam.id}`)).status).toBe(404);
    expect((await get(r, `/api/clips/${clip.id}/media/video`)).status).toBe(404);
    const save = await request(kit.app)
      .put(`/api/assignments/${id}/draft`)
      .set("Authorization", await auth(r))
      .send({ scores: { quality: "2" }, feedback: "after the lease" });
    expect(save.status).toBe(409);
    expect(save.body.error.code).toBe("claim_expired");
    expect(save.body.error.message).toMatch(/ran out/);
    const late = await review(r, id, body());
    expect(late.status).toBe(409);
    expect(late.body.error.code).toBe("claim_expired");
    expect((await get(r, `/api/assignments/${id}`)).body.error.code).toBe("claim_expired");
    // Nothing was revived or written: the lease is still over and no review exists.
    const row = await kit.db("assignments").where("id", id).first();
    expect(row.lease_expires_at.getTime()).toBe(past.getTime());
    expect(await kit.db("reviews").where("assignment_id", id)).toHaveLength(0);
    // Back in the queue: claiming it anew gives a fresh lease and access again.
    expect((await next(r)).body.assignment.id).toBe(id);
    expect((await get(r, `/api/exams/${exam.id}`)).status).toBe(200);
  });
});
