// Backup and restore as a round trip: a program with an exam, stored clip files and a submitted
// review (plus the pg-boss job tables) goes through `npm run backup` and `npm run restore` into
// a second, fresh database and storage folder; every table's rows and every media file's
// SHA-256 must come back the same. A tampered backup must be refused with nothing changed.
import { execFile } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { createDb, type Db } from "../../server/db/knex";
import { queueSubmittedExam } from "../../server/services/queue";
import { listFiles, sha256File } from "../../scripts/lib/backup";
import { EFAST_FINDING_KEYS, makeClip, makeExam, makeKit, makeMember, makeProgram, type TestKit, tokenFor } from "./helpers";

const exec = promisify(execFile);
const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");
const tag = crypto.randomBytes(4).toString("hex");
const names = { source: `backup_src_${tag}`, target: `backup_dst_${tag}`, tampered: `backup_tmp_${tag}` };
const tmp = fs.mkdtempSync(path.join(os.tmpdir(), "soundings-backup-test-"));
const dirs = {
  source: path.join(tmp, "storage-src"),
  target: path.join(tmp, "storage-dst"),
  tampered: path.join(tmp, "storage-tampered"),
  backup: path.join(tmp, "backup"),
};

const urlFor = (db: string) => {
  const u = new URL(process.env.DATABASE_URL!);
  u.pathname = `/${db}`;
  return u.toString();
};
let admin: Db;
let kit: TestKit;

/** Runs one of the scripts as `npm run` would, with its own DATABASE_URL and STORAGE_DIR. */
async function script(name: "backup" | "restore", args: string[], db: string, storageDir: string) {
  try {
    const r = await exec(process.execPath, ["--import", "tsx", `scripts/${name}.ts`, ...args], {
      cwd: root,
      env: { ...process.env, DATABASE_URL: urlFor(db), STORAGE_DIR: storageDir, STORAGE_DRIVER: "local" },
    });
    return { code: 0, out: r.stdout + r.stderr };
  } catch (err) {
    const e = err as { code: number; stdout: string; stderr: string };
    return { code: e.code, out: e.stdout + e.stderr };
  }
}

/** md5 of every table's rows, in every schema the application owns (public and pg-boss's). */
async function fingerprint(db: string): Promise<Record<string, string>> {
  const conn = createDb(urlFor(db), 1);
  try {
    const tables = await conn.raw(`SELECT schemaname, tablename FROM pg_tables WHERE schemaname NOT IN ('pg_catalog','information_schema') ORDER BY 1, 2`);
    const out: Record<string, string> = {};
    for (const t of tables.rows) {
      const r = await conn.raw(`SELECT count(*)::int AS n, md5(string_agg(t::text, ',' ORDER BY t::text)) AS h FROM ??.?? t`, [t.schemaname, t.tablename]);
      out[`${t.schemaname}.${t.tablename}`] = `${r.rows[0].n}:${r.rows[0].h}`;
    }
    return out;
  } finally {
    await conn.destroy();
  }
}

async function mediaHashes(dir: string): Promise<Record<string, string>> {
  const out: Record<string, string> = {};
  for (const f of await listFiles(dir)) out[f] = await sha256File(path.join(dir, f));
  return out;
}

beforeAll(async () => {
  admin = createDb(process.env.DATABASE_URL!, 1);
  for (const n of Object.values(names)) await admin.raw(`CREATE DATABASE ??`, [n]);
  for (const d of Object.values(dirs)) fs.mkdirSync(d, { recursive: true });
  // Knex loads .ts migrations only under tsx: migrate the way `npm run migrate` does.
  await exec(process.execPath, ["--import", "tsx", "scripts/migrate.ts"], { cwd: root, env: { ...process.env, DATABASE_URL: urlFor(names.source) } });

  kit = makeKit({ DATABASE_URL: urlFor(names.source), STORAGE_DIR: dirs.source });
  await (await kit.queue()).stop(); // creates the pg-boss schema and tables in the source database
  const p = await makeProgram(kit.db);
  const sono = await makeMember(kit.db, p.id, ["sonographer"]);
  const reviewer = await makeMember(kit.db, p.id, ["reviewer"]);
  const exam = await makeExam(kit.db, p.id, sono.id, { status: "submitted" });
  await makeClip(kit, exam, "ready");
  await makeClip(kit, exam, "ready");
  const findings = EFAST_FINDING_KEYS;
  await kit.db("exam_findings").insert(findings.map((key) => ({ exam_id: exam.id, finding_key: key, read: "negative" })));
  await kit.db.transaction((trx) => queueSubmittedExam(trx, { id: exam.id, program_id: p.id, setting: "clinical" }, 0));
  const auth = `Bearer ${await tokenFor(kit, reviewer)}`;
  const next = await request(kit.app).post("/api/queue/next").set("Authorization", auth).send({});
  expect(next.status).toBe(200);
  const scores = { transducer: "suitable", marker: "follows", depth: "fits", gain: "balanced", plane: "standard", labels: "complete", quality: "4" };
  const sub = await request(kit.app)
    .post(`/api/assignments/${next.body.assignment.id}/review`)
    .set("Authorization", auth)
    .send({ scores, reads: findings.map((key) => ({ key, read: "negative" })), feedback: "Clear windows, well fanned.", timeSpentSeconds: 80 });
  expect(sub.status).toBe(201);
  await kit.close();
}, 60_000);

