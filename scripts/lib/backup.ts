// Backup and restore of one Soundings installation: a pg_dump (custom format) of the whole
// database, pg-boss job tables included, a copy of the media, and a manifest.json with the
// SHA-256 and size of every file, so a restore can refuse a damaged backup before it
// touches anything.
//
// Media: with the local driver every object under STORAGE_DIR is copied. With the S3 driver
// the objects the database references (the clips' *_key columns) are downloaded through the
// project's storage module and uploaded again on restore: the storage interface has no
// listing, and a backup that holds the media itself restores into an empty bucket without
// relying on the bucket's own versioning being switched on.
import { spawnSync } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import fsp from "node:fs/promises";
import path from "node:path";
import { pipeline } from "node:stream/promises";
import type { Config } from "../../server/config";
import { createDb } from "../../server/db/knex";
import { createStorage } from "../../server/storage";
import { pgBinDir } from "./postgres";

export const MANIFEST = "manifest.json";
export const DUMP_FILE = "database.dump";
export const MEDIA_DIR = "media";

export interface FileEntry {
  path: string;
  size: number;
  sha256: string;
}

export interface Manifest {
  format: 1;
  createdAt: string;
  schemaVersion: string | null;
  database: FileEntry;
  storage: { driver: "local" | "s3"; files: FileEntry[] };
}

export class BackupError extends Error {}

/** SHA-256 of a file, streamed. */
export async function sha256File(file: string): Promise<string> {
  const hash = crypto.createHash("sha256");
  await pipeline(fs.createReadStream(file), hash);
  return hash.digest("hex");
}

/** Every regular file under `root`, as forward-slash paths relative to it, sorted. */
export async function listFiles(root: string): Promise<string[]> {
  const out: string[] = [];
  async function walk(dir: string) {
    let entries: fs.Dirent[];
    try {
      entries = await fsp.readdir(dir, { withFileTypes: true });
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === "ENOENT") return;
      throw err;
    }
    for (const e of entries) {
      const full = path.join(dir, e.name);
      if (e.isDirectory()) await walk(full);
      else if (e.isFile()) out.push(path.relative(root, full).split(path.sep).join("/"));
    }
  }
  await walk(root);
  // Half-written files of the local driver (renamed into place when complete) and the
  // placeholder that keeps storage/ in git are not media.
  return out.filter((f) => !/\.part-\d+-\d+$/.test(f) && f !== ".gitkeep").sort();
}

/** Default backup folder: backups/<YYYY-MM-DDTHH-MM-SSZ> under BACKUP_DIR (default backups/). */
export function datedFolder(parent: string, now = new Date()): string {
  const stamp = now
    .toISOString()
    .replace(/\.\d+Z$/, "Z")
    .replace(/:/g, "-");
  return path.join(parent, stamp);
}

function run(bin: string, args: string[], what: string) {
  const r = spawnSync(path.join(pgBinDir(), bin), args, { encoding: "utf8" });
  if (r.error) throw new BackupError(`${what}: ${r.error.message}`);
  if (r.status !== 0) throw new BackupError(`${what} failed (exit ${r.status}): ${(r.stderr || r.stdout).trim()}`);
  return r;
}

async function entry(root: string, rel: string): Promise<FileEntry> {
  const full = path.join(root, rel);
  return { path: rel, size: (await fsp.stat(full)).size, sha256: await sha256File(full) };
}

const MEDIA_KEY_COLUMNS = ["original_key", "output_key", "poster_key", "strip_key", "thumb_key", "view_key"];

/** Storage keys the database points at (used for the S3 driver, which cannot be listed). */
async function referencedKeys(config: Config): Promise<string[]> {
  const db = createDb(config.databaseUrl, 1);
  try {
    const cols = await db("information_schema.columns")
      .where({ table_schema: "public" })
      .whereIn("column_name", MEDIA_KEY_COLUMNS)
      .select("table_name", "column_name");
    const keys = new Set<string>();
    for (const c of cols) {
      const rows = await db(c.table_name).whereNotNull(c.column_name).distinct(`${c.column_name} as key`);
      for (const r of rows) keys.add(r.key);
    }
    return [...keys].sort();
  } finally {
    await db.destroy();
  }
}

