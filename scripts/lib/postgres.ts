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

/** True when something accepts TCP connections on host:port (loopback unless told). */
export function portInUse(port: number, host = "127.0.0.1"): Promise<boolean> {
  return new Promise((resolve) => {
    const s = net.connect({ host, port }, () => {
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

/** The port of the cluster already running in `dir`, or undefined when none runs there. */
export function runningClusterPort(dir: string): number | undefined {
  const dataDir = path.join(dir, "data");
  const pidFile = path.join(dataDir, "postmaster.pid");
  if (!fs.existsSync(pidFile)) return undefined;
  const bin = pgBinDir();
  const status = spawnSync(
    isRoot ? "runuser" : path.join(bin, "pg_ctl"),
    isRoot ? ["-u", "postgres", "--", path.join(bin, "pg_ctl"), "-D", dataDir, "status"] : ["-D", dataDir, "status"],
  );
  if (status.status !== 0) return undefined;
  // postmaster.pid: pid, data directory, start time, port, ... (PostgreSQL's storage layout).
  const port = Number(fs.readFileSync(pidFile, "utf8").split("\n")[3]);
  return Number.isInteger(port) && port > 0 ? port : undefined;
}

/**
 * The port for the cluster in `dir`: the one it already runs on; else `explicit` (PG_PORT) as
 * given; else `preferred` when free, or a free one chosen by the kernel, with a note saying so.
 */
export async function chooseClusterPort(dir: string, explicit: number | undefined, preferred = 54329): Promise<{ port: number; note?: string }> {
  const running = runningClusterPort(dir);
  if (running !== undefined) return { port: running };
  if (explicit !== undefined) return { port: explicit };
  if (!(await portInUse(preferred))) return { port: preferred };
  const port = await freePort();
  return { port, note: `port ${preferred} on 127.0.0.1 is in use, so PostgreSQL takes the free port ${port} (set PG_PORT to choose one)` };
}

const fileSize = (file: string) => (fs.existsSync(file) ? fs.statSync(file).size : 0);

/** The last `lines` lines a text file got after byte `from`, or "" when it cannot be read. */
function tail(file: string, from: number, lines: number): string {
  try {
    return fs.readFileSync(file).subarray(from).toString("utf8").trimEnd().split("\n").slice(-lines).join("\n");
  } catch {
    return "";
  }
}

/** Why pg_ctl could not start the cluster, in words an operator can act on, with the log's end. */
function startFailure(port: number, logFile: string, logFrom: number, pgCtlOutput: string): Error {
  const log = tail(logFile, logFrom, 15);
  const busy = /could not bind .*Address already in use/i.test(log);
  const head = busy
    ? `PostgreSQL could not start: port ${port} on 127.0.0.1 is already in use (another PostgreSQL server or program listens there). Stop that program, or choose another port: PG_PORT=<port> npm start`
    : `PostgreSQL could not start on port ${port}: ${pgCtlOutput.trim() || "pg_ctl failed"}`;
  return new Error(`${head}\nLast lines of ${logFile}:\n${log || "(empty)"}`);
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
  // A cluster left running (its owner was killed) is reused on the port it listens on.
  const running = runningClusterPort(dir);
  port = running ?? port;
  if (running === undefined) {
    const logFile = path.join(dir, "postgres.log");
    const logFrom = fileSize(logFile);
    const start = [
      "-D",
      dataDir,
      "-l",
      logFile,
      "-w",
      "-t",
      "60",
      "-o",
      `-c listen_addresses=127.0.0.1 -p ${port} -k ${runDir} -c fsync=${process.env.PG_FSYNC ?? "on"}`,
      "start",
    ];
    // In a session of its own (setsid), so a terminal's Ctrl-C, which signals the whole
    // foreground process group, never reaches PostgreSQL: the app stops it last, in order.
    const pgCtl = path.join(bin, "pg_ctl");
    const argv = isRoot ? ["--wait", "runuser", "-u", "postgres", "--", pgCtl, ...start] : ["--wait", pgCtl, ...start];
    const r = spawnSync("setsid", argv, { encoding: "utf8", stdio: ["ignore", "pipe", "pipe"] });
    if (r.status !== 0) throw startFailure(port, logFile, logFrom, r.stderr || r.stdout || "");
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
