// scripts/ensure-deps.sh (run by `npm start` and `npm test`) with a node_modules that is a
// link to an install shared by several checkouts: it must not run `npm ci`, which empties
// the linked folder for every checkout using it. `npm` here is a stand-in that records calls.
import { afterAll, describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");
const dir = fs.mkdtempSync(path.join(os.tmpdir(), "soundings-deps-"));
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

/** A checkout with the real script, a lockfile newer than the install, and a recording `npm`. */
function checkout(nodeModules: "link" | "folder") {
  const co = fs.mkdtempSync(path.join(dir, "co-"));
  fs.mkdirSync(path.join(co, "scripts"));
  fs.copyFileSync(path.join(root, "scripts", "ensure-deps.sh"), path.join(co, "scripts", "ensure-deps.sh"));
  const shared = path.join(co, "shared-install");
  fs.mkdirSync(shared);
  fs.writeFileSync(path.join(shared, ".package-lock.json"), "{}");
  fs.writeFileSync(path.join(shared, "some-package"), "installed");
  const old = new Date(Date.now() - 3600_000);
  fs.utimesSync(path.join(shared, ".package-lock.json"), old, old);
  fs.writeFileSync(path.join(co, "package-lock.json"), "{}"); // newer than the install
  if (nodeModules === "link") fs.symlinkSync(shared, path.join(co, "node_modules"));
  else fs.cpSync(shared, path.join(co, "node_modules"), { recursive: true, preserveTimestamps: true });
  const bin = path.join(co, "bin");
  fs.mkdirSync(bin);
  fs.writeFileSync(path.join(bin, "npm"), `#!/bin/sh\necho "$@" >> "${path.join(co, "npm-calls")}"\n`, { mode: 0o755 });
  const r = spawnSync("bash", ["scripts/ensure-deps.sh"], { cwd: co, env: { ...process.env, PATH: `${bin}:${process.env.PATH}` }, encoding: "utf8" });
  const calls = fs.existsSync(path.join(co, "npm-calls")) ? fs.readFileSync(path.join(co, "npm-calls"), "utf8") : "";
  return { r, calls, shared };
}

describe("ensure-deps", () => {
  it("leaves a linked, shared node_modules alone even when the lockfile looks newer", () => {
    const { r, calls, shared } = checkout("link");
    expect(r.status).toBe(0);
    expect(calls).toBe("");
    expect(r.stdout).toContain("node_modules is a link to a shared install");
    expect(fs.readFileSync(path.join(shared, "some-package"), "utf8")).toBe("installed");
  });

  it("still runs npm ci for a node_modules folder of its own whose lockfile changed", () => {
    const { r, calls } = checkout("folder");
    expect(r.status).toBe(0);
    expect(calls).toMatch(/^ci /);
  });
});