/** Writes a backup of `config`'s database and media into `folder` (which must not hold one). */
export async function createBackup(config: Config, folder: string, log: (line: string) => void = console.log): Promise<Manifest> {
  if (fs.existsSync(path.join(folder, MANIFEST))) throw new BackupError(`${folder} already holds a backup (${MANIFEST}); choose another folder`);

  const db = createDb(config.databaseUrl, 1);
  let schemaVersion: string | null;
  try {
    const row = await db("knex_migrations").orderBy("id", "desc").first("name");
    schemaVersion = row?.name ?? null;
  } finally {
    await db.destroy();
  }

  // The folder is made only once the database has answered.
  await fsp.mkdir(path.join(folder, MEDIA_DIR), { recursive: true });
  run("pg_dump", ["-Fc", "--no-owner", "-f", path.join(folder, DUMP_FILE), `--dbname=${config.databaseUrl}`], "pg_dump");
  const database = await entry(folder, DUMP_FILE);
  log(`database: ${DUMP_FILE} (${database.size} bytes, schema ${schemaVersion ?? "none"})`);

  const mediaRoot = path.join(folder, MEDIA_DIR);
  const files: FileEntry[] = [];
  if (config.storage.driver === "local") {
    for (const rel of await listFiles(config.storageDir)) {
      const dest = path.join(mediaRoot, rel);
      await fsp.mkdir(path.dirname(dest), { recursive: true });
      await fsp.copyFile(path.join(config.storageDir, rel), dest);
      files.push(await entry(mediaRoot, rel));
    }
  } else {
    const storage = createStorage(config);
    for (const key of await referencedKeys(config)) {
      // Originals may already be gone (deleted after submit): skip what the bucket lacks.
      if ((await storage.size(key)) === null) continue;
      const dest = path.join(mediaRoot, key);
      await fsp.mkdir(path.dirname(dest), { recursive: true });
      await storage.download(key, dest);
      files.push(await entry(mediaRoot, key));
    }
  }
  const bytes = files.reduce((s, f) => s + f.size, 0);
  log(`media: ${files.length} file(s), ${bytes} bytes from the ${config.storage.driver} storage`);

  const manifest: Manifest = { format: 1, createdAt: new Date().toISOString(), schemaVersion, database, storage: { driver: config.storage.driver, files } };
  await fsp.writeFile(path.join(folder, MANIFEST), JSON.stringify(manifest, null, 2) + "\n");
  log(`manifest: ${path.join(folder, MANIFEST)}`);
  return manifest;
}

/** Reads the manifest and checks every file's presence, size and SHA-256; throws naming the first bad file. */
export async function verifyBackup(folder: string): Promise<Manifest> {
  const manifestPath = path.join(folder, MANIFEST);
  let manifest: Manifest;
  try {
    manifest = JSON.parse(await fsp.readFile(manifestPath, "utf8"));
  } catch (err) {
    throw new BackupError(`cannot read ${manifestPath}: ${(err as Error).message}`);
  }
  if (manifest.format !== 1 || !manifest.database || !Array.isArray(manifest.storage?.files)) {
    throw new BackupError(`${manifestPath} is not a Soundings backup manifest`);
  }
  const check = async (root: string, f: FileEntry) => {
    const full = path.join(root, f.path);
    if (!path.resolve(full).startsWith(path.resolve(folder) + path.sep)) throw new BackupError(`manifest names a path outside the backup: ${f.path}`);
    let size: number;
    try {
      size = (await fsp.stat(full)).size;
    } catch {
      throw new BackupError(`missing file: ${full}`);
    }
    if (size !== f.size) throw new BackupError(`size mismatch: ${full} has ${size} bytes, the manifest says ${f.size}`);
    if ((await sha256File(full)) !== f.sha256) throw new BackupError(`checksum mismatch: ${full} does not match its SHA-256 in the manifest`);
  };
  await check(folder, manifest.database);
  for (const f of manifest.storage.files) await check(path.join(folder, MEDIA_DIR), f);
  return manifest;
}

