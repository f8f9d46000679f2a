// The patient-safety loop (issue 14): a reviewer flags a clinical read "needs clinical
// follow-up now"; the QA lead and the program's on-call address get the e-mail (the fake mail
// server) and the lead a notification before any second read; the urgent follow-up is due by
// the urgent target and a later significant disagreement joins it rather than opening another.
// A follow-up cannot be closed without an outcome, some outcomes need a note, and closing
// records who and when; the Program report counts by outcome. Clinical exams are overdue by
// their own shorter target in the queue and the digest.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { execFileSync } from "node:child_process";
import path from "node:path";
import { efastExamBody, makeKit, waitForMail, type TestKit, type TestMember } from "./helpers";
import { pgBinDir } from "../../scripts/lib/postgres";
import { body, negatives, reviewKit } from "./review-kit";
import { updateSettings } from "../../server/repositories/settings";
import { sendOverdueDigests } from "../../server/services/notify";

let kit: TestKit;
beforeAll(() => {
  kit = makeKit();
});
afterAll(() => kit.close());
const { setup, queued, auth, next, review } = reviewKit(() => kit);

describe("urgent flag while scoring", () => {
  it("tells the QA lead and the on-call address at once, before the second read, and opens an urgent follow-up", async () => {
    const s = await setup(2);
    const onCall = `on-call-${Math.random().toString(36).slice(2, 8)}@ed-test.example`;
    await updateSettings(kit.db, s.programId, { onCallEmail: onCall, urgentFollowUpDueHours: 6 });
    const exam = await queued(s, { double: true });
    const a = await next(s.reviewers[0]);
    // A flag needs its reason, named by field; nothing is recorded.
    const bare = await review(s.reviewers[0], a.body.assignment.id, { ...body(), urgent: { reason: " " } });
    expect(bare.status).toBe(400);
    expect(bare.body.error.message).toMatch(/^urgent\.reason: /);
    expect(await kit.db("reviews").where("exam_id", exam.id)).toHaveLength(0);

    const reason = "Free fluid in the right upper quadrant the clinician read as negative";
    const reads = negatives().map((r) => (r.key === "free_fluid_ruq" ? { ...r, read: "positive" } : r));
    const res = await review(s.reviewers[0], a.body.assignment.id, { ...body({ reads }), urgent: { reason } });
    expect(res.status).toBe(201);
    expect(res.body.examState).not.toBe("final"); // the second read is still to come
    for (const to of [s.lead.email, onCall]) {
      const mail = await waitForMail(to, "needs clinical follow-up");
      expect(mail.text).toContain(exam.code);
      expect(mail.text).toContain(reason);
      expect(mail.text).toContain("/oversight/follow-ups");
    }
    const notes = await request(kit.app)
      .get("/api/notifications")
      .set("Authorization", await auth(s.lead));
    expect(JSON.stringify(notes.body)).toContain(`Urgent: exam ${exam.code}`);
    const list = (
      await request(kit.app)
        .get("/api/follow-ups")
        .set("Authorization", await auth(s.lead))
    ).body.items as { examId: string; urgent: boolean; dueAt: string; createdAt: string; reason: string }[];
    const f = list.find((x) => x.examId === exam.id)!;
    expect(f.urgent).toBe(true);
    expect((Date.parse(f.dueAt) - Date.parse(f.createdAt)) / 3600_000).toBeCloseTo(6, 1);
    expect(await kit.db("reviews").where("exam_id", exam.id).first("urgent_reason")).toEqual({ urgent_reason: reason });

    // The second read agrees and settles the exam with the missed positive: the same follow-up carries both reasons.
    const b = await next(s.reviewers[1]);
    const second = await review(s.reviewers[1], b.body.assignment.id, body({ reads }));
    expect(second.status).toBe(201);
    expect(second.body.examState).toBe("final");
    const rows = await kit.db("follow_ups").where("exam_id", exam.id);
    expect(rows).toHaveLength(1);
    expect(rows[0].reason).toMatch(/Flagged while scoring[\s\S]*Clinically significant disagreement/);
  });
});

