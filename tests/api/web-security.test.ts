// Browser-facing hardening: cross-site state changes with the session cookie are refused
// (Fetch Metadata, W3C "Fetch Metadata Request Headers"; Origin, RFC 6454 section 7), the
// Content Security Policy keeps styles and fonts to the app's own files (CSP Level 3), and
// HSTS is only sent over HTTPS (RFC 6797 section 7.2: not over plain HTTP).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { makeExam, makeKit, makeMember, makeProgram, tokenFor, TEST_PASSWORD, type TestKit, type TestMember } from "./helpers";
import { SESSION_COOKIE } from "../../server/auth/tokens";

const APP_URL = "http://soundings.test.example:8080";
const FOREIGN = "https://elsewhere.example";
let kit: TestKit;
let sono: TestMember;
let cookie: string;
beforeAll(async () => {
  kit = makeKit({ APP_URL, LOGIN_RATE_MAX: "1000" });
  const programId = (await makeProgram(kit.db)).id;
  sono = await makeMember(kit.db, programId, ["sonographer"]);
  cookie = `${SESSION_COOKIE}=${await tokenFor(kit, sono)}`;
});
afterAll(() => kit.close());

describe("cross-site requests with the session cookie", () => {
  const read = () => request(kit.app).post("/api/notifications/read").set("Cookie", cookie);

  it("refuses a foreign Origin or Sec-Fetch-Site: cross-site with 403 cross_site_request", async () => {
    for (const [header, value] of [
      ["Origin", FOREIGN],
      ["Origin", "null"],
      ["Sec-Fetch-Site", "cross-site"],
    ]) {
      const res = await read().set(header, value);
      expect(res.status, `${header}: ${value}`).toBe(403);
      expect(res.body.error.code).toBe("cross_site_request");
    }
  });

  it("accepts the app's own origin, the request's own host, and requests without Origin", async () => {
    expect((await read().set("Origin", APP_URL).set("Sec-Fetch-Site", "same-origin")).status).toBe(204);
    const host = await request(kit.app)
      .post("/api/notifications/read")
      .set("Cookie", cookie)
      .set("Host", "10.0.0.5:3000")
      .set("Origin", "http://10.0.0.5:3000");
    expect(host.status).toBe(204);
    expect((await read()).status).toBe(204);
  });

  it("leaves bearer-token clients alone (another site cannot add that header)", async () => {
    const res = await request(kit.app)
      .post("/api/notifications/read")
      .set("Authorization", `Bearer ${await tokenFor(kit, sono)}`)
      .set("Origin", FOREIGN);
    expect(res.status).toBe(204);
  });

  it("protects sign-in, which sets the cookie", async () => {
    const res = await request(kit.app).post("/api/auth/login").set("Origin", FOREIGN).send({ email: sono.email, password: TEST_PASSWORD });
    expect(res.status).toBe(403);
    expect(res.headers["set-cookie"]).toBeUndefined();
    const own = await request(kit.app).post("/api/auth/login").set("Origin", APP_URL).send({ email: sono.email, password: TEST_PASSWORD });
    expect(own.status).toBe(200);
  });

  it("refuses a cross-site multipart upload before storing anything", async () => {
    const exam = await makeExam(kit.db, sono.programId, sono.id);
    const res = await request(kit.app)
      .post(`/api/exams/${exam.id}/clips`)
      .set("Cookie", cookie)
      .set("Sec-Fetch-Site", "cross-site")
      .attach("file", Buffer.from("not really a video"), "x.mp4");
    expect(res.status).toBe(403);
    expect(await kit.db("clips").where("exam_id", exam.id).first()).toBeUndefined();
  });
});

describe("Content-Security-Policy", () => {
  it("allows styles and fonts from the app itself only", async () => {
    const res = await request(kit.app).get("/api/health");
    const csp = Object.fromEntries(
      String(res.headers["content-security-policy"])
        .split(";")
        .map((d) => d.trim().split(/\s+/))
        .map(([name, ...values]) => [name, values]),
    ) as Record<string, string[]>;
    expect(csp["style-src"]).toEqual(["'self'"]);
    expect(csp["font-src"]).not.toContain("https:");
    expect(csp["img-src"]).not.toContain("https:");
    expect(csp["script-src"]).toEqual(["'self'"]);
  });
});

describe("Strict-Transport-Security", () => {
  it("is not sent over plain HTTP", async () => {
    const res = await request(kit.app).get("/api/health");
    expect(res.headers["strict-transport-security"]).toBeUndefined();
  });

  it("is sent when the request is HTTPS (behind a trusted proxy)", async () => {
    const proxied = makeKit({ TRUST_PROXY: "1" });
    try {
      const res = await request(proxied.app).get("/api/health").set("X-Forwarded-Proto", "https");
      expect(res.headers["strict-transport-security"]).toMatch(/max-age=\d+/);
      const plain = await request(proxied.app).get("/api/health").set("X-Forwarded-Proto", "http");
      expect(plain.headers["strict-transport-security"]).toBeUndefined();
    } finally {
      await proxied.close();
    }
  });
});
