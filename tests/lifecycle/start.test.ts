// `npm start` (scripts/start.ts) from a checkout without a client build, as a user runs it:
// its own process group (a terminal's foreground group), its own PostgreSQL cluster, the
// harness's fake mail server. The first start serves the sign-in page in Chromium, binds
// loopback only, and Ctrl-C (SIGINT to the whole group) stops everything quietly and in
// order, cluster last. A Ctrl-C during start-up stops at once, without serving.
import { afterAll, describe, expect, it } from "vitest";
import { spawn, type ChildProcess } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { chromium } from "@playwright/test";
import { chromiumLaunchOptions } from "../browser/chromium";
import { freePort, portInUse } from "../../scripts/lib/postgres";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");
const cleanups: (() => unknown)[] = [];
afterAll(async () => {
  for (const c of cleanups.reverse()) await c();
});

interface Started {
  child: ChildProcess;
  output: () => string;
  exited: Promise<number | null>;
}

/** A folder of this test's own, removed afterwards (enterable by the postgres user). */
function tempDir(prefix: string): string {
  const dir = fs.mkdtempSync(path.join(process.getuid?.() === 0 ? "/var/tmp" : os.tmpdir(), prefix));
  fs.chmodSync(dir, 0o755);
  cleanups.push(() => fs.rmSync(dir, { recursive: true, force: true }));
  return dir;
}

/** scripts/start.ts in a new process group, with a cluster folder and client folder of its own. */
async function start(pgDir: string, clientDist: string): Promise<Started> {
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    PORT: String(await freePort()),
    PG_PORT: String(await freePort()),
    PG_DIR: pgDir,
    PG_FSYNC: "off",
    CLIENT_DIST: clientDist,
    SEED_DEMO_EXAMS: "false",
    STORAGE_DIR: path.join(pgDir, "storage"),
    UPLOAD_TMP_DIR: path.join(pgDir, "uploads"),
  };
  delete env.DATABASE_URL; // the harness's database: this start brings its own cluster
  delete env.HOST;
  const child = spawn(process.execPath, ["--import", "tsx", "scripts/start.ts"], { cwd: root, env, detached: true, stdio: ["ignore", "pipe", "pipe"] });
  let out = "";
  child.stdout!.on("data", (d) => (out += d));
  child.stderr!.on("data", (d) => (out += d));
  const exited = new Promise<number | null>((r) => child.once("exit", (code) => r(code)));
  cleanups.push(() => {
    if (child.exitCode === null) {
      try {
        process.kill(-child.pid!, "SIGKILL");
      } catch {
        // already gone
      }
    }
  });
  return { child, output: () => out, exited };
}

async function waitFor(what: string, check: () => boolean, ms: number) {
  const deadline = Date.now() + ms;
  while (!check()) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/**
 * The live processes of group `pgid`, zombies left out: an orphan (vite's esbuild, say) is
 * reparented to PID 1, and this machine's init may reap it late, so `kill(-pgid, 0)` alone
 * would count a process that has ended.
 */
function groupMembers(pgid: number): number[] {
  return fs
    .readdirSync("/proc")
    .filter((d) => /^\d+$/.test(d))
    .flatMap((d) => {
      let stat: string;
      try {
        stat = fs.readFileSync(`/proc/${d}/stat`, "utf8");
      } catch {
        return []; // ended while we looked
      }
      // Fields after "(comm)": state, ppid, pgrp, ...
      const [state, , pgrp] = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
      return Number(pgrp) === pgid && state !== "Z" ? [Number(d)] : [];
    });
}

/** The command line of `pid`, or "" once it has ended. */
function readCmdline(pid: number): string {
  try {
    return fs.readFileSync(`/proc/${pid}/cmdline`, "utf8").replaceAll("\0", " ");
  } catch {
    return "";
  }
}

/** True while any process of the group `pgid` still runs a short while after its leader ended. */
async function groupAlive(pgid: number): Promise<boolean> {
  // A grandchild may take a moment to notice its parent is gone (esbuild reads its stdin).
  const deadline = Date.now() + 5_000;
  while (groupMembers(pgid).length > 0) {
    if (Date.now() > deadline) return true;
    await new Promise((r) => setTimeout(r, 100));
  }
  return false;
}

/** True while `pid` runs (a zombie, ended but not yet reaped, counts as ended). */
function pidAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
  } catch {
    return false;
  }
  const stat = fs.existsSync(`/proc/${pid}/stat`) ? fs.readFileSync(`/proc/${pid}/stat`, "utf8") : "";
  return !/^\d+ \(.*\) Z/.test(stat);
}

