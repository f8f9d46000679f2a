// Randomised cross-check against general-purpose reference implementations run in
// Python (tests/reference/stats_reference.py): scikit-learn's cohen_kappa_score,
// statsmodels' cohens_kappa (standard error), fleiss_kappa and Wilson interval, scipy's
// incomplete beta / F / normal quantiles, and independent numpy write-ups where no
// packaged implementation exists (Krippendorff's alpha from explicit value pairs, Gwet's
// generalised Fleiss kappa and AC1 with their variances, ICC from a least-squares ANOVA
// with scipy F quantiles). Needs the Debian packages python3-statsmodels and
// python3-sklearn; set SOUNDINGS_PYTHON to pick the interpreter (default /usr/bin/python3,
// the one Debian's packages install into, else python3 on PATH).
//
// Tolerance 1e-9 absolute: both sides compute in double precision by a few hundred
// operations, so observed differences are ~1e-14 for the O(1) coefficients and ~1e-12 for
// the rare large negative lower ICC limits (average measures, e.g. −92); the F quantiles
// (own inverse incomplete beta vs scipy) agree to ~1e-13 relative. Perturbing a single
// formula term by 1e-7 makes the comparison fail, so 1e-9 still discriminates.
import { execFileSync } from "node:child_process";
import { existsSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { beforeAll, describe, expect, it } from "vitest";
import {
  cohensKappa,
  fleissKappa,
  fQuantile,
  gwetAC1,
  icc,
  incompleteBeta,
  krippendorffAlpha,
  mulberry32,
  normalQuantile,
  percentAgreement,
  wilsonInterval,
} from "./index";
import type { IccModel, IccUnit, KappaWeights } from "./index";

const TOL = 1e-9;
const SCRIPT = fileURLToPath(new URL("../../tests/reference/stats_reference.py", import.meta.url));
const PYTHON = process.env.SOUNDINGS_PYTHON ?? (existsSync("/usr/bin/python3") ? "/usr/bin/python3" : "python3");

type Cell = number | null;
type Case = Record<string, unknown> & { stat: string };
type Ref = Record<string, unknown>;

const rand = mulberry32(20250101);
const int = (lo: number, hi: number): number => lo + Math.floor(rand() * (hi - lo + 1));
const normal = (): number => Math.sqrt(-2 * Math.log(1 - rand())) * Math.cos(2 * Math.PI * rand());
const range = (q: number): number[] => Array.from({ length: q }, (_, i) => i);

// Ratings that agree more often than chance (each rater copies a unit's "true" category
// with probability 0.6), so that coefficients spread over a realistic range.
function categorical(units: number, raters: number, q: number, missing: number, offset = 0): Cell[][] {
  return Array.from({ length: units }, () => {
    const truth = int(0, q - 1);
    return Array.from({ length: raters }, () => {
      if (rand() < missing) return null;
      return (rand() < 0.6 ? truth : int(0, q - 1)) + offset;
    });
  });
}

// Checklist-total-like scores: unit effect + rater bias + noise, rounded to integers.
function numeric(units: number, raters: number): Cell[][] {
  const bias = Array.from({ length: raters }, () => normal());
  return Array.from({ length: units }, () => {
    const level = 10 + 3 * normal();
    return bias.map((b) => (rand() < 0.05 ? null : Math.round(level + b + 1.5 * normal())));
  });
}

const cases: Case[] = [];
const checks: Array<(ref: Ref) => void> = [];
function add(c: Case, check: (ref: Ref) => void): void {
  cases.push(c);
  checks.push(check);
}

function close(actual: number | null | undefined, expected: unknown, label: string): void {
  if (expected === null || expected === undefined) {
    expect(actual ?? null, label).toBeNull();
    return;
  }
  expect(typeof actual, label).toBe("number");
  expect(Math.abs((actual as number) - (expected as number)), `${label}: ${actual} vs ${String(expected)}`).toBeLessThanOrEqual(TOL);
}

function closeInterval(actual: [number, number] | null | undefined, expected: unknown, label: string): void {
  const e = expected as [number, number] | null;
  if (e === null) return expect(actual ?? null, label).toBeNull();
  close(actual?.[0], e[0], `${label} lower`);
  close(actual?.[1], e[1], `${label} upper`);
}

const counted: Record<string, number> = {};
const tally = (name: string, value: number | null): void => {
  if (value !== null) counted[name] = (counted[name] ?? 0) + 1;
};

// --- Cohen's kappa: 50 two-rater matrices × 3 weightings ----------------------------
for (let i = 0; i < 50; i++) {
  const q = int(2, 5);
  const matrix = categorical(int(6, 60), 2, q, i % 2 === 0 ? 0 : 0.15);
  for (const weights of ["unweighted", "linear", "quadratic"] as KappaWeights[]) {
    add({ stat: "cohen", matrix, q, weights }, (ref) => {
      const r = cohensKappa(matrix, { weights, categories: range(q) });
      const label = `cohen ${weights} #${i}`;
      close(r.value, ref.value, `${label} value (sklearn)`);
      close(r.value, ref.sm_value, `${label} value (statsmodels)`);
      close(r.se, ref.se, `${label} se (statsmodels)`);
      closeInterval(r.ci95, ref.ci95, `${label} ci95`);
      tally(`cohen ${weights}`, r.value);
    });
  }
}

// --- Fleiss' kappa: 25 complete (statsmodels) + 25 with missing ratings (Gwet) ------
for (let i = 0; i < 50; i++) {
  const q = int(2, 5);
  const matrix = categorical(int(5, 40), int(2, 5), q, i < 25 ? 0 : 0.2);
  add({ stat: "fleiss", matrix, q }, (ref) => {
    const r = fleissKappa(matrix);
    close(r.value, ref.value, `fleiss #${i} value (Gwet generalised)`);
    if (i < 25) close(r.value, ref.sm_value, `fleiss #${i} value (statsmodels)`);
    close(r.se, ref.se, `fleiss #${i} se`);
    closeInterval(r.ci95, ref.ci95, `fleiss #${i} ci95`);
    tally(i < 25 ? "fleiss complete" : "fleiss missing", r.value);
  });
}

// --- Gwet's AC1 and percent agreement ------------------------------------------------
for (let i = 0; i < 50; i++) {
  const q = int(2, 5);
  const matrix = categorical(int(5, 40), int(2, 5), q, i % 2 === 0 ? 0 : 0.2);
  add({ stat: "ac1", matrix, q }, (ref) => {
    const r = gwetAC1(matrix, { categories: range(q) });
    close(r.value, ref.value, `ac1 #${i} value`);
    close(r.se, ref.se, `ac1 #${i} se`);
    closeInterval(r.ci95, ref.ci95, `ac1 #${i} ci95`);
    tally("ac1", r.value);
  });
  const matrix2 = categorical(int(2, 40), int(2, 5), q, 0.3);
  add({ stat: "percent", matrix: matrix2 }, (ref) => {
    const r = percentAgreement(matrix2);
    close(r.value, ref.value, `percent #${i}`);
    tally("percent", r.value);
  });
}

// --- Krippendorff's alpha: 50 matrices × 4 levels, values 1..q, missing ratings ------
for (let i = 0; i < 50; i++) {
  const q = int(2, 5);
  const matrix = categorical(int(4, 30), int(2, 5), q, 0.25, 1);
  for (const level of ["nominal", "ordinal", "interval", "ratio"] as const) {
    add({ stat: "alpha", matrix, level }, (ref) => {
      const r = krippendorffAlpha(matrix, { level });
      close(r.value, ref.value, `alpha ${level} #${i}`);
      tally(`alpha ${level}`, r.value);
    });
  }
}

// --- ICC: 50 matrices × 3 models × 2 units ------------------------------------------
for (let i = 0; i < 50; i++) {
  let matrix: Cell[][];
  do matrix = numeric(int(3, 30), int(2, 5));
  while (matrix.filter((row) => row.every((v) => v !== null)).length < 3);
  for (const model of ["oneway", "twoway-random", "twoway-mixed"] as IccModel[])
    for (const unit of ["single", "average"] as IccUnit[])
      add({ stat: "icc", matrix, model, unit }, (ref) => {
        const r = icc(matrix, { model, unit });
        close(r.value, ref.value, `icc ${model} ${unit} #${i} value`);
        closeInterval(r.ci95, ref.ci95, `icc ${model} ${unit} #${i} ci95`);
        tally(`icc ${model} ${unit}`, r.value);
      });
}

// --- Wilson intervals ----------------------------------------------------------------
for (let i = 0; i < 50; i++) {
  const n = int(1, 300);
  const successes = i % 10 === 0 ? 0 : i % 10 === 1 ? n : int(0, n);
  const confidence = [0.8, 0.9, 0.95, 0.99][i % 4] + (i >= 40 ? rand() * 0.009 : 0);
  add({ stat: "wilson", successes, n, confidence }, (ref) => {
    const [lo, hi] = wilsonInterval(successes, n, confidence);
    const e = ref.ci as [number, number];
    close(lo, e[0], `wilson ${successes}/${n} @${confidence} lower`);
    close(hi, e[1], `wilson ${successes}/${n} @${confidence} upper`);
    tally("wilson", lo);
  });
}

// --- Distribution functions ----------------------------------------------------------
const logUniform = (lo: number, hi: number): number => Math.exp(Math.log(lo) + rand() * (Math.log(hi) - Math.log(lo)));
for (let i = 0; i < 50; i++) {
  const a = logUniform(0.3, 300);
  const b = logUniform(0.3, 300);
  const x = rand();
  const p = i < 20 ? [0.025, 0.05, 0.5, 0.95, 0.975][i % 5] : 0.001 + 0.998 * rand();
  const df1 = logUniform(0.5, 500);
  const df2 = logUniform(0.5, 500);
  add({ stat: "dist", a, b, x, p, df1, df2 }, (ref) => {
    expect(Math.abs(incompleteBeta(x, a, b) - (ref.betainc as number)), `betainc(${x}; ${a}, ${b})`).toBeLessThan(1e-12);
    const f = fQuantile(p, df1, df2);
    expect(Math.abs(f / (ref.fppf as number) - 1), `F ppf(${p}; ${df1}, ${df2})`).toBeLessThan(TOL);
    expect(Math.abs(normalQuantile(p) - (ref.normppf as number)), `norm ppf(${p})`).toBeLessThan(1e-12);
    tally("dist", f);
  });
}

describe("cross-check against Python reference libraries (seeded random cases)", () => {
  let refs: Ref[] = [];
  beforeAll(() => {
    const out = execFileSync(PYTHON, [SCRIPT], {
      input: JSON.stringify(cases),
      maxBuffer: 64 * 1024 * 1024,
      encoding: "utf8",
    });
    refs = JSON.parse(out) as Ref[];
  }, 60_000);

  it("gets one reference result per case", () => {
    expect(refs).toHaveLength(cases.length);
  });

  it("matches on every case", () => {
    checks.forEach((check, i) => check(refs[i]));
    // Guard against a vacuous pass: nearly all random cases must yield a defined value.
    for (const [name, min] of Object.entries({
      "cohen unweighted": 48,
      "cohen linear": 48,
      "cohen quadratic": 48,
      "fleiss complete": 24,
      "fleiss missing": 24,
      ac1: 48,
      percent: 48,
      "alpha nominal": 48,
      "alpha ordinal": 48,
      "alpha interval": 48,
      "alpha ratio": 48,
      "icc oneway single": 50,
      "icc twoway-random single": 50,
      "icc twoway-mixed average": 50,
      wilson: 50,
      dist: 50,
    }))
      expect(counted[name] ?? 0, name).toBeGreaterThanOrEqual(min);
  });
});
