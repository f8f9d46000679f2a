// Reviewer agreement from double reads. PostgreSQL does the heavy part — it pairs each
// exam's first and second read and, in one pass, counts value pairs per criterion (and per
// finding read) and per pair of reviewers (GROUP BY), so only small contingency tables
// reach Node. The shared statistics module takes those counts as rows with
// multiplicities, which gives exactly the figures of the same module on the raw rows.
import { cohensKappa, gwetAC1, krippendorffAlpha, percentAgreement, agreementBand, type Rating } from "../../shared/stats/index";
import type { Criterion } from "../../shared/rubric/types";
import { FINDING_READS } from "../../shared/catalogue";
import type { PairCount } from "../repositories/agreement";
import type { AgreementReport, CriterionAgreement, ReviewerBias } from "../../shared/schemas/reports";

/** Counted pairs as a two-column ratings matrix with one row per distinct pair and its count as multiplicity. */
export function countedRows(
  counts: readonly { a: string | null; b: string | null; n: number }[],
  toRating: (v: string | null) => string | number | null,
  opts: { complete?: boolean } = {},
): { rows: Rating[][]; multiplicity: number[]; units: number } {
  const rows: Rating[][] = [];
  const multiplicity: number[] = [];
  let units = 0;
  for (const c of counts) {
    const a = toRating(c.a);
    const b = toRating(c.b);
    if (opts.complete && (a === null || b === null)) continue;
    rows.push([a, b]);
    multiplicity.push(c.n);
    units += c.n;
  }
  return { rows, multiplicity, units };
}

/** Alpha's percentile bootstrap in the report: resamples and seed, fixed so a report is reproducible. */
export const ALPHA_BOOTSTRAP = { samples: 1000, seed: 20261201 } as const;

/** Ordinal levels become their rank so weighted kappa and ordinal alpha see the order. */
export function ratingOf(c: Criterion | undefined) {
  if (!c) return (v: string | null) => v;
  if (c.kind === "number") return (v: string | null) => (v === null ? null : Number(v));
  if (c.kind === "ordinal")
    return (v: string | null) => (v === null ? null : c.levels.findIndex((l) => l.value === v) >= 0 ? c.levels.findIndex((l) => l.value === v) : null);
  return (v: string | null) => (v === null || !c.levels.some((l) => l.value === v) ? null : v);
}

/** The agreement statistics of one criterion's counted read pairs. */
export function agreementOf(
  c: Criterion | { key: "read"; label: string; kind: "choice" },
  counts: readonly { a: string | null; b: string | null; n: number }[],
): CriterionAgreement {
  const crit = "levels" in c ? c : undefined;
  const toRating = ratingOf(crit);
  const all = countedRows(counts, toRating);
  const complete = countedRows(counts, toRating, { complete: true });
  const ordinal = crit?.kind === "ordinal";
  const numeric = crit?.kind === "number";
  const categories = ordinal
    ? crit!.levels.map((_, i) => i)
    : crit && !numeric
      ? crit.levels.map((l) => l.value)
      : c.key === "read"
        ? [...FINDING_READS]
        : undefined;
  const weights = ordinal || numeric ? "quadratic" : "unweighted";
  const some = complete.units > 0;
  const kappa = some ? cohensKappa(complete.rows, { weights, categories, multiplicity: complete.multiplicity }) : null;
  const alphaLevel = numeric ? "interval" : ordinal ? "ordinal" : "nominal";
  const alpha = all.units > 0 ? krippendorffAlpha(all.rows, { level: alphaLevel, multiplicity: all.multiplicity, bootstrap: ALPHA_BOOTSTRAP }) : null;
  const ac1 = some && !numeric ? gwetAC1(complete.rows, { categories, multiplicity: complete.multiplicity }) : null;
  const pa = some ? percentAgreement(complete.rows, { multiplicity: complete.multiplicity }) : null;
  return {
    key: c.key,
    label: c.label,
    kind: c.kind,
    units: complete.units,
    percentAgreement: pa?.value ?? null,
    kappa: { value: kappa?.value ?? null, ci95: kappa?.ci95 ?? null, weights },
    alpha: {
      value: alpha?.value ?? null,
      level: alphaLevel,
      ci95: alpha?.ci95 ?? null,
      bootstrap: alpha?.bootstrap ? { samples: alpha.bootstrap.samples, seed: alpha.bootstrap.seed, used: alpha.bootstrap.used } : null,
    },
    ac1: { value: ac1?.value ?? null, ci95: ac1?.ci95 ?? null },
    band: kappa?.value === null || kappa?.value === undefined ? null : agreementBand(kappa.value),
  };
}

