// Fails when the client's entry chunk (what every first visit downloads) exceeds its
// budget, gzipped. Lazy route chunks are reported but not limited here.
import fs from "node:fs";
import path from "node:path";
import zlib from "node:zlib";

const BUDGET_KB = Number(process.env.ENTRY_BUDGET_KB ?? 200);
const dist = path.resolve(process.env.CLIENT_DIST ?? "dist");
const html = fs.readFileSync(path.join(dist, "index.html"), "utf8");
const entries = [...html.matchAll(/<script[^>]+src="\/?([^"]+\.js)"/g)].map((m) => m[1]);
const preloads = [...html.matchAll(/<link[^>]+rel="modulepreload"[^>]+href="\/?([^"]+\.js)"/g)].map((m) => m[1]);
if (entries.length === 0) {
  console.error("bundle budget: no entry script found in dist/index.html");
  process.exit(1);
}
const gz = (f: string) => zlib.gzipSync(fs.readFileSync(path.join(dist, f))).length / 1024;
const total = [...new Set([...entries, ...preloads])].reduce((s, f) => s + gz(f), 0);
console.log(`bundle budget: entry ${[...entries, ...preloads].join(" + ")} = ${total.toFixed(1)} kB gzip (budget ${BUDGET_KB} kB)`);
if (total > BUDGET_KB) {
  console.error(`bundle budget exceeded by ${(total - BUDGET_KB).toFixed(1)} kB`);
  process.exit(1);
}
