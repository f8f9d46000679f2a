// `npm run bench [name]`: runs the benchmarks under bench/ (all when no name is given).
// Each reports ratios against a reference measured in the same run, never absolute gates.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";

const here = path.dirname(fileURLToPath(import.meta.url));
const wanted = process.argv[2];
const benches = fs.readdirSync(here).filter((f) => f.endsWith(".bench.ts") && (!wanted || f.startsWith(wanted)));
if (benches.length === 0) {
  console.error(`no benchmark named ${wanted}`);
  process.exit(1);
}
let failed = false;
for (const b of benches) {
  console.log(`== ${b}`);
  const r = spawnSync(process.execPath, ["--import", "tsx", path.join(here, b)], { stdio: "inherit" });
  failed ||= r.status !== 0;
}
process.exit(failed ? 1 : 0);