export interface ReviewerPair {
  a: { id: string; name: string };
  b: { id: string; name: string };
  counts: { a: string | null; b: string | null; n: number }[];
}

/** One criterion's counts per unordered pair of reviewers ((A,B) and (B,A) are one pair; `a` is the smaller id). */
export function reviewerPairs(counts: readonly PairCount[], names: ReadonlyMap<string, string>): ReviewerPair[] {
  const pairs = new Map<string, ReviewerPair>();
  for (const r of counts) {
    const flip = r.ra > r.rb;
    const [x, y] = flip ? [r.rb, r.ra] : [r.ra, r.rb];
    const key = `${x}|${y}`;
    const entry = pairs.get(key) ?? { a: { id: x, name: names.get(x) ?? "" }, b: { id: y, name: names.get(y) ?? "" }, counts: [] };
    entry.counts.push(flip ? { a: r.b, b: r.a, n: r.n } : { a: r.a, b: r.b, n: r.n });
    pairs.set(key, entry);
  }
  return [...pairs.values()];
}

/**
 * Each reviewer's bias against consensus on a numeric or ordinal criterion: own value
 * (rank) minus the mean of the exam's two reads, i.e. ±(a − b)/2, averaged over the
 * reviewer's reads, with a normal-approximation interval of the mean (1.96 standard
 * errors; none from a single read). Counted pairs enter with their counts.
 */
export function biasAgainstConsensus(
  counts: readonly PairCount[],
  toRating: (v: string | null) => string | number | null,
  names: ReadonlyMap<string, string>,
): ReviewerBias[] {
  const diffs = new Map<string, { d: number; n: number }[]>();
  for (const r of counts) {
    const a = toRating(r.a);
    const b = toRating(r.b);
    if (typeof a !== "number" || typeof b !== "number") continue;
    for (const [who, d] of [
      [r.ra, (a - b) / 2],
      [r.rb, (b - a) / 2],
    ] as [string, number][]) {
      const xs = diffs.get(who) ?? [];
      xs.push({ d, n: r.n });
      diffs.set(who, xs);
    }
  }
  const bias: ReviewerBias[] = [];
  for (const [id, xs] of diffs) {
    const n = xs.reduce((s, x) => s + x.n, 0);
    const mean = xs.reduce((s, x) => s + x.n * x.d, 0) / n;
    const sd = n > 1 ? Math.sqrt(xs.reduce((s, x) => s + x.n * (x.d - mean) ** 2, 0) / (n - 1)) : null;
    bias.push({
      reviewer: { id, name: names.get(id) ?? "" },
      n,
      meanDifference: mean,
      ci95: sd === null ? null : [mean - (1.96 * sd) / Math.sqrt(n), mean + (1.96 * sd) / Math.sqrt(n)],
    });
  }
  return bias.sort((x, y) => x.reviewer.name.localeCompare(y.reviewer.name));
}

export const READ_CRITERION = { key: "read" as const, label: "Interpretation (reads of findings)", kind: "choice" as const };

