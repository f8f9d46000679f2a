// A media worker killed mid-job: after a worker (re)starts, the sweep sends the clip again
// and it still ends ready. The first worker is a real separate process (`server/worker.ts`).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { spawn } from "node:child_process";
import fs from "node:fs";
import request from "supertest";
import { makeKit, makeMember, makeProgram, tokenFor, type TestKit } from "./helpers";
import { fixtureDir, h264Mp4, mpeg4Avi } from "./media-fixtures";
import { startMediaWorker, sweepStuckClips } from "../../server/jobs/worker";
import { processClipJob } from "../../server/jobs/process-clip";
import { requeueStuckClips } from "../../server/repositories/clips";
import type { Storage } from "../../server/storage/types";

let kit: TestKit;
beforeAll(() => {
  kit = makeKit({ JOB_SCHEMA: "pgboss_crashtest", JOB_STUCK_AFTER_SECONDS: "1" });
});
afterAll(() => kit.close());

/** A new sonographer's exam with one uploaded clip, left queued (no worker takes this schema's jobs yet). */
async function uploadClip(file: (dir: string) => string, dir: string) {
  const p = await makeProgram(kit.db);
  const m = await makeMember(kit.db, p.id, ["sonographer"]);
  const auth = `Bearer ${await tokenFor(kit, m)}`;
  const exam = (
    await request(kit.app)
      .post("/api/exams")
      .set("Authorization", auth)
      .send({ applicationCode: "efast", performedAt: new Date(Date.now() - 60_000).toISOString(), setting: "simulated", transducer: "curvilinear" })
  ).body.exam;
  const up = await request(kit.app).post(`/api/exams/${exam.id}/clips`).set("Authorization", auth).attach("file", file(dir));
  expect(up.status).toBe(202);
  return up;
}

describe("worker crash", () => {
  it("finishes a clip whose worker was killed mid-job", async () => {
    const dir = fixtureDir();
    // Big enough that the transcode is still running when the worker is killed.
    const up = await uploadClip((d) => mpeg4Avi(d, "long.avi", { seconds: 12, size: "1280x720" }), dir);

    const child = spawn(process.execPath, ["--import", "tsx", "server/worker.ts"], {
      env: { ...process.env, NODE_ENV: "test", JOB_SCHEMA: "pgboss_crashtest", JOB_STUCK_AFTER_SECONDS: "3600" },
      stdio: "ignore",
    });
    const state = async () => (await kit.db("clips").where("id", up.body.id).first()).state as string;
    for (let i = 0; i < 300 && (await state()) !== "processing"; i++) await new Promise((r) => setTimeout(r, 100));
    expect(await state()).toBe("processing");
    child.kill("SIGKILL");
    await new Promise((r) => child.once("exit", r));
    expect(await state()).toBe("processing");

    await new Promise((r) => setTimeout(r, 1200));
    // The sweep a starting worker runs finds the dead job's clip (1 s threshold) and sends it
    // again. The worker that takes it then sweeps at a relaxed threshold: at 1 s, a loaded CI
    // machine delays heartbeats past the threshold and the live job would be sent again and
    // again, each copy transcoding the same 12 s clip (seen once as "queued" after 180 s).
    const queue = await kit.queue();
    expect(await sweepStuckClips(kit.db, queue, 1)).toBeGreaterThanOrEqual(1);
    const relaxed = { ...kit.config, jobs: { ...kit.config.jobs, stuckAfterSeconds: 120 } };
    const worker = await startMediaWorker({ db: kit.db, storage: kit.storage, config: relaxed, queue, log: () => {} });
    try {
      // A generous wait: on a loaded two-core CI machine the 12 s transcode can take a minute.
      for (let i = 0; i < 1800 && (await state()) !== "ready"; i++) await new Promise((r) => setTimeout(r, 100));
      expect(await state()).toBe("ready");
      const row = await kit.db("clips").where("id", up.body.id).first();
      expect(row.attempts).toBeGreaterThanOrEqual(2);
      expect(await kit.storage.size(row.output_key)).toBeGreaterThan(0);
    } finally {
      await worker.stop();
      fs.rmSync(dir, { recursive: true, force: true });
    }
  }, 240_000);
});

describe("a job at work keeps its clip from looking stuck", () => {
  // The job is held inside its download (a gate), so it is 'processing' for as long as the
  // test wants, whatever the machine's speed; the sweep's threshold is 1 s.
  async function heldJob(heartbeatSeconds: number | undefined) {
    const dir = fixtureDir();
    const up = await uploadClip((d) => h264Mp4(d, "short.mp4", { seconds: 1 }), dir);
    let open!: () => void;
    const gate = new Promise<void>((r) => (open = r));
    const storage: Storage = { ...kit.storage, download: async (key, to) => (await gate, kit.storage.download(key, to)) };
    const done = processClipJob({ db: kit.db, storage, heartbeatSeconds }, { clipId: up.body.id, version: 1 }, { retryCount: 0, retryLimit: 0 });
    const state = async () => (await kit.db("clips").where("id", up.body.id).first()).state as string;
    for (let i = 0; i < 100 && (await state()) !== "processing"; i++) await new Promise((r) => setTimeout(r, 50));
    expect(await state()).toBe("processing");
    await new Promise((r) => setTimeout(r, 1600));
    const swept = (await requeueStuckClips(kit.db, 1)).map((c) => c.id);
    const after = await state();
    open();
    await done;
    fs.rmSync(dir, { recursive: true, force: true });
    return { swept: swept.includes(up.body.id), after, final: await state() };
  }

  it("with a heartbeat, the sweep leaves a clip whose job is still running", async () => {
    expect(await heldJob(0.25)).toEqual({ swept: false, after: "processing", final: "ready" });
  }, 60_000);

  it("without one, the same clip would be sent again (what the heartbeat prevents)", async () => {
    expect(await heldJob(undefined)).toMatchObject({ swept: true, after: "queued" });
  }, 60_000);
});
