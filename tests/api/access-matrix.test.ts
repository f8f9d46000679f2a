// The role-by-route matrix: every API route, called by anonymous and by each role, gets the
// status written here. A route added without a row here fails the coverage check.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { makeClip, makeExam, makeKit, makeMember, makeProgram, tokenFor, type TestKit, type TestMember } from "./helpers";
import { ROLES, type Role } from "../../shared/roles";
import { newEmailToken } from "../../server/auth/tokens";
import { insertRubric } from "../../server/repositories/rubrics";
import { getApplication } from "../../server/repositories/applications";
import { DEFAULT_CRITERIA } from "../../shared/rubric/default-rubric";

type Who = "anonymous" | Role;
const WHO: Who[] = ["anonymous", ...ROLES];

let kit: TestKit;
let programId: string;
let members: Record<Role, TestMember>;
beforeAll(async () => {
  kit = makeKit({ LOGIN_RATE_MAX: "1000" });
  programId = (await makeProgram(kit.db)).id;
  members = {} as Record<Role, TestMember>;
  for (const r of ROLES) members[r] = await makeMember(kit.db, programId, [r]);
});
afterAll(() => kit.close());

const target = () => makeMember(kit.db, programId, ["sonographer"]);
const openInvitation = async () => {
  const [row] = await kit
    .db("invitations")
    .insert({
      program_id: programId,
      email: `inv-${Math.random().toString(36).slice(2)}@test.example`,
      roles: ["reviewer"],
      token_hash: newEmailToken().hash,
      expires_at: new Date(Date.now() + 3600_000),
    })
    .returning("id");
  return row.id as string;
};

interface Row {
  route: string;
  /** Builds the request path and body; runs before each call so destructive calls get fresh targets. */
  call: () => Promise<{ path: string; body?: object }>;
  expect: Record<Who, number>;
}

const everyone = (status: number): Record<Who, number> => ({ anonymous: status, sonographer: status, reviewer: status, qa_lead: status, admin: status });
const signedIn = (status: number): Record<Who, number> => ({ anonymous: 401, sonographer: status, reviewer: status, qa_lead: status, admin: status });
const only = (allowed: Role[], status: number): Record<Who, number> =>
  Object.fromEntries(WHO.map((w) => [w, w === "anonymous" ? 401 : allowed.includes(w as Role) ? status : 403])) as Record<Who, number>;

const fixed = (path: string, body?: object) => async () => ({ path, body });
// Exams and clips belong to members.sonographer; "own" = that sonographer, the others are
// not the owner (so a role that passes the route's role gate still meets the exam policy).
const ownExam = () => makeExam(kit.db, programId, members.sonographer.id);
const ownClip = async (state: "queued" | "ready" = "queued") => makeClip(kit, await ownExam(), state);
const examBody = () => ({
  applicationCode: "efast",
  performedAt: new Date(Date.now() - 60_000).toISOString(),
  setting: "clinical",
  transducer: "curvilinear",
  findings: [],
});
const claimed = async (state: "open" | "claimed" = "claimed") => {
  const exam = await makeExam(kit.db, programId, members.sonographer.id, { status: "submitted" });
  const rubric = await kit.db("rubrics").where({ program_id: programId, status: "published" }).first("id");
  const [a] = await kit
    .db("assignments")
    .insert({
      program_id: programId,
      exam_id: exam.id,
      kind: "primary",
      state,
      due_at: new Date(),
      rubric_id: rubric.id,
      ...(state === "claimed" ? { reviewer_id: members.reviewer.id, claimed_at: new Date(), lease_expires_at: new Date(Date.now() + 600_000) } : {}),
    })
    .returning("id");
  return { examId: exam.id, id: a.id as string };
};
const draftRubric = async () =>
  kit.db.transaction((trx) => insertRubric(trx, { programId, version: 1, name: "Matrix draft", status: "draft", criteria: DEFAULT_CRITERIA.slice(0, 2) }));
