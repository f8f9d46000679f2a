// Input PostgreSQL cannot store must be refused up front as 400 validation_failed naming the
// field, never reach a query and come back as a 500: NUL characters (PostgreSQL refuses
// U+0000 in text and jsonb: "Character type" and "JSON types" chapters of its manual),
// unpaired UTF-16 surrogates bound for jsonb (RFC 8259 section 8.2: such strings are not
// interoperable; PostgreSQL's jsonb refuses them) and dates outside 1900–2100 (PostgreSQL has
// no year 0). A generated sweep sends NUL to every string field of every JSON route.
import crypto from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { makeExam, makeKit, makeMember, makeProgram, tokenFor, type TestKit, type TestMember } from "./helpers";
import { ROLES } from "../../shared/roles";

let kit: TestKit;
let programId: string;
let sono: TestMember;
let reviewer: TestMember;
let everyRole: TestMember;
const bearer = async (m: TestMember) => `Bearer ${await tokenFor(kit, m)}`;
beforeAll(async () => {
  kit = makeKit({ LOGIN_RATE_MAX: "10000" });
  programId = (await makeProgram(kit.db)).id;
  sono = await makeMember(kit.db, programId, ["sonographer"]);
  reviewer = await makeMember(kit.db, programId, ["reviewer"]);
  everyRole = await makeMember(kit.db, programId, [...ROLES]);
});
afterAll(() => kit.close());

const examBody = (over: object = {}) => ({
  applicationCode: "efast",
  performedAt: new Date(Date.now() - 60_000).toISOString(),
  setting: "clinical",
  transducer: "curvilinear",
  findings: [],
  ...over,
});

async function claimedAssignment() {
  const exam = await makeExam(kit.db, programId, sono.id, { status: "submitted" });
  const rubric = await kit.db("rubrics").where({ program_id: programId, status: "published" }).first("id");
  const [a] = await kit
    .db("assignments")
    .insert({
      program_id: programId,
      exam_id: exam.id,
      kind: "primary",
      state: "claimed",
      due_at: new Date(),
      rubric_id: rubric.id,
      reviewer_id: reviewer.id,
      claimed_at: new Date(),
      lease_expires_at: new Date(Date.now() + 600_000),
    })
    .returning("id");
  return a.id as string;
}

describe("NUL characters and unpaired surrogates", () => {
  it("refuses NUL in a stored string of a JSON body with 400 naming the field", async () => {
    const res = await request(kit.app)
      .post("/api/exams")
      .set("Authorization", await bearer(sono))
      .send(examBody({ indication: "chest\u0000pain" }));
    expect(res.status, JSON.stringify(res.body)).toBe(400);
    expect(res.body.error.code).toBe("validation_failed");
    expect(res.body.error.message).toMatch(/^indication: .*NUL/);
  });

  it("refuses NUL in a query parameter with 400 naming it", async () => {
    const res = await request(kit.app)
      .get("/api/exams?application=ef%00ast")
      .set("Authorization", await bearer(sono));
    expect(res.status, JSON.stringify(res.body)).toBe(400);
    expect(res.body.error.message).toMatch(/^application: /);
  });

  it("refuses an unpaired surrogate bound for a jsonb column, in a value and in a key", async () => {
    const id = await claimedAssignment();
    const auth = await bearer(reviewer);
    for (const raw of ['{"scores":{"quality":"\\ud800"}}', '{"scores":{"\\udc00x":"3"}}']) {
      const res = await request(kit.app).put(`/api/assignments/${id}/draft`).set("Authorization", auth).set("Content-Type", "application/json").send(raw);
      expect(res.status, `${raw} → ${JSON.stringify(res.body)}`).toBe(400);
      expect(res.body.error.code).toBe("validation_failed");
      expect(res.body.error.message).toMatch(/^scores\.(quality|\\udc00x): .*surrogate/);
    }
    // A well-formed pair (an emoji) is fine.
    const ok = await request(kit.app)
      .put(`/api/assignments/${id}/draft`)
      .set("Authorization", auth)
      .send({ scores: { quality: "3" }, feedback: "Good \ud83d\udc4d" });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
  });
});

describe("dates outside 1900–2100", () => {
  it("refuses year 0000 and 2101 in list and report ranges with 400 naming the field", async () => {
    const cases: [string, string, TestMember][] = [
      ["/api/exams?from=0000-01-01", "from", sono],
      ["/api/exams?to=2101-01-01", "to", sono],
      ["/api/me/progress?from=0000-01-01", "from", sono],
      ["/api/reports/agreement?from=0000-06-01", "from", everyRole],
      ["/api/reports/program?to=0000-06-01", "to", everyRole],
    ];
    for (const [url, field, who] of cases) {
      const res = await request(kit.app)
        .get(url)
        .set("Authorization", await bearer(who));
      expect(res.status, `${url} → ${JSON.stringify(res.body)}`).toBe(400);
      expect(res.body.error.message).toMatch(new RegExp(`^${field}: `));
    }
    const fine = await request(kit.app)
      .get("/api/exams?from=1999-12-31&to=2100-12-31")
      .set("Authorization", await bearer(sono));
    expect(fine.status).toBe(200);
  });

  it("refuses a performedAt in year 0000", async () => {
    const res = await request(kit.app)
      .post("/api/exams")
      .set("Authorization", await bearer(sono))
      .send(examBody({ performedAt: "0000-01-01T00:00:00Z" }));
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/^performedAt: /);
  });
});

