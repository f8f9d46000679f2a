// The program's catalogue through the API (Setup → Applications): versions like rubrics (an
// exam recorded under version 1 keeps its views' and findings' labels everywhere after
// version 2 is published), an audit entry per change, who may change it, and refusals of an
// invalid catalogue that name the field. Expected labels come from the built-in catalogue
// (shared/catalogue.ts) and the default rubric (shared/rubric/default-rubric.ts).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { callAs, makeExam, makeKit, makeMember, makeProgram, type TestKit, type TestMember } from "./helpers";
import { queueSubmittedExam } from "../../server/services/queue";
import { DEFAULT_CATALOGUE } from "../../shared/catalogue";

let kit: TestKit;
beforeAll(() => {
  kit = makeKit();
});
afterAll(() => kit.close());

interface Setup {
  programId: string;
  lead: TestMember;
  admin: TestMember;
  reviewer: TestMember;
  clinician: TestMember;
}

async function setup(): Promise<Setup> {
  const p = await makeProgram(kit.db);
  return {
    programId: p.id,
    lead: await makeMember(kit.db, p.id, ["qa_lead"]),
    admin: await makeMember(kit.db, p.id, ["admin"]),
    reviewer: await makeMember(kit.db, p.id, ["reviewer"]),
    clinician: await makeMember(kit.db, p.id, ["sonographer"]),
  };
}

const call = (m: TestMember, method: "get" | "post" | "put", path: string, body?: object) => callAs(kit, m, method, path, body);

type Wire = {
  id: string;
  code: string;
  version: number;
  status: string;
  name: string;
  active: boolean;
  usualTransducers: string[];
  presets: string[];
  typicalDepthCm: [number, number];
  orientation: string;
  cautions: string[];
  views: { key: string; label: string; required: boolean; hint: string }[];
  findings: { key: string; label: string; hint: string }[];
};

/** The body that saves `app` unchanged, for tests to alter. */
const bodyOf = ({ id: _i, code: _c, version: _v, status: _s, publishedAt: _p, ...rest }: Wire & { publishedAt?: string }) => structuredClone(rest);

async function efastOf(s: Setup): Promise<Wire> {
  const res = await call(s.lead, "get", "/api/applications");
  expect(res.status).toBe(200);
  return res.body.applications.find((a: Wire) => a.code === "efast");
}

describe("GET /api/applications", () => {
  it("gives every member the version in use of each application, with the built-in catalogue as the starting copy", async () => {
    const s = await setup();
    const res = await call(s.clinician, "get", "/api/applications");
    expect(res.status).toBe(200);
    // helpers.ts makeProgram copies the first three built-in applications.
    expect(res.body.applications.map((a: Wire) => a.code)).toEqual(DEFAULT_CATALOGUE.slice(0, 3).map((a) => a.code));
    const efast = res.body.applications[0] as Wire;
    expect(efast).toMatchObject({ version: 1, status: "published", orientation: "screen_left", presets: ["Abdomen", "Lung"] });
    expect(efast.findings.map((f) => f.key)).toEqual(expect.arrayContaining(["hemothorax_right", "hemothorax_left"]));
    expect(efast.views.every((v) => v.required)).toBe(true);
    const cardiac = res.body.applications[1] as Wire;
    expect(cardiac.orientation).toBe("cardiology");
  });
});

