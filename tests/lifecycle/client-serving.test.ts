// The app serves the built client once it appears, even when it was made before the build
// (the first `npm start` on a fresh clone), and explains itself while there is none.
import { afterAll, describe, expect, it } from "vitest";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import request from "supertest";
import { buildApp } from "../../server/app";
import { loadConfig } from "../../server/config";
import { createDb } from "../../server/db/knex";
import { createLocalStorage } from "../../server/storage/local";

const dir = fs.mkdtempSync(path.join(os.tmpdir(), "soundings-client-"));
const clientDir = path.join(dir, "dist");
// Serving pages touches neither database nor mail: a pool that never connects will do.
const db = createDb("postgres://postgres@127.0.0.1:1/none", 1);
const config = loadConfig({ NODE_ENV: "test" });
afterAll(async () => {
  await db.destroy();
  fs.rmSync(dir, { recursive: true, force: true });
});

describe("the built client", () => {
  it("answers 503 with an explanation before the build, and serves the client once it is built", async () => {
    const { app } = buildApp({ db, config, storage: createLocalStorage(dir), jobs: { enqueueClip: async () => {} }, log: () => {}, clientDir });

    const before = await request(app).get("/");
    expect(before.status).toBe(503);
    expect(before.text).toContain("the web client is not built yet");
    expect(before.text).not.toContain("Cannot GET");

    fs.mkdirSync(path.join(clientDir, "assets"), { recursive: true });
    fs.writeFileSync(path.join(clientDir, "index.html"), '<!doctype html><div id="root"></div>');
    fs.writeFileSync(path.join(clientDir, "assets", "app.js"), "console.log(1)");

    const after = await request(app).get("/");
    expect(after.status).toBe(200);
    expect(after.text).toContain('<div id="root">');
    // History fallback: a client route gets index.html; an asset is served as itself.
    expect((await request(app).get("/exams/some-id")).text).toContain('<div id="root">');
    expect((await request(app).get("/assets/app.js")).text).toBe("console.log(1)");
    // The API keeps its own JSON 404.
    expect((await request(app).get("/api/no-such-route")).status).toBe(404);
  });
});