// A JSON Schema (as the OpenAPI document publishes it) turned into a plausible value.
type Schema = {
  type?: string | string[];
  enum?: unknown[];
  const?: unknown;
  format?: string;
  minLength?: number;
  minimum?: number;
  minItems?: number;
  items?: Schema;
  properties?: Record<string, Schema>;
  required?: string[];
  anyOf?: Schema[];
  oneOf?: Schema[];
  allOf?: Schema[];
  default?: unknown;
};
const typeOf = (s: Schema) => (Array.isArray(s.type) ? s.type.find((t) => t !== "null") : s.type);
const pick = (s: Schema): Schema => (s.anyOf ?? s.oneOf ?? s.allOf)?.find((x) => typeOf(x) !== "null") ?? s;

function sample(schema: Schema): unknown {
  const s = pick(schema);
  if (s.const !== undefined) return s.const;
  if (s.enum) return s.enum[0];
  switch (typeOf(s)) {
    case "string":
      if (s.format === "uuid") return crypto.randomUUID();
      if (s.format === "date") return "2026-01-01";
      if (s.format === "date-time") return new Date(Date.now() - 60_000).toISOString();
      if (s.format === "email") return `sweep-${crypto.randomBytes(3).toString("hex")}@test.example`;
      return "x".repeat(Math.max(s.minLength ?? 0, 12));
    case "integer":
    case "number":
      return s.minimum ?? 1;
    case "boolean":
      return true;
    case "array":
      return s.minItems && s.items ? Array.from({ length: s.minItems }, () => sample(s.items!)) : [];
    case "object":
      return Object.fromEntries(Object.entries(s.properties ?? {}).map(([k, v]) => [k, sample(v)]));
    default:
      return "x";
  }
}

/** Paths (in a sampled value) of the free-text string fields a schema has. */
function stringPaths(schema: Schema, at: string[] = []): string[][] {
  const s = pick(schema);
  if (s.enum || s.const !== undefined) return [];
  const t = typeOf(s);
  if (t === "string" && !s.format) return [at];
  if (t === "object") return Object.entries(s.properties ?? {}).flatMap(([k, v]) => stringPaths(v, [...at, k]));
  if (t === "array" && s.items && s.minItems) return stringPaths(s.items, [...at, "0"]);
  return [];
}

function setAt(value: unknown, path: string[], v: unknown) {
  let o = value as Record<string, unknown>;
  for (const k of path.slice(0, -1)) o = o[k] as Record<string, unknown>;
  o[path[path.length - 1]] = v;
}

describe("generated sweep: NUL in every string field of every route", () => {
  it("answers 400 validation_failed, never 500, for NUL in each body and query string", async () => {
    const doc = (await request(kit.app).get("/api/openapi.json")).body as {
      paths: Record<
        string,
        Record<string, { requestBody?: { content: Record<string, { schema: Schema }> }; parameters?: { in: string; name: string; schema: Schema }[] }>
      >;
    };
    const auth = await bearer(everyRole);
    const tried: string[] = [];
    const wrong: string[] = [];
    for (const [template, ops] of Object.entries(doc.paths)) {
      for (const [method, op] of Object.entries(ops)) {
        const url = template.replace(/\{(\w+)\}/g, (_m, name: string) =>
          name === "token" ? "y".repeat(43) : name === "variant" ? "video" : crypto.randomUUID(),
        );
        const bodySchema = op.requestBody?.content["application/json"]?.schema;
        const probes: { label: string; query?: string; body?: unknown }[] = [];
        if (bodySchema) {
          for (const p of stringPaths(bodySchema)) {
            const body = sample(bodySchema);
            setAt(body, p, "nul\u0000here-and-long-enough");
            probes.push({ label: `body ${p.join(".")}`, body });
          }
        }
        for (const q of op.parameters?.filter((x) => x.in === "query") ?? []) {
          probes.push({ label: `query ${q.name}`, query: `${q.name}=nul%00here` });
        }
        for (const probe of probes) {
          const agent = request(kit.app);
          const call = agent[method as "get"](url + (probe.query ? `?${probe.query}` : "")).set("Authorization", auth);
          const res = probe.body !== undefined ? await call.send(probe.body as object) : await call;
          const what = `${method.toUpperCase()} ${template} ${probe.label}`;
          tried.push(what);
          if (res.status !== 400 || res.body.error?.code !== "validation_failed")
            wrong.push(`${what} → ${res.status} ${JSON.stringify(res.body).slice(0, 160)}`);
        }
      }
    }
    expect(tried.length).toBeGreaterThan(20);
    expect(wrong).toEqual([]);
  });
});
