// PostgreSQL restarted under a steady, bounded load (health, an exam page, a review
// autosave from a few concurrent loops), on a cluster this test owns: while it is down
// every request gets a quick 503 (`database_unavailable` with Retry-After, or the health
// route's `{ ok: false }`), never a 500 or a hang; afterwards the same process answers
// 200 again without a restart, the job queue takes new jobs, and no submitted score is lost.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { AddressInfo } from "node:net";
import type { Server } from "node:http";
import request from "supertest";
import { EFAST_FINDING_KEYS, makeExam, makeKit, makeMember, makeProgram, type TestKit, type TestMember, tokenFor } from "./helpers";
import { startTempDatabase, type TempDatabase } from "./temp-database";
import { queueSubmittedExam } from "../../server/services/queue";

const EFAST_FINDINGS = EFAST_FINDING_KEYS;
const GOOD = { transducer: "suitable", marker: "follows", depth: "fits", gain: "balanced", plane: "standard", labels: "complete", quality: "4" };
const reads = () => EFAST_FINDINGS.map((key) => ({ key, read: "negative" }));

let database: TempDatabase;
let kit: TestKit;
let server: Server;
let base: string;

beforeAll(async () => {
  database = await startTempDatabase("soundings-restart-");
  kit = makeKit({ DATABASE_URL: database.url });
  server = kit.app.listen(0, "127.0.0.1");
  await new Promise((r) => server.once("listening", r));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
}, 60_000);
afterAll(async () => {
  await new Promise((r) => server?.close(r));
  await kit?.close();
  database?.destroy();
});

type Phase = "before" | "down" | "restarting" | "after";
interface Sample {
  /** The phase the request began and ended in, or "transition" when they differ. */
  phase: Phase | "transition";
  what: string;
  status: number;
  code?: string;
  retryAfter: string | null;
}