describe("closing a follow-up", () => {
  it("needs an outcome, a note for some outcomes, and records who acted and when; the Program report counts it", async () => {
    const s = await setup(1);
    const exam = await queued(s);
    const a = await next(s.reviewers[0]);
    await review(s.reviewers[0], a.body.assignment.id, { ...body(), urgent: { reason: "Possible pericardial effusion" } });
    const f = await kit.db("follow_ups").where("exam_id", exam.id).first();
    const patch = async (b: object) =>
      request(kit.app)
        .patch(`/api/follow-ups/${f.id}`)
        .set("Authorization", await auth(s.lead))
        .send(b);
    const noOutcome = await patch({ status: "closed", note: "Called" });
    expect(noOutcome.status).toBe(400);
    expect(noOutcome.body.error.message).toMatch(/^outcome: Choose the outcome/);
    const noNote = await patch({ status: "closed", outcome: "unable_to_contact" });
    expect(noNote.status).toBe(400);
    expect(noNote.body.error.message).toMatch(/^note: /);
    const future = await patch({ status: "closed", outcome: "patient_contacted", actedAt: new Date(Date.now() + 86400_000).toISOString() });
    expect(future.status).toBe(400);
    expect(future.body.error.message).toMatch(/^actedAt: /);
    expect(await kit.db("follow_ups").where("id", f.id).first("status")).toEqual({ status: "open" });

    const actedAt = new Date(Date.now() - 3600_000).toISOString();
    const ok = await patch({ status: "closed", outcome: "further_imaging_arranged", actedAt, actedBy: "Night registrar", note: "Formal echo booked" });
    expect(ok.status).toBe(200);
    const item = (
      await request(kit.app)
        .get("/api/follow-ups?status=closed")
        .set("Authorization", await auth(s.lead))
    ).body.items.find((x: { id: string }) => x.id === f.id);
    expect(item).toMatchObject({ outcome: "further_imaging_arranged", actedBy: "Night registrar", closedBy: s.lead.name, overdue: false });
    expect(Date.parse(item.actedAt)).toBe(Date.parse(actedAt));
    // The database holds the rule too: a closed follow-up has an outcome.
    await expect(kit.db("follow_ups").where("id", f.id).update({ outcome: null })).rejects.toThrow(/follow_ups_closed_has_outcome/);

    const report = await request(kit.app)
      .get("/api/reports/program")
      .set("Authorization", await auth(s.lead));
    expect(report.status).toBe(200);
    expect(report.body.followUps).toMatchObject({ byOutcome: [{ outcome: "further_imaging_arranged", count: 1 }], urgentClosed: 1, open: 0, closedLate: 0 });
    expect(report.body.followUps.medianHoursToClose).toBeGreaterThanOrEqual(0);
  });

  it("flags a follow-up past its due time as overdue and lists it first", async () => {
    const s = await setup(1);
    const exam = await queued(s);
    const a = await next(s.reviewers[0]);
    await review(s.reviewers[0], a.body.assignment.id, body({ reads: negatives().map((r) => (r.key === "free_fluid_luq" ? { ...r, read: "positive" } : r)) }));
    await kit
      .db("follow_ups")
      .where("exam_id", exam.id)
      .update({ due_at: new Date(Date.now() - 60_000) });
    const items = (
      await request(kit.app)
        .get("/api/follow-ups")
        .set("Authorization", await auth(s.lead))
    ).body.items;
    expect(items[0]).toMatchObject({ examId: exam.id, overdue: true, urgent: false });
    const report = await request(kit.app)
      .get("/api/reports/program")
      .set("Authorization", await auth(s.lead));
    expect(report.body.followUps).toMatchObject({ open: 1, openOverdue: 1 });
  });
});