describe("catalogue versions", () => {
  it("keeps an exam recorded under version 1 on version 1's labels after version 2 is published", async () => {
    const s = await setup();
    const v1 = await efastOf(s);
    const exam = await makeExam(kit.db, s.programId, s.clinician.id, { status: "submitted" });
    const keys = v1.findings.map((f) => f.key);
    await kit.db("exam_findings").insert(keys.map((key) => ({ exam_id: exam.id, finding_key: key, read: key === "free_fluid_ruq" ? "positive" : "negative" })));

    // Version 2: a finding relabelled, a view relabelled, a caution added.
    const body = bodyOf(v1);
    body.findings[0].label = "Hepatorenal free fluid";
    body.views[0].label = "Right flank (hepatorenal)";
    body.cautions.push("Repeat the study after any change in the patient's condition.");
    const saved = await call(s.lead, "put", `/api/applications/${v1.id}`, body);
    expect(saved.status, JSON.stringify(saved.body)).toBe(200);
    const v2 = saved.body.application as Wire;
    expect(v2.version).toBe(2);
    expect(v2.id).not.toBe(v1.id);
    expect(v2.findings[0].label).toBe("Hepatorenal free fluid");

    // The list now holds version 2; version 1 is archived and unchanged.
    expect((await efastOf(s)).id).toBe(v2.id);
    const old = await call(s.reviewer, "get", `/api/applications/${v1.id}`);
    expect(old.body.application).toMatchObject({ version: 1, status: "archived" });
    expect(old.body.application.findings[0].label).toBe("Free fluid, right upper quadrant");

    // The exam page names version 1; its version's labels are what the exam shows.
    const page = await call(s.clinician, "get", `/api/exams/${exam.id}`);
    expect(page.status).toBe(200);
    expect(page.body.exam.guide).toMatchObject({ applicationId: v1.id, version: 1 });
    expect(page.body.exam.guide.cautions).toEqual(v1.cautions);

    // The reviewer scores it under version 1's findings and views.
    await kit.db.transaction((trx) => queueSubmittedExam(trx, { id: exam.id, program_id: s.programId, setting: "clinical" }, 0));
    const claim = await call(s.reviewer, "post", "/api/queue/next", {});
    expect(claim.status, JSON.stringify(claim.body)).toBe(200);
    expect(claim.body.exam.findings[0]).toMatchObject({ key: "free_fluid_ruq", label: "Free fluid, right upper quadrant" });
    expect(claim.body.exam.guide).toMatchObject({ version: 1, orientation: "screen_left" });
    const scores = { transducer: "suitable", marker: "follows", depth: "fits", gain: "balanced", plane: "standard", labels: "complete", quality: "4" };
    const reads = keys.map((key) => ({ key, read: key === "free_fluid_ruq" ? "positive" : "negative" }));
    const review = await call(s.reviewer, "post", `/api/assignments/${claim.body.assignment.id}/review`, {
      scores,
      reads,
      feedback: "Good views.",
      timeSpentSeconds: 60,
    });
    expect(review.status, JSON.stringify(review.body)).toBe(201);

    // After the final result: the reviewer's page and the clinician's feedback keep version 1's label.
    const mine = await call(s.reviewer, "get", `/api/reviews/exams/${exam.id}`);
    expect(mine.body.myReview.reads[0]).toEqual({ key: "free_fluid_ruq", label: "Free fluid, right upper quadrant", read: "positive" });
    const feedback = await call(s.clinician, "get", `/api/me/feedback/${exam.id}`);
    expect(feedback.status, JSON.stringify(feedback.body)).toBe(200);
    expect(feedback.body.guide.version).toBe(1);
    expect(feedback.body.findings.find((f: { key: string }) => f.key === "free_fluid_ruq").label).toBe("Free fluid, right upper quadrant");

    // A new exam is recorded under version 2.
    const created = await call(s.clinician, "post", "/api/exams", {
      applicationCode: "efast",
      performedAt: new Date(Date.now() - 3600_000).toISOString(),
      setting: "educational",
      transducer: "curvilinear",
      preset: "Abdomen",
      indication: "Teaching scan",
      findings: [{ key: "free_fluid_ruq", read: "negative" }],
    });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    expect(created.body.exam.guide).toMatchObject({ applicationId: v2.id, version: 2 });

    // The history: two versions, one exam recorded under each.
    const history = await call(s.lead, "get", `/api/applications/${v2.id}/versions`);
    expect(history.body.versions.map((v: { version: number; status: string; examCount: number }) => [v.version, v.status, v.examCount])).toEqual([
      [2, "published", 1],
      [1, "archived", 1],
    ]);
  });

  it("writes an audit entry per change, and makes no version of a save that changes nothing", async () => {
    const s = await setup();
    const v1 = await efastOf(s);
    const same = await call(s.admin, "put", `/api/applications/${v1.id}`, bodyOf(v1));
    expect(same.status).toBe(200);
    expect(same.body.application.id).toBe(v1.id);

    const body = bodyOf(v1);
    body.active = false;
    const v2 = await call(s.admin, "put", `/api/applications/${v1.id}`, body);
    expect(v2.body.application).toMatchObject({ version: 2, active: false });

    const added = await call(s.lead, "post", "/api/applications", { ...body, code: "thyroid_teaching", name: "Thyroid (teaching)", active: true });
    expect(added.status, JSON.stringify(added.body)).toBe(201);
    expect(added.body.application).toMatchObject({ code: "thyroid_teaching", version: 1, status: "published" });

    const audit = await kit.db("audit_log").where("program_id", s.programId).where("action", "like", "application.%").orderBy("id");
    expect(audit.map((a) => [a.action, a.entity_id, a.details])).toEqual([
      ["application.new_version", v2.body.application.id, { code: "efast", from: 1, to: 2 }],
      ["application.created", added.body.application.id, { code: "thyroid_teaching", version: 1 }],
    ]);
    expect(audit[0].actor_user_id).toBe(s.admin.id);

    // An archived version cannot change.
    const again = await call(s.lead, "put", `/api/applications/${v1.id}`, bodyOf(v1));
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe("application_archived");
  });

  it("lets only a QA lead or an admin change the catalogue, and only their own program's", async () => {
    const s = await setup();
    const other = await setup();
    const v1 = await efastOf(s);
    for (const m of [s.reviewer, s.clinician]) {
      const res = await call(m, "put", `/api/applications/${v1.id}`, bodyOf(v1));
      expect(res.status).toBe(403);
    }
    const elsewhere = await call(other.lead, "put", `/api/applications/${v1.id}`, bodyOf(v1));
    expect(elsewhere.status).toBe(404);
    expect((await call(other.lead, "get", `/api/applications/${v1.id}`)).status).toBe(404);
    expect(await kit.db("applications").where({ program_id: s.programId, code: "efast" }).count("* as n").first()).toEqual({ n: "1" });
  });
});

