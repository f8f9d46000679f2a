// The role-by-route matrix: every API route, called by anonymous and by each role, gets the
// status written here. A route added without a row here fails the coverage check.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { makeClip, makeExam, makeKit, makeMember, makeProgram, tokenFor, type TestKit, type TestMember } from "./helpers";
import { ROLES, type Role } from "../../shared/roles";
import { newEmailToken } from "../../server/auth/tokens";

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