afterAll(async () => {
  for (const n of Object.values(names)) await admin.raw(`DROP DATABASE IF EXISTS ?? WITH (FORCE)`, [n]);
  await admin.destroy();
  fs.rmSync(tmp, { recursive: true, force: true });
});

describe("npm run backup / npm run restore", () => {
  it("restores every table row and every media file unchanged into a fresh database and storage folder", async () => {
    const b = await script("backup", [dirs.backup], names.source, dirs.source);
    expect(b.out).toContain("backup complete");
    expect(b.code).toBe(0);
    const manifest = JSON.parse(fs.readFileSync(path.join(dirs.backup, "manifest.json"), "utf8"));
    const latest = fs.readdirSync(path.join(root, "migrations")).sort().at(-1);
    expect(manifest.schemaVersion).toBe(latest);
    expect(manifest.storage.files).toHaveLength(4); // two clips × video and poster
    // The checksum in the manifest is the one sha256sum (GNU coreutils) computes for the dump.
    const { stdout } = await exec("sha256sum", [path.join(dirs.backup, "database.dump")]);
    expect(manifest.database.sha256).toBe(stdout.split(" ")[0]);

    const r = await script("restore", [dirs.backup], names.target, dirs.target);
    expect(r.out).toContain("restore complete");
    expect(r.code).toBe(0);

    const before = await fingerprint(names.source);
    expect(Object.keys(before)).toEqual(expect.arrayContaining(["public.reviews", "public.clips", "public.knex_migrations", "pgboss.job"]));
    expect(before["public.reviews"]).toMatch(/^1:/);
    expect(await fingerprint(names.target)).toEqual(before);
    const media = await mediaHashes(dirs.source);
    expect(Object.keys(media)).toHaveLength(4);
    expect(await mediaHashes(dirs.target)).toEqual(media);

    // A second restore into the now non-empty database is refused without --force, then allowed with it.
    const again = await script("restore", [dirs.backup], names.target, dirs.target);
    expect(again.code).not.toBe(0);
    expect(again.out).toContain("not empty");
    const forced = await script("restore", [dirs.backup, "--force"], names.target, dirs.target);
    expect(forced.out).toContain("restore complete");
    expect(forced.code).toBe(0);
    expect(await fingerprint(names.target)).toEqual(before);
  }, 120_000);

  it("refuses a backup with a tampered media file, naming it, and changes nothing", async () => {
    const copy = path.join(tmp, "tampered-backup");
    fs.cpSync(dirs.backup, copy, { recursive: true });
    const manifest = JSON.parse(fs.readFileSync(path.join(copy, "manifest.json"), "utf8"));
    const victim = path.join(copy, "media", manifest.storage.files[0].path);
    const bytes = fs.readFileSync(victim);
    bytes[0] ^= 0xff; // same size, different content
    fs.writeFileSync(victim, bytes);

    const before = await fingerprint(names.tampered);
    const r = await script("restore", [copy], names.tampered, dirs.tampered);
    expect(r.code).not.toBe(0);
    expect(r.out).toContain("checksum mismatch");
    expect(r.out).toContain(victim);
    expect(await fingerprint(names.tampered)).toEqual(before);
    expect(before).toEqual({});
    expect(await listFiles(dirs.tampered)).toEqual([]);

    fs.rmSync(path.join(copy, "database.dump"));
    const missing = await script("restore", [copy], names.tampered, dirs.tampered);
    expect(missing.code).not.toBe(0);
    expect(missing.out).toContain(`missing file: ${path.join(copy, "database.dump")}`);
    expect(await fingerprint(names.tampered)).toEqual({});
  }, 60_000);
});