describe("clinical turnaround", () => {
  it("makes clinical reads overdue by their own shorter target in the queue and the digest", async () => {
    const s = await setup(1);
    await updateSettings(kit.db, s.programId, { clinicalTurnaroundHours: 2, turnaroundHours: 72 });
    const clinical = await queued(s, { setting: "clinical" });
    const teaching = await queued(s, { setting: "educational" });
    await kit
      .db("assignments")
      .whereIn("exam_id", [clinical.id, teaching.id])
      .update({ due_at: new Date(Date.now() - 3 * 3600_000) });
    const overview = await request(kit.app)
      .get("/api/queue")
      .set("Authorization", await auth(s.reviewers[0]));
    const bySetting = Object.fromEntries(overview.body.waiting.map((w: { setting: string; overdue: boolean }) => [w.setting, w.overdue]));
    expect(bySetting).toEqual({ clinical: true, educational: false });
    await sendOverdueDigests(kit.db, "http://app.test");
    const mail = await waitForMail(s.reviewers[0].email, "waiting past the turnaround target");
    expect(mail.text).toMatch(/1 exam read\(s\)/);
    expect(mail.text).toContain("2 hours for clinical exams, 72 hours for the rest");
  });
});

describe("encounter reference", () => {
  it("is sealed at rest (not in pg_dump), shown to no one but a QA lead on a follow-up, and every reveal is audited", async () => {
    const s = await setup(1);
    const ref = `ENC-${Math.floor(Math.random() * 1e9)}`;
    const created = await request(kit.app)
      .post("/api/exams")
      .set("Authorization", await auth(s.sonographer))
      .send({ ...efastExamBody(), encounterRef: ref });
    expect(created.status).toBe(201);
    expect(created.body.exam.hasEncounterRef).toBe(true);
    expect(JSON.stringify(created.body)).not.toContain(ref);
    const examId = created.body.exam.id as string;
    // Bad input is named by its field and nothing is kept.
    const bad = await request(kit.app)
      .patch(`/api/exams/${examId}`)
      .set("Authorization", await auth(s.sonographer))
      .send({ encounterRef: "<script>" });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/^encounterRef: /);

    const row = await kit.db("exams").where("id", examId).first("encounter_ref_sealed");
    expect(row.encounter_ref_sealed).toMatch(/^v1:/);
    expect(row.encounter_ref_sealed).not.toContain(ref);
    // A plain-text dump of the whole database (PostgreSQL's own pg_dump) never holds it.
    const dump = execFileSync(path.join(pgBinDir(), "pg_dump"), ["--data-only", `--dbname=${kit.config.databaseUrl}`], {
      encoding: "utf8",
      maxBuffer: 1 << 30,
    });
    expect(dump).toContain(row.encounter_ref_sealed);
    expect(dump).not.toContain(ref);

    const [f] = await kit.db("follow_ups").insert({ program_id: s.programId, exam_id: examId, reason: "Callback" }).returning("id");
    const reveal = async (m: TestMember) =>
      request(kit.app)
        .post(`/api/follow-ups/${f.id}/encounter-reference`)
        .set("Authorization", await auth(m));
    expect((await reveal(s.reviewers[0])).status).toBe(403);
    expect((await reveal(s.sonographer)).status).toBe(403);
    const other = await setup(0);
    expect((await reveal(other.lead)).status).toBe(404);
    const listed = (
      await request(kit.app)
        .get("/api/follow-ups")
        .set("Authorization", await auth(s.lead))
    ).body.items.find((x: { id: string }) => x.id === f.id);
    expect(listed.hasEncounterRef).toBe(true);
    expect(JSON.stringify(listed)).not.toContain(ref);
    const opened = await reveal(s.lead);
    expect(opened.status).toBe(200);
    expect(opened.body).toEqual({ reference: ref });
    const audited = await kit.db("audit_log").where({ action: "follow_up.encounter_ref_revealed", entity_id: f.id });
    expect(audited).toHaveLength(1);
    expect(audited[0].actor_user_id).toBe(s.lead.id);
    // Moved to another exam's row, the sealed value does not open (the exam id is bound in).
    const [f2] = await kit
      .db("follow_ups")
      .insert({ program_id: s.programId, exam_id: (await queued(s)).id, reason: "Other" })
      .returning("id");
    await kit
      .db("exams")
      .where("id", (await kit.db("follow_ups").where("id", f2.id).first()).exam_id)
      .update({ encounter_ref_sealed: row.encounter_ref_sealed });
    const moved = await request(kit.app)
      .post(`/api/follow-ups/${f2.id}/encounter-reference`)
      .set("Authorization", await auth(s.lead));
    expect(moved.status).toBe(500);
    expect(moved.body.error.code).toBe("encounter_ref_unreadable");
  });
});
