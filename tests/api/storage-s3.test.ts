// The S3-compatible storage driver against a local fake S3 server (s3rver from npm), on its
// own and underneath the whole upload → process → Range-served media path.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import request from "supertest";
// @ts-expect-error s3rver ships no type declarations
import S3rver from "s3rver";
import { createS3Storage } from "../../server/storage/s3";
import type { Storage } from "../../server/storage/types";
import { freePort } from "../../scripts/lib/postgres";
import { makeKit, makeMember, makeProgram, tokenFor, type TestKit } from "./helpers";
import { fixtureDir, png } from "./media-fixtures";
import { startMediaWorker, type MediaWorker } from "../../server/jobs/worker";

let server: { close: () => Promise<void> };
let dir: string;
let port: number;
let storage: Storage;
const settings = () => ({ S3_ENDPOINT: `http://127.0.0.1:${port}`, S3_BUCKET: "soundings-test", S3_ACCESS_KEY_ID: "S3RVER", S3_SECRET_ACCESS_KEY: "S3RVER" });

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "soundings-s3-"));
  port = await freePort();
  const s3 = new S3rver({ port, address: "127.0.0.1", directory: dir, silent: true, configureBuckets: [{ name: "soundings-test" }] });
  await s3.run();
  server = s3;
  const s = settings();
  storage = createS3Storage({
    endpoint: s.S3_ENDPOINT,
    region: "us-east-1",
    bucket: s.S3_BUCKET,
    accessKeyId: s.S3_ACCESS_KEY_ID,
    secretAccessKey: s.S3_SECRET_ACCESS_KEY,
    forcePathStyle: true,
  });
});
afterAll(async () => {
  await server.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

const text = async (stream: NodeJS.ReadableStream) => {
  const chunks: Buffer[] = [];
  for await (const c of stream) chunks.push(Buffer.from(c as Buffer));
  return Buffer.concat(chunks).toString();
};

describe("S3 storage driver", () => {
  it("puts, sizes, reads whole and by range, downloads and deletes", async () => {
    const src = path.join(dir, "src.txt");
    fs.writeFileSync(src, "0123456789abcdef");
    await storage.put("programs/p1/clips/c1/v1/video.mp4", src, "video/mp4");
    expect(await storage.size("programs/p1/clips/c1/v1/video.mp4")).toBe(16);
    expect(await text(await storage.get("programs/p1/clips/c1/v1/video.mp4"))).toBe("0123456789abcdef");
    expect(await text(await storage.get("programs/p1/clips/c1/v1/video.mp4", { start: 10, end: 12 }))).toBe("abc");
    const dest = path.join(dir, "dest.txt");
    await storage.download("programs/p1/clips/c1/v1/video.mp4", dest);
    expect(fs.readFileSync(dest, "utf8")).toBe("0123456789abcdef");
    await storage.delete("programs/p1/clips/c1/v1/video.mp4");
    expect(await storage.size("programs/p1/clips/c1/v1/video.mp4")).toBeNull();
  });

  it("refuses keys that could escape", async () => {
    await expect(storage.put("../outside", path.join(dir, "src.txt"), "text/plain")).rejects.toThrow(/unsafe storage key/);
    await expect(storage.size("a//b")).rejects.toThrow(/unsafe/);
  });
});

describe("uploads on S3 storage", () => {
  let kit: TestKit;
  let worker: MediaWorker;
  beforeAll(async () => {
    // Its own queue schema: workers sharing a queue must share storage.
    kit = makeKit({ STORAGE_DRIVER: "s3", JOB_SCHEMA: "pgboss_s3test", ...settings() });
    worker = await startMediaWorker({ db: kit.db, storage: kit.storage, config: kit.config, queue: await kit.queue(), log: () => {} });
  });
  afterAll(async () => {
    await worker.stop();
    await kit.close();
  });

  it("stores the original and the outputs in the bucket and serves them with Range", async () => {
    const p = await makeProgram(kit.db);
    const m = await makeMember(kit.db, p.id, ["sonographer"]);
    const auth = `Bearer ${await tokenFor(kit, m)}`;
    const exam = await request(kit.app)
      .post("/api/exams")
      .set("Authorization", auth)
      .send({ applicationCode: "efast", performedAt: new Date(Date.now() - 60_000).toISOString(), setting: "simulated", transducer: "curvilinear" });
    const f = fixtureDir();
    const up = await request(kit.app)
      .post(`/api/exams/${exam.body.exam.id}/clips`)
      .set("Authorization", auth)
      .attach("file", await png(f, "s3.png", 21));
    expect(up.status).toBe(202);
    let clip: { state: string; media: { image: string } } | undefined;
    for (let i = 0; i < 150 && clip?.state !== "ready"; i++) {
      await new Promise((r) => setTimeout(r, 200));
      clip = (await request(kit.app).get(`/api/exams/${exam.body.exam.id}`).set("Authorization", auth)).body.exam.clips[0];
    }
    expect(clip?.state).toBe("ready");
    const row = await kit.db("clips").where("id", up.body.id).first();
    expect(await storage.size(row.output_key)).toBeGreaterThan(0);
    expect(await storage.size(row.original_key)).toBeGreaterThan(0);
    expect(fs.existsSync(path.join(kit.config.storageDir, row.output_key))).toBe(false);
    const part = await request(kit.app).get(clip!.media.image).set("Authorization", auth).set("Range", "bytes=0-7").buffer(true);
    expect(part.status).toBe(206);
    expect(part.body.subarray(0, 8).toString("hex")).toBe("89504e470d0a1a0a"); // PNG signature
    fs.rmSync(f, { recursive: true, force: true });
  });
});