describe("refusals of an invalid catalogue", () => {
  const refused = async (s: Setup, method: "put" | "post", path: string, body: object, field: string) => {
    const res = await call(s.lead, method, path, body);
    expect(res.status, JSON.stringify(res.body)).toBe(400);
    expect(res.body.error.code).toBe("validation_failed");
    expect(res.body.error.message.startsWith(`${field}:`), res.body.error.message).toBe(true);
    expect(res.body.error.details[0].path).toBe(field);
    return res;
  };

  it("names the finding without a label, the duplicate key and the upside-down depth range, and keeps version 1", async () => {
    const s = await setup();
    const v1 = await efastOf(s);
    const save = (body: object, field: string) => refused(s, "put", `/api/applications/${v1.id}`, body, field);

    const noLabel = bodyOf(v1);
    noLabel.findings[2].label = "  ";
    await save(noLabel, "findings.2.label");

    const duplicate = bodyOf(v1);
    duplicate.views[3].key = duplicate.views[1].key;
    const dup = await save(duplicate, "views.3.key");
    expect(dup.body.error.message).toContain(`"${v1.views[1].key}"`);

    const duplicateFinding = bodyOf(v1);
    duplicateFinding.findings.push({ ...duplicateFinding.findings[0], label: "Again" });
    await save(duplicateFinding, `findings.${v1.findings.length}.key`);

    const upsideDown = bodyOf(v1);
    upsideDown.typicalDepthCm = [20, 12];
    await save(upsideDown, "typicalDepthCm");

    const badKey = bodyOf(v1);
    badKey.views[0].key = "Right Upper";
    await save(badKey, "views.0.key");

    const noTransducer = bodyOf(v1);
    noTransducer.usualTransducers = [];
    await save(noTransducer, "usualTransducers");

    const noViews = bodyOf(v1);
    noViews.views = [];
    await save(noViews, "views");

    const badOrientation = { ...bodyOf(v1), orientation: "upside_down" };
    await save(badOrientation, "orientation");

    await refused(s, "post", "/api/applications", { ...bodyOf(v1), code: "Not A Code" }, "code");

    // Nothing was written: efast is still version 1 alone, and no audit entry exists.
    const rows = await kit.db("applications").where({ program_id: s.programId, code: "efast" }).select("version", "status");
    expect(rows).toEqual([{ version: 1, status: "published" }]);
    expect(await kit.db("audit_log").where("program_id", s.programId).where("action", "like", "application.%")).toEqual([]);
  });

  it("refuses a new application whose code is taken, naming the code", async () => {
    const s = await setup();
    const v1 = await efastOf(s);
    const res = await call(s.lead, "post", "/api/applications", { ...bodyOf(v1), code: "efast" });
    expect(res.status).toBe(409);
    expect(res.body.error).toMatchObject({ code: "application_code_taken", details: [{ path: "code", message: expect.stringContaining("efast") }] });
  });
});