/** The program's published aorta application and the body that saves it unchanged (no new version). */
const aortaApp = async () => {
  const row = await kit.db("applications").where({ program_id: programId, code: "aorta", status: "published" }).first("id");
  const app = (await getApplication(kit.db, programId, row.id))!;
  const { id: _i, code: _c, version: _v, status: _s, publishedAt: _p, ...body } = app;
  return { id: app.id, body };
};
const rubricBody = { name: "Matrix rubric", criteria: DEFAULT_CRITERIA.slice(0, 2) };
const followUp = async () => {
  const exam = await makeExam(kit.db, programId, members.sonographer.id, { status: "submitted" });
  const [f] = await kit.db("follow_ups").insert({ program_id: programId, exam_id: exam.id, reason: "matrix" }).returning("id");
  return f.id as string;
};
const snippet = async () => (await kit.db("snippets").insert({ program_id: programId, text: "Matrix snippet" }).returning("id"))[0].id as string;
const ownerOr = (owner: number, leadStatus: number, others: number): Record<Who, number> => ({
  anonymous: 401,
  sonographer: owner,
  reviewer: others,
  qa_lead: leadStatus,
  admin: others,
});

const MATRIX: Row[] = [
  { route: "GET /health", call: fixed("/api/health"), expect: everyone(200) },
  { route: "GET /openapi.json", call: fixed("/api/openapi.json"), expect: everyone(200) },
  { route: "POST /auth/login", call: fixed("/api/auth/login", { email: "nobody@test.example", password: "wrong" }), expect: everyone(401) },
  { route: "POST /auth/logout", call: fixed("/api/auth/logout"), expect: signedIn(204) },
  { route: "GET /auth/me", call: fixed("/api/auth/me"), expect: signedIn(200) },
  { route: "POST /auth/password/forgot", call: fixed("/api/auth/password/forgot", { email: "nobody@test.example" }), expect: everyone(202) },
  {
    route: "POST /auth/password/reset",
    call: fixed("/api/auth/password/reset", { token: "x".repeat(43), password: "long-enough-password" }),
    expect: everyone(400),
  },
  {
    route: "POST /auth/password/change",
    call: fixed("/api/auth/password/change", { currentPassword: "wrong-one", newPassword: "long-enough-password" }),
    expect: signedIn(400),
  },
  { route: "GET /auth/invitations/:token", call: fixed(`/api/auth/invitations/${"y".repeat(43)}`), expect: everyone(404) },
  {
    route: "POST /auth/invitations/accept",
    call: fixed("/api/auth/invitations/accept", { token: "y".repeat(43), name: "A Person", password: "long-enough-password" }),
    expect: everyone(404),
  },
  { route: "GET /auth/programs", call: fixed("/api/auth/programs"), expect: signedIn(200) },
  // Each member here belongs to one program only: switching to another is refused.
  { route: "POST /auth/switch-program", call: fixed("/api/auth/switch-program", { programId: "00000000-0000-4000-8000-000000000000" }), expect: signedIn(404) },
  { route: "GET /home", call: fixed("/api/home"), expect: signedIn(200) },
  { route: "GET /applications", call: fixed("/api/applications"), expect: signedIn(200) },
  { route: "GET /applications/:id", call: async () => ({ path: `/api/applications/${(await aortaApp()).id}` }), expect: signedIn(200) },
  { route: "GET /applications/:id/versions", call: async () => ({ path: `/api/applications/${(await aortaApp()).id}/versions` }), expect: signedIn(200) },
  {
    route: "POST /applications",
    call: async () => ({ path: "/api/applications", body: { ...(await aortaApp()).body, code: `matrix_${Math.random().toString(36).slice(2, 10)}` } }),
    expect: only(["qa_lead", "admin"], 201),
  },
  {
    route: "PUT /applications/:id",
    call: async () => {
      const app = await aortaApp();
      return { path: `/api/applications/${app.id}`, body: app.body };
    },
    expect: only(["qa_lead", "admin"], 200),
  },
  { route: "GET /users", call: fixed("/api/users"), expect: only(["admin", "qa_lead"], 200) },
  { route: "GET /users/invitations", call: fixed("/api/users/invitations"), expect: only(["admin"], 200) },
  {
    route: "POST /users/invitations",
    call: async () => ({ path: "/api/users/invitations", body: { email: `new-${Math.random().toString(36).slice(2)}@test.example`, roles: ["sonographer"] } }),
    expect: only(["admin"], 201),
  },
  { route: "DELETE /users/invitations/:id", call: async () => ({ path: `/api/users/invitations/${await openInvitation()}` }), expect: only(["admin"], 204) },
  {
    route: "PUT /users/:id/roles",
    call: async () => ({ path: `/api/users/${(await target()).id}/roles`, body: { roles: ["reviewer"] } }),
    expect: only(["admin"], 200),
  },
  {
    route: "PUT /users/:id/dicom-operator-names",
    call: async () => ({
      path: `/api/users/${(await target()).id}/dicom-operator-names`,
      body: { names: [`Matrix^${Math.random().toString(36).slice(2, 8)}`] },
    }),
    expect: only(["admin", "qa_lead"], 200),
  },
  { route: "POST /users/:id/deactivate", call: async () => ({ path: `/api/users/${(await target()).id}/deactivate` }), expect: only(["admin"], 200) },
  { route: "POST /users/:id/reactivate", call: async () => ({ path: `/api/users/${(await target()).id}/reactivate` }), expect: only(["admin"], 200) },
  { route: "GET /audit", call: fixed("/api/audit"), expect: only(["admin"], 200) },
  { route: "POST /exams", call: async () => ({ path: "/api/exams", body: examBody() }), expect: only(["sonographer"], 201) },
  { route: "GET /exams", call: fixed("/api/exams"), expect: only(["sonographer"], 200) },
  { route: "GET /exams/:id", call: async () => ({ path: `/api/exams/${(await ownExam()).id}` }), expect: ownerOr(200, 200, 404) },
  {
    route: "PATCH /exams/:id",
    call: async () => ({ path: `/api/exams/${(await ownExam()).id}`, body: { indication: "Hypotension" } }),
    expect: only(["sonographer"], 200),
  },
  // A draft without clips cannot be submitted: the owner passes every check but that one.
  {
    route: "POST /exams/:id/submit",
    call: async () => ({ path: `/api/exams/${(await ownExam()).id}/submit`, body: { attestNoIdentifiers: true } }),
    expect: only(["sonographer"], 409),
  },
  { route: "DELETE /exams/:id", call: async () => ({ path: `/api/exams/${(await ownExam()).id}` }), expect: only(["sonographer"], 204) },
  // Multipart without a file: the owner gets as far as validation.
  { route: "POST /exams/:id/clips", call: async () => ({ path: `/api/exams/${(await ownExam()).id}/clips` }), expect: only(["sonographer"], 400) },
  { route: "PATCH /clips/:id", call: async () => ({ path: `/api/clips/${(await ownClip()).id}`, body: { view: "ruq" } }), expect: only(["sonographer"], 200) },
  { route: "POST /clips/:id/retry", call: async () => ({ path: `/api/clips/${(await ownClip()).id}/retry` }), expect: only(["sonographer"], 409) },
  { route: "DELETE /clips/:id", call: async () => ({ path: `/api/clips/${(await ownClip()).id}` }), expect: only(["sonographer"], 204) },
  {
    route: "GET /clips/:id/media/:variant",
    call: async () => ({ path: `/api/clips/${(await ownClip("ready")).id}/media/video` }),
    expect: ownerOr(200, 200, 404),
  },
  { route: "GET /queue", call: fixed("/api/queue"), expect: only(["reviewer"], 200) },
  // The matrix program has nothing submitted for this reviewer to claim.
  { route: "POST /queue/next", call: fixed("/api/queue/next", {}), expect: only(["reviewer"], 204) },
  { route: "GET /assignments/:id", call: async () => ({ path: `/api/assignments/${(await claimed()).id}` }), expect: only(["reviewer"], 200) },
  {
    route: "PUT /assignments/:id/draft",
    call: async () => ({ path: `/api/assignments/${(await claimed()).id}/draft`, body: { scores: { quality: "3" } } }),
    expect: only(["reviewer"], 200),
  },
  { route: "POST /assignments/:id/release", call: async () => ({ path: `/api/assignments/${(await claimed()).id}/release` }), expect: only(["reviewer"], 204) },
  // Empty scores: the holder of the claim gets as far as validation.
  {
    route: "POST /assignments/:id/review",
    call: async () => ({ path: `/api/assignments/${(await claimed()).id}/review`, body: { scores: {} } }),
    expect: only(["reviewer"], 400),
  },
  {
    route: "POST /assignments/:id/reassign",
    call: async () => ({ path: `/api/assignments/${(await claimed("open")).id}/reassign`, body: { reviewerId: members.reviewer.id } }),
    expect: only(["qa_lead"], 200),
  },
  { route: "GET /adjudications", call: fixed("/api/adjudications"), expect: only(["qa_lead", "reviewer"], 200) },
  {
    route: "POST /exams/:id/adjudicate",
    call: async () => ({ path: `/api/exams/${(await claimed("open")).examId}/adjudicate`, body: { scores: {} } }),
    expect: only(["qa_lead", "reviewer"], 409),
  },
  { route: "GET /follow-ups", call: fixed("/api/follow-ups"), expect: only(["qa_lead"], 200) },
  // The matrix's follow-up has no encounter reference: a QA lead gets as far as 404.
  {
    route: "POST /follow-ups/:id/encounter-reference",
    call: async () => ({ path: `/api/follow-ups/${await followUp()}/encounter-reference` }),
    expect: only(["qa_lead"], 404),
  },
  {
    route: "PATCH /follow-ups/:id",
    call: async () => ({ path: `/api/follow-ups/${await followUp()}`, body: { status: "in_progress" } }),
    expect: only(["qa_lead"], 200),
  },
  { route: "GET /snippets", call: fixed("/api/snippets"), expect: only(["qa_lead", "reviewer"], 200) },
  { route: "POST /snippets", call: fixed("/api/snippets", { text: "Fill the screen with the target." }), expect: only(["qa_lead"], 201) },
  { route: "DELETE /snippets/:id", call: async () => ({ path: `/api/snippets/${await snippet()}` }), expect: only(["qa_lead"], 204) },
  { route: "GET /settings", call: fixed("/api/settings"), expect: only(["qa_lead", "admin"], 200) },
  { route: "PATCH /settings", call: fixed("/api/settings", { turnaroundHours: 48 }), expect: only(["qa_lead", "admin"], 200) },
  { route: "GET /rubrics", call: fixed("/api/rubrics"), expect: only(["qa_lead", "reviewer"], 200) },
  { route: "GET /rubrics/:id", call: async () => ({ path: `/api/rubrics/${await draftRubric()}` }), expect: only(["qa_lead", "reviewer"], 200) },
  { route: "POST /rubrics", call: fixed("/api/rubrics", rubricBody), expect: only(["qa_lead"], 201) },
  { route: "PUT /rubrics/:id", call: async () => ({ path: `/api/rubrics/${await draftRubric()}`, body: rubricBody }), expect: only(["qa_lead"], 200) },
  { route: "POST /rubrics/:id/publish", call: async () => ({ path: `/api/rubrics/${await draftRubric()}/publish` }), expect: only(["qa_lead"], 200) },
  { route: "POST /rubrics/:id/archive", call: async () => ({ path: `/api/rubrics/${await draftRubric()}/archive` }), expect: only(["qa_lead"], 200) },
  { route: "GET /me/feedback", call: fixed("/api/me/feedback"), expect: only(["sonographer"], 200) },
  // A draft has no feedback yet.
  { route: "GET /me/feedback/:id", call: async () => ({ path: `/api/me/feedback/${(await ownExam()).id}` }), expect: only(["sonographer"], 404) },
  { route: "POST /exams/:id/acknowledge", call: async () => ({ path: `/api/exams/${(await ownExam()).id}/acknowledge` }), expect: only(["sonographer"], 404) },
  // Questions open once feedback is final: those who may see the exam meet 409, others 404.
  {
    route: "POST /exams/:id/messages",
    call: async () => ({ path: `/api/exams/${(await ownExam()).id}/messages`, body: { body: "Why?" } }),
    expect: ownerOr(409, 409, 404),
  },
  { route: "GET /exams/:id/messages", call: async () => ({ path: `/api/exams/${(await ownExam()).id}/messages` }), expect: ownerOr(200, 200, 404) },
  { route: "GET /reviews/questions", call: fixed("/api/reviews/questions"), expect: only(["reviewer", "qa_lead"], 200) },
  // A reviewer who did not read the exam meets 404, like the exam policy; a QA lead sees any exam of the program.
  {
    route: "GET /reviews/exams/:id",
    call: async () => ({ path: `/api/reviews/exams/${(await ownExam()).id}` }),
    expect: { anonymous: 401, sonographer: 403, reviewer: 404, qa_lead: 200, admin: 403 },
  },
  { route: "GET /reports/agreement", call: fixed("/api/reports/agreement"), expect: only(["qa_lead", "admin"], 200) },
  { route: "GET /reports/program", call: fixed("/api/reports/program"), expect: only(["qa_lead", "admin"], 200) },
  // One exam is too few for a calibration set: the QA lead gets as far as validation.
  {
    route: "POST /calibration-sets",
    call: async () => ({ path: "/api/calibration-sets", body: { name: "Matrix", exams: [{ examId: (await claimed("open")).examId }] } }),
    expect: only(["qa_lead"], 400),
  },
  { route: "GET /calibration-sets", call: fixed("/api/calibration-sets"), expect: only(["qa_lead"], 200) },
  {
    route: "GET /calibration-sets/exams/:id",
    call: async () => ({ path: `/api/calibration-sets/exams/${(await makeExam(kit.db, programId, members.sonographer.id, { status: "submitted" })).id}` }),
    expect: only(["qa_lead"], 200),
  },
  {
    route: "GET /calibration-sets/:id/results",
    call: fixed("/api/calibration-sets/00000000-0000-4000-8000-000000000000/results"),
    expect: only(["qa_lead"], 404),
  },
  { route: "GET /reports/credentialing", call: fixed("/api/reports/credentialing?format=csv"), expect: only(["sonographer", "qa_lead"], 200) },
  { route: "GET /me/progress", call: fixed("/api/me/progress"), expect: only(["sonographer"], 200) },
  { route: "GET /roster", call: fixed("/api/roster"), expect: only(["qa_lead"], 200) },
  { route: "GET /dicom-inbox", call: fixed("/api/dicom-inbox"), expect: only(["sonographer", "qa_lead", "admin"], 200) },
  {
    route: "GET /dicom-inbox/:id/objects/:objectId/preview",
    call: fixed("/api/dicom-inbox/00000000-0000-4000-8000-000000000000/objects/00000000-0000-4000-8000-000000000000/preview"),
    expect: only(["sonographer", "qa_lead", "admin"], 404),
  },
  { route: "POST /dicom-inbox/:id/claim", call: fixed("/api/dicom-inbox/00000000-0000-4000-8000-000000000000/claim"), expect: only(["sonographer"], 404) },
  {
    route: "POST /dicom-inbox/:id/exam",
    call: async () => ({ path: "/api/dicom-inbox/00000000-0000-4000-8000-000000000000/exam", body: examBody() }),
    expect: only(["sonographer"], 404),
  },
  { route: "GET /roster/:id/progress", call: async () => ({ path: `/api/roster/${members.sonographer.id}/progress` }), expect: only(["qa_lead"], 200) },
  { route: "GET /roster/:id/feedback", call: async () => ({ path: `/api/roster/${members.sonographer.id}/feedback` }), expect: only(["qa_lead"], 200) },
  // The exam's sonographer and a QA lead; a reviewer without an assignment meets the role gate.
  {
    route: "GET /exams/:id/confirmations",
    call: async () => ({ path: `/api/exams/${(await ownExam()).id}/confirmations` }),
    expect: { anonymous: 401, sonographer: 200, reviewer: 403, qa_lead: 200, admin: 403 },
  },
  // A draft takes no confirmatory results yet.
  {
    route: "PUT /exams/:id/confirmations",
    call: async () => ({ path: `/api/exams/${(await ownExam()).id}/confirmations`, body: { items: [] } }),
    expect: { anonymous: 401, sonographer: 409, reviewer: 403, qa_lead: 409, admin: 403 },
  },
  { route: "GET /notifications", call: fixed("/api/notifications"), expect: signedIn(200) },
  { route: "POST /notifications/read", call: fixed("/api/notifications/read", {}), expect: signedIn(204) },
];
describe("role-by-route matrix", () => {
  it("has a row for every route the app serves, and no row for a route it does not", () => {
    const served = kit.routes.map((r) => `${r.method} ${r.path}`).sort();
    expect(MATRIX.map((r) => r.route).sort()).toEqual(served);
  });

  for (const row of MATRIX) {
    for (const who of WHO) {
      it(`${row.route} as ${who} → ${row.expect[who]}`, async () => {
        const { path, body } = await row.call();
        const [method] = row.route.split(" ");
        let req = request(kit.app)[method.toLowerCase() as "get"](path);
        if (who !== "anonymous") req = req.set("Authorization", `Bearer ${await tokenFor(kit, members[who])}`);
        const res = body ? await req.send(body) : await req;
        expect(res.status, JSON.stringify(res.body)).toBe(row.expect[who]);
      });
    }
  }
});
