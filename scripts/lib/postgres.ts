// Lifecycle of a private PostgreSQL cluster from Debian's packages, on 127.0.0.1 only:
// initdb on first use, start, create the database, stop. As root the server runs as the
// `postgres` system user (PostgreSQL refuses root); every folder above the data directory
// must be enterable by that user, else we fall back to a folder under /var/tmp.
import { execFileSync, spawnSync } from "node:child_process";
import fs from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import crypto from "node:crypto";

export interface Cluster {
  dir: string;
  dataDir: string;
  port: number;
  url: (database?: string) => string;
  stop: () => void;
}

const isRoot = process.getuid?.() === 0;

/** Directory of the newest installed PostgreSQL binaries. */
export function pgBinDir(): string {
  const base = "/usr/lib/postgresql";
  const versions = fs.existsSync(base) ? fs.readdirSync(base).filter((v) => fs.existsSync(path.join(base, v, "bin", "initdb"))) : [];
  if (versions.length === 0) throw new Error("PostgreSQL server binaries not found under /usr/lib/postgresql (apt-get install postgresql)");
  versions.sort((a, b) => Number(a) - Number(b));
  return path.join(base, versions[versions.length - 1], "bin");
}

function asPostgres(cmd: string, args: string[], opts: { quiet?: boolean } = {}) {
  const [file, argv] = isRoot ? ["runuser", ["-u", "postgres", "--", cmd, ...args]] : [cmd, args];
  const r = spawnSync(file, argv, { encoding: "utf8", stdio: opts.quiet ? "pipe" : ["ignore", "pipe", "pipe"] });
  if (r.status !== 0) throw new Error(`${path.basename(cmd)} failed (${r.status}): ${r.stderr || r.stdout}`);
  return r.stdout;
}

function postgresCanEnter(dir: string): boolean {
  if (!isRoot) return true;
  return spawnSync("runuser", ["-u", "postgres", "--", "test", "-x", dir], { stdio: "ignore" }).status === 0;
}

/** Picks where the cluster lives: `preferred` if the postgres user can reach it, else /var/tmp. */
export function clusterDir(preferred: string): string {
  fs.mkdirSync(preferred, { recursive: true });
  if (postgresCanEnter(preferred)) return preferred;
  const tag = crypto.createHash("sha256").update(path.resolve(preferred)).digest("hex").slice(0, 10);
  const fallback = path.join("/var/tmp", `soundings-pg-${tag}`);
  fs.mkdirSync(fallback, { recursive: true });
  return fallback;
}

/** True when something accepts TCP connections on 127.0.0.1:port. */
export function portInUse(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const s = net.connect({ host: "127.0.0.1", port }, () => {
      s.destroy();
      resolve(true);
    });
    s.on("error", () => resolve(false));
  });
}

/** A free TCP port on loopback, chosen by the kernel. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.listen(0, "127.0.0.1", () => {
      const { port } = srv.address() as net.AddressInfo;
      srv.close(() => resolve(port));
    });
    srv.on("error", reject);
  });
}

/** Initialises (once) and starts a cluster in `dir`, listening on 127.0.0.1:port. */
export function startCluster(dir: string, port: number, database = "soundings"): Cluster {
  const bin = pgBinDir();
  const dataDir = path.join(dir, "data");
  const runDir = path.join(dir, "run");
  fs.mkdirSync(dataDir, { recursive: true });
  fs.mkdirSync(runDir, { recursive: true });
  if (isRoot) execFileSync("chown", ["-R", "postgres:postgres", dir]);
  fs.chmodSync(dataDir, 0o700);
  if (!fs.existsSync(path.join(dataDir, "PG_VERSION"))) {
    asPostgres(path.join(bin, "initdb"), ["-D", dataDir, "-U", "postgres", "-A", "trust", "-E", "UTF8", "--no-locale"]);
  }
  const pidFile = path.join(dataDir, "postmaster.pid");
  const running =
    fs.existsSync(pidFile) &&
    spawnSync(
      isRoot ? "runuser" : path.join(bin, "pg_ctl"),
      isRoot ? ["-u", "postgres", "--", path.join(bin, "pg_ctl"), "-D", dataDir, "status"] : ["-D", dataDir, "status"],
    ).status === 0;
  if (!running) {
    asPostgres(path.join(bin, "pg_ctl"), [
      "-D",
      dataDir,
      "-l",
      path.join(dir, "postgres.log"),
      "-w",
      "-t",
      "60",
      "-o",
      `-c listen_addresses=127.0.0.1 -p ${port} -k ${runDir} -c fsync=${process.env.PG_FSYNC ?? "on"}`,
      "start",
    ]);
  }
  const exists = spawnSync(
    path.join(bin, "psql"),
    ["-h", "127.0.0.1", "-p", String(port), "-U", "postgres", "-tAc", `SELECT 1 FROM pg_database WHERE datname='${database}'`],
    { encoding: "utf8" },
  );
  if (exists.status !== 0) throw new Error(`cannot reach the cluster on port ${port}: ${exists.stderr}`);
  if (exists.stdout.trim() !== "1") {
    execFileSync(path.join(bin, "createdb"), ["-h", "127.0.0.1", "-p", String(port), "-U", "postgres", database]);
  }
  let stopped = false;
  return {
    dir,
    dataDir,
    port,
    url: (db = database) => `postgres://postgres@127.0.0.1:${port}/${db}`,
    stop: () => {
      if (stopped) return;
      stopped = true;
      try {
        asPostgres(path.join(bin, "pg_ctl"), ["-D", dataDir, "-m", "fast", "-w", "stop"], { quiet: true });
      } catch {
        // already stopped
      }
    },
  };
}

/** A throw-away cluster in a fresh temporary folder, removed by `destroy()`. */
export async function startTemporaryCluster(prefix = "soundings-test-"): Promise<Cluster & { destroy: () => void }> {
  const dir = fs.mkdtempSync(path.join(isRoot ? "/var/tmp" : os.tmpdir(), prefix));
  fs.chmodSync(dir, 0o755);
  const port = await freePort();
  process.env.PG_FSYNC ??= "off";
  const cluster = startCluster(dir, port);
  return {
    ...cluster,
    destroy: () => {
      cluster.stop();
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}