/** Lines that must never show in a stop: connection errors and stack frames. */
const NOISE = /ECONNREFUSED|terminating connection|Acquire connection|Connection terminated|^\s+at .+:\d+:\d+\)?$/m;

describe("npm start", () => {
  it("stops at once, without serving, when Ctrl-C comes while the client builds", async () => {
    const pgDir = tempDir("soundings-start-stop-");
    const clientDist = `dist-lifecycle-${crypto.randomBytes(4).toString("hex")}`;
    cleanups.push(() => fs.rmSync(path.join(root, clientDist), { recursive: true, force: true }));
    const run = await start(pgDir, clientDist);
    await waitFor("the client build to begin", () => run.output().includes("Building the client"), 120_000);
    process.kill(-run.child.pid!, "SIGINT");
    expect(await run.exited).toBe(0);
    expect(run.output()).toContain("Stopped.");
    expect(run.output()).not.toContain("Soundings is running");
    expect(run.output()).not.toMatch(/client build failed/i);
    expect(run.output()).not.toMatch(NOISE);
    expect(fs.existsSync(path.join(pgDir, "data", "postmaster.pid"))).toBe(false);
    expect(await groupAlive(run.child.pid!)).toBe(false);
  }, 180_000);

  it("takes a build ended by Ctrl-C for a stop even when the build's exit is seen before the signal", async () => {
    // The order of the two events is up to the machine; SIGINT to the build alone is the
    // case where its exit comes first (one fresh-clone run exited 1 so).
    const pgDir = tempDir("soundings-start-build-");
    const clientDist = `dist-lifecycle-${crypto.randomBytes(4).toString("hex")}`;
    cleanups.push(() => fs.rmSync(path.join(root, clientDist), { recursive: true, force: true }));
    const run = await start(pgDir, clientDist);
    let build: number | undefined;
    await waitFor(
      "the client build to begin",
      () => (build = groupMembers(run.child.pid!).find((pid) => pid !== run.child.pid && readCmdline(pid).includes("vite.js"))) !== undefined,
      120_000,
    );
    process.kill(build!, "SIGINT");
    expect(await run.exited).toBe(0);
    expect(run.output()).toContain("Stopped.");
    expect(run.output()).not.toMatch(/client build (failed|was stopped)/i);
    expect(run.output()).not.toContain("Soundings is running");
  }, 180_000);

  it("serves the sign-in page on its first start from a checkout without a client build, and Ctrl-C stops everything", async () => {
    const pgDir = tempDir("soundings-start-");
    const clientDist = `dist-lifecycle-${crypto.randomBytes(4).toString("hex")}`;
    expect(fs.existsSync(path.join(root, clientDist))).toBe(false);
    cleanups.push(() => fs.rmSync(path.join(root, clientDist), { recursive: true, force: true }));
    const run = await start(pgDir, clientDist);
    await waitFor("Soundings to serve", () => /Soundings is running at (\S+)/.test(run.output()) || run.child.exitCode !== null, 240_000);
    const url = run.output().match(/Soundings is running at (\S+)/)?.[1];
    expect(url, run.output()).toBeDefined();
    const { port } = new URL(url!);

    // Loopback only: another local address (127.0.0.2 is the loopback device as well) is refused.
    expect(new URL(url!).hostname).toBe("127.0.0.1");
    expect(await portInUse(Number(port), "127.0.0.2")).toBe(false);

    const browser = await chromium.launch(chromiumLaunchOptions);
    try {
      const page = await browser.newPage();
      await page.goto(`${url}/`);
      await page.getByRole("heading", { name: "Sign in" }).waitFor({ timeout: 15_000 });
      await page.getByRole("button", { name: "Sign in" }).waitFor();
    } finally {
      await browser.close();
    }

    const postmaster = Number(fs.readFileSync(path.join(pgDir, "data", "postmaster.pid"), "utf8").split("\n")[0]);
    expect(pidAlive(postmaster)).toBe(true);
    process.kill(-run.child.pid!, "SIGINT"); // what a terminal's Ctrl-C does
    expect(await run.exited).toBe(0);
    const stop = run.output().slice(run.output().indexOf("Press Ctrl-C to stop."));
    expect(stop).toContain("Stopped.");
    expect(stop).not.toMatch(NOISE);
    // pg_ctl's stop returns once the pid file is gone; the process ends (and is reaped) just after.
    await waitFor("the postmaster to end", () => !pidAlive(postmaster), 5_000);
    expect(fs.existsSync(path.join(pgDir, "data", "postmaster.pid"))).toBe(false);
    expect(await groupAlive(run.child.pid!)).toBe(false);
  }, 300_000);
});
