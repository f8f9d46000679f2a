// Fleiss' kappa and Krippendorff's alpha (nominal) on 100,000 units × 4 raters, timed
// beside reference implementations in the same run: statsmodels' fleiss_kappa (with
// aggregate_raters) and a vectorised numpy alpha (coincidence matrix by bincount), since
// no Debian library ships Krippendorff's alpha. Only the computation is timed on each side.
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { fleissKappa, krippendorffAlpha, mulberry32, type Rating } from "../shared/stats/index";

const UNITS = 100_000;
const RATERS = 4;
const CATEGORIES = 5;
const rand = mulberry32(20261201);
const complete: Rating[][] = [];
const missing: Rating[][] = [];
const bytesComplete = Buffer.alloc(UNITS * RATERS);
const bytesMissing = Buffer.alloc(UNITS * RATERS);
for (let u = 0; u < UNITS; u++) {
  const truth = Math.floor(rand() * CATEGORIES);
  const row: Rating[] = [];
  const rowMissing: Rating[] = [];
  for (let r = 0; r < RATERS; r++) {
    const v = rand() < 0.7 ? truth : Math.floor(rand() * CATEGORIES);
    row.push(v);
    const m = rand() < 0.05 ? null : v;
    rowMissing.push(m);
    bytesComplete[u * RATERS + r] = v;
    bytesMissing[u * RATERS + r] = m === null ? 255 : v;
  }
  complete.push(row);
  missing.push(rowMissing);
}
const dir = fs.mkdtempSync(path.join(os.tmpdir(), "soundings-bench-stats-"));
fs.writeFileSync(path.join(dir, "complete.bin"), bytesComplete);
fs.writeFileSync(path.join(dir, "missing.bin"), bytesMissing);

const time = (f: () => unknown) => {
  const runs: number[] = [];
  let result: unknown;
  for (let i = 0; i < 3; i++) {
    const t0 = performance.now();
    result = f();
    runs.push(performance.now() - t0);
  }
  runs.sort((a, b) => a - b);
  return { ms: runs[1], result };
};
const categories = [0, 1, 2, 3, 4];
const fleiss = time(() => fleissKappa(complete, { categories }));
const alpha = time(() => krippendorffAlpha(missing, { level: "nominal" }));

const python = `
import numpy as np, time, json, sys
from statsmodels.stats.inter_rater import fleiss_kappa, aggregate_raters
d = sys.argv[1]; U, R, Q = ${UNITS}, ${RATERS}, ${CATEGORIES}
full = np.fromfile(d + "/complete.bin", dtype=np.uint8).reshape(U, R).astype(int)
miss = np.fromfile(d + "/missing.bin", dtype=np.uint8).reshape(U, R).astype(int)
def med(f):
    ts = []
    for _ in range(3):
        t = time.perf_counter(); v = f(); ts.append((time.perf_counter() - t) * 1000)
    return sorted(ts)[1], v
def fk():
    table, _ = aggregate_raters(full, n_cat=Q)
    return fleiss_kappa(table, method="fleiss")
def alpha():
    counts = np.zeros((U, Q))
    for r in range(R):
        ok = miss[:, r] != 255
        np.add.at(counts, (np.nonzero(ok)[0], miss[ok, r]), 1)
    m = counts.sum(1); keep = m >= 2; c = counts[keep]; m = m[keep]
    o = (c[:, :, None] * c[:, None, :] - np.einsum("ij,jk->ijk", c, np.eye(Q))) / (m - 1)[:, None, None]
    o = o.sum(0); n = o.sum(); nc = o.sum(1)
    do = n - np.trace(o); de = (n * n - (nc * nc).sum()) / (n - 1)
    return 1 - do / de
tf, vf = med(fk); ta, va = med(alpha)
print(json.dumps({"fleiss_ms": tf, "fleiss": vf, "alpha_ms": ta, "alpha": va}))
`;
const ref = JSON.parse(execFileSync(fs.existsSync("/usr/bin/python3") ? "/usr/bin/python3" : "python3", ["-c", python, dir], { encoding: "utf8" }));
fs.rmSync(dir, { recursive: true, force: true });
const f = fleiss.result as { value: number };
const a = alpha.result as { value: number };
console.log(
  `Fleiss' kappa  ours ${fleiss.ms.toFixed(0)} ms (κ ${f.value.toFixed(6)})  statsmodels ${ref.fleiss_ms.toFixed(0)} ms (κ ${ref.fleiss.toFixed(6)})  ratio ${(fleiss.ms / ref.fleiss_ms).toFixed(2)}`,
);
console.log(
  `Krippendorff α ours ${alpha.ms.toFixed(0)} ms (α ${a.value.toFixed(6)})  numpy ${ref.alpha_ms.toFixed(0)} ms (α ${ref.alpha.toFixed(6)})  ratio ${(alpha.ms / ref.alpha_ms).toFixed(2)}`,
);
console.log("target: ratio below 1 (faster than the reference); values must agree");
console.log(`load average while measuring: ${os.loadavg()[0].toFixed(1)} on ${os.cpus().length} cores`);
if (Math.abs(f.value - ref.fleiss) > 1e-9 || Math.abs(a.value - ref.alpha) > 1e-9) process.exitCode = 1;