export interface AgreementReportInput {
  query: { from?: string; to?: string; application?: string; reviewerA?: string; reviewerB?: string };
  /** The criterion the pair matrix, confusion matrix, bias and disagreements are about ("read" = the reads of findings). */
  chosenKey: string;
  /** The active rubric's criteria, then any older ones that still have counts. */
  criteria: Criterion[];
  counts: PairCount[];
  names: ReadonlyMap<string, string>;
  disagreements: AgreementReport["disagreements"];
}

/** The agreement report (GET /api/reports/agreement) from the counted read pairs. */
export function agreementReport({ query, chosenKey, criteria, counts, names, disagreements }: AgreementReportInput): AgreementReport {
  const byKey = countsByKey(counts);
  const rows = [...criteria.map((c) => agreementOf(c, byKey.get(c.key) ?? [])), agreementOf(READ_CRITERION, byKey.get("read") ?? [])];
  const chosen = criteria.find((c) => c.key === chosenKey);
  const toRating = ratingOf(chosen);
  const weights = chosen && (chosen.kind === "ordinal" || chosen.kind === "number") ? "quadratic" : "unweighted";
  const categoryValues = chosen ? chosen.levels.map((l) => ({ value: l.value, label: l.label })) : FINDING_READS.map((r) => ({ value: r, label: r }));
  const cats = chosen?.kind === "ordinal" ? chosen.levels.map((_, i) => i) : categoryValues.map((c) => c.value);

  // The chosen criterion per reviewer pair (none for the reads of findings).
  const chosenCounts = chosenKey === "read" ? [] : (byKey.get(chosenKey) ?? []);
  const pairList = reviewerPairs(chosenCounts, names);
  const pairs = pairList.map((p) => {
    const m = countedRows(p.counts, toRating, { complete: true });
    return {
      a: p.a,
      b: p.b,
      units: m.units,
      percentAgreement: m.units ? percentAgreement(m.rows, { multiplicity: m.multiplicity }).value : null,
      kappa: m.units >= 2 ? cohensKappa(m.rows, { weights, categories: cats, multiplicity: m.multiplicity }).value : null,
    };
  });

  // Confusion matrix: two chosen reviewers, or first read against second read.
  const byReviewers = chosenKey !== "read" && query.reviewerA && query.reviewerB;
  const chosenPair = byReviewers ? pairList.find((p) => [p.a.id, p.b.id].sort().join() === [query.reviewerA, query.reviewerB].sort().join()) : undefined;
  const confusionCounts = byReviewers
    ? (chosenPair?.counts.map((c) => (chosenPair.a.id === query.reviewerA ? c : { a: c.b, b: c.a, n: c.n })) ?? [])
    : (byKey.get(chosenKey) ?? []);
  const index = new Map(categoryValues.map((c, i) => [c.value, i]));
  const grid = categoryValues.map(() => categoryValues.map(() => 0));
  for (const c of confusionCounts) {
    const i = index.get(c.a ?? "");
    const j = index.get(c.b ?? "");
    if (i !== undefined && j !== undefined) grid[i][j] += c.n;
  }

  // Bias against consensus: own rank minus the mean of the exam's two reads, per reviewer.
  const bias = chosen && (chosen.kind === "ordinal" || chosen.kind === "number") ? biasAgainstConsensus(chosenCounts, toRating, names) : [];

  return {
    from: query.from ?? null,
    to: query.to ?? null,
    application: query.application ?? null,
    criterion: chosenKey,
    criteria: rows,
    pairs,
    confusion: {
      rowLabel: byReviewers ? (names.get(query.reviewerA!) ?? "Reviewer A") : "First read",
      colLabel: byReviewers ? (names.get(query.reviewerB!) ?? "Reviewer B") : "Second read",
      categories: categoryValues,
      counts: grid,
    },
    bias,
    disagreements,
  };
}

/** The counts grouped by criterion key. */
export function countsByKey(counts: readonly PairCount[]): Map<string, PairCount[]> {
  const byKey = new Map<string, PairCount[]>();
  for (const c of counts) byKey.set(c.key, [...(byKey.get(c.key) ?? []), c]);
  return byKey;
}