/** Tables and other objects outside the system schemas: a database with any is "not empty". */
async function userRelations(url: string): Promise<number> {
  const db = createDb(url, 1);
  try {
    const r = await db.raw(
      `SELECT count(*)::int AS n FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
       WHERE c.relkind IN ('r','p','v','m','S') AND n.nspname NOT IN ('pg_catalog','information_schema') AND n.nspname NOT LIKE 'pg_toast%'`,
    );
    return r.rows[0].n;
  } finally {
    await db.destroy();
  }
}

async function dropUserSchemas(url: string) {
  const db = createDb(url, 1);
  try {
    await db.transaction(async (trx) => {
      const r = await trx.raw(`SELECT nspname FROM pg_namespace WHERE nspname NOT IN ('information_schema') AND nspname NOT LIKE 'pg\\_%'`);
      for (const { nspname } of r.rows) await trx.raw(`DROP SCHEMA ?? CASCADE`, [nspname]);
      await trx.raw(`CREATE SCHEMA public`);
    });
  } finally {
    await db.destroy();
  }
}

/** Verifies, then restores a backup into `config`'s database and storage. */
export async function restoreBackup(config: Config, folder: string, opts: { force?: boolean } = {}, log: (line: string) => void = console.log) {
  const manifest = await verifyBackup(folder);
  log(
    `verified: ${DUMP_FILE} and ${manifest.storage.files.length} media file(s) match ${MANIFEST} (taken ${manifest.createdAt}, schema ${manifest.schemaVersion ?? "none"})`,
  );

  const relations = await userRelations(config.databaseUrl);
  if (relations > 0 && !opts.force) {
    throw new BackupError(
      `the target database is not empty (${relations} tables, views or sequences); nothing was changed. Pass --force to drop and replace them`,
    );
  }
  const local = config.storage.driver === "local";
  if (local && !opts.force) {
    const existing = await listFiles(config.storageDir);
    if (existing.length > 0)
      throw new BackupError(`STORAGE_DIR ${config.storageDir} already holds ${existing.length} file(s); nothing was changed. Pass --force to overwrite`);
  }

  // --force: pg_restore --clean --if-exists cannot drop pg-boss's partitioned job tables
  // ("cannot drop inherited constraint"), so the schemas go first, in one transaction,
  // and the dump is restored into an empty database.
  if (relations > 0) await dropUserSchemas(config.databaseUrl);
  run("pg_restore", ["--no-owner", "--exit-on-error", "-d", config.databaseUrl, path.join(folder, DUMP_FILE)], "pg_restore");
  log(`database: restored ${DUMP_FILE}${relations > 0 ? " (existing objects dropped first: --force)" : ""}`);

  const mediaRoot = path.join(folder, MEDIA_DIR);
  const storage = local ? null : createStorage(config);
  for (const f of manifest.storage.files) {
    const src = path.join(mediaRoot, f.path);
    if (storage) {
      await storage.put(f.path, src, "application/octet-stream");
      continue;
    }
    const dest = path.join(config.storageDir, f.path);
    await fsp.mkdir(path.dirname(dest), { recursive: true });
    const tmp = `${dest}.part-${process.pid}-${Date.now()}`;
    await fsp.copyFile(src, tmp);
    await fsp.rename(tmp, dest);
  }
  log(`media: restored ${manifest.storage.files.length} file(s) into the ${config.storage.driver} storage${local ? ` at ${config.storageDir}` : ""}`);
  return manifest;
}