describe("a PostgreSQL restart under load", () => {
  it("answers 503 while the database is down and recovers by itself, losing no score", async () => {
    const p = await makeProgram(kit.db);
    const sonographer = await makeMember(kit.db, p.id, ["sonographer"]);
    const reviewers: TestMember[] = [];
    for (let i = 0; i < 3; i++) reviewers.push(await makeMember(kit.db, p.id, ["reviewer"]));
    const exams: { id: string }[] = [];
    for (let i = 0; i < 6; i++) {
      const exam = await makeExam(kit.db, p.id, sonographer.id, { status: "submitted" });
      await kit.db("exam_findings").insert(EFAST_FINDINGS.map((key) => ({ exam_id: exam.id, finding_key: key, read: "negative" })));
      await kit.db.transaction((trx) => queueSubmittedExam(trx, { id: exam.id, program_id: p.id, setting: "clinical" }, 0));
      exams.push(exam);
    }
    const auth = new Map<string, string>();
    for (const m of [sonographer, ...reviewers]) auth.set(m.id, `Bearer ${await tokenFor(kit, m)}`);
    const claim = async (r: TestMember) => {
      const res = await request(kit.app).post("/api/queue/next").set("Authorization", auth.get(r.id)!).send({});
      expect(res.status).toBe(200);
      return res.body.assignment.id as string;
    };
    // Each reviewer submits one read before the restart and holds a second one to autosave.
    const submitted: string[] = [];
    for (const r of reviewers) {
      const id = await claim(r);
      const res = await request(kit.app)
        .post(`/api/assignments/${id}/review`)
        .set("Authorization", auth.get(r.id)!)
        .send({ scores: GOOD, reads: reads(), feedback: "Clear views.", timeSpentSeconds: 60 });
      expect(res.status).toBe(201);
      submitted.push(res.body.review.id);
    }
    const held = await Promise.all(reviewers.map(async (r) => ({ r, id: await claim(r) })));

    // The job queue is running (with a worker polling) before the restart.
    const queue = await kit.queue();
    await queue.boss.createQueue("restart-probe");
    const ran: unknown[] = [];
    await queue.boss.work("restart-probe", { pollingIntervalSeconds: 0.5 }, async (jobs) => void ran.push(...jobs.map((j) => j.data)));

    let phase: Phase = "before";
    let stop = false;
    const samples: Sample[] = [];
    const hit = async (what: string, path: string, init: RequestInit = {}) => {
      const began = phase;
      const at = (): Sample["phase"] => (phase === began ? began : "transition");
      let s: Sample;
      try {
        const res = await fetch(`${base}${path}`, { ...init, signal: AbortSignal.timeout(20_000) });
        const body = (await res.json().catch(() => ({}))) as { error?: { code?: string } };
        s = { phase: at(), what, status: res.status, code: body.error?.code, retryAfter: res.headers.get("retry-after") };
      } catch {
        s = { phase: at(), what, status: 0, retryAfter: null }; // hung or reset
      }
      samples.push(s);
    };
    // Three loops, each a health check, the sonographer's exam page and one reviewer's autosave.
    const loops = held.map(async ({ r, id }, i) => {
      for (let n = 0; n < 400 && !stop; n++) {
        await hit("health", "/api/health");
        await hit("exam", `/api/exams/${exams[i].id}`, { headers: { Authorization: auth.get(sonographer.id)! } });
        await hit("autosave", `/api/assignments/${id}/draft`, {
          method: "PUT",
          headers: { Authorization: auth.get(r.id)!, "Content-Type": "application/json" },
          body: JSON.stringify({ scores: { quality: String((n % 5) + 1) }, timeSpentSeconds: n }),
        });
        await new Promise((res) => setTimeout(res, 50));
      }
    });
    const sleep = (ms: number) => new Promise((res) => setTimeout(res, ms));
    await sleep(1000);
    database.stop();
    phase = "down";
    await sleep(3000);
    phase = "restarting";
    database.start();
    // Recovery: the same process, no restart of anything but PostgreSQL.
    const deadline = Date.now() + 30_000;
    while ((await fetch(`${base}/api/health`)).status !== 200) {
      if (Date.now() > deadline) throw new Error("health did not come back");
      await sleep(200);
    }
    phase = "after";
    await sleep(2000);
    stop = true;
    await Promise.all(loops);

    const of = (ph: Sample["phase"]) => samples.filter((s) => s.phase === ph);
    // Requests that straddle a stop or a start may get either answer, but never a 500 or a hang.
    expect(samples.filter((s) => s.status !== 200 && s.status !== 503)).toEqual([]);
    expect(of("before").length).toBeGreaterThan(0);
    expect(of("before").every((s) => s.status === 200)).toBe(true);
    const down = of("down");
    expect(down.length).toBeGreaterThan(6);
    // Nothing hung, nothing answered 500: all 503, the API's with the code and a Retry-After.
    expect(down.filter((s) => s.status !== 503)).toEqual([]);
    for (const s of down.filter((d) => d.what !== "health")) {
      expect(s.code).toBe("database_unavailable");
      expect(Number(s.retryAfter)).toBeGreaterThan(0);
    }
    expect(new Set(down.map((s) => s.what))).toEqual(new Set(["health", "exam", "autosave"]));
    // Once health is back, everything is (the pool holds no broken connection).
    const after = of("after");
    expect(after.length).toBeGreaterThan(6);
    expect(after.filter((s) => s.status !== 200)).toEqual([]);

    // No score lost; the autosave after the restart is stored.
    const stored = await kit.db("reviews").whereIn("id", submitted).select("id");
    expect(stored).toHaveLength(submitted.length);
    expect(
      await kit.db("review_drafts").whereIn(
        "assignment_id",
        held.map((h) => h.id),
      ),
    ).toHaveLength(held.length);

    // The job queue reconnected: a job sent after the restart runs on the worker started before it.
    await queue.boss.send("restart-probe", { after: "restart" });
    const jobDeadline = Date.now() + 20_000;
    while (!ran.some((d) => (d as { after?: string }).after === "restart")) {
      if (Date.now() > jobDeadline) throw new Error("the job sent after the restart did not run");
      await sleep(200);
    }
  }, 120_000);
});
