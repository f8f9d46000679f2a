// Rubric rules as plain functions, used by the scoring screen (to guide) and the server (to
// decide): which criteria apply, whether a set of scores is complete and valid, whether two
// reads agree within tolerance, the credentialing credit, and per-finding outcomes.
import type { Criterion, Scores, ScoreValue } from "./types";
import type { FindingRead } from "../catalogue";

export interface ScoreIssue {
  path: string;
  message: string;
}

/** The criteria of a rubric that apply to an application, in display order. */
export const criteriaFor = (criteria: Criterion[], applicationCode: string) =>
  criteria.filter((c) => c.applications.length === 0 || c.applications.includes(applicationCode));

/** Position of a level value in its criterion (0 = first listed), or -1. */
export const levelIndex = (c: Criterion, v: ScoreValue | undefined) => c.levels.findIndex((l) => l.value === String(v));

/** Every problem with a set of scores: unknown keys, missing required ones, values out of range. */
export function scoreIssues(criteria: Criterion[], applicationCode: string, scores: Scores, rubricVersion: number): ScoreIssue[] {
  const issues: ScoreIssue[] = [];
  const applicable = criteriaFor(criteria, applicationCode);
  const byKey = new Map(applicable.map((c) => [c.key, c]));
  for (const key of Object.keys(scores)) {
    if (!byKey.has(key))
      issues.push({ path: `scores.${key}`, message: `"${key}" is not a criterion of this rubric (version ${rubricVersion}) for this application` });
  }
  for (const c of applicable) {
    const v = scores[c.key];
    if (v === undefined || v === null || v === "") {
      if (c.required) issues.push({ path: `scores.${c.key}`, message: `${c.label} is required` });
      continue;
    }
    if (c.kind === "number") {
      if (typeof v !== "number" || !Number.isFinite(v)) issues.push({ path: `scores.${c.key}`, message: `${c.label} must be a number` });
      else if ((c.min !== null && v < c.min) || (c.max !== null && v > c.max))
        issues.push({ path: `scores.${c.key}`, message: `${c.label} must be between ${c.min ?? "-∞"} and ${c.max ?? "∞"}` });
    } else if (levelIndex(c, v) < 0) {
      issues.push({ path: `scores.${c.key}`, message: `${c.label}: "${v}" is not one of its levels (${c.levels.map((l) => l.value).join(", ")})` });
    }
  }
  return issues;
}

/** Distance between two scores of one criterion: level steps, absolute difference, or 0/∞ for unordered choices. */
export function scoreDistance(c: Criterion, a: ScoreValue | undefined, b: ScoreValue | undefined): number {
  if (a === undefined || b === undefined) return a === b ? 0 : Infinity;
  if (c.kind === "number") return Math.abs(Number(a) - Number(b));
  if (c.kind === "ordinal") return Math.abs(levelIndex(c, a) - levelIndex(c, b));
  return String(a) === String(b) ? 0 : Infinity;
}

export interface Disagreement {
  key: string;
  a: ScoreValue | FindingRead | undefined;
  b: ScoreValue | FindingRead | undefined;
}

/** Criteria (and findings, as `read.<key>`) on which two reads differ by more than the tolerance. */
export function disagreements(
  criteria: Criterion[],
  applicationCode: string,
  a: { scores: Scores; reads: { key: string; read: FindingRead }[] },
  b: { scores: Scores; reads: { key: string; read: FindingRead }[] },
): Disagreement[] {
  const out: Disagreement[] = [];
  for (const c of criteriaFor(criteria, applicationCode)) {
    if (scoreDistance(c, a.scores[c.key], b.scores[c.key]) > c.tolerance) out.push({ key: c.key, a: a.scores[c.key], b: b.scores[c.key] });
  }
  const readsB = new Map(b.reads.map((r) => [r.key, r.read]));
  for (const r of a.reads) {
    if (readsB.get(r.key) !== r.read) out.push({ key: `read.${r.key}`, a: r.read, b: readsB.get(r.key) });
  }
  return out;
}

export type Outcome = "TP" | "FP" | "TN" | "FN" | "indeterminate";

/** The sonographer's read against the reference read (the reviewer's, or the final one). */
export function outcome(sonographer: FindingRead, reference: FindingRead): Outcome {
  if (sonographer === "indeterminate" || reference === "indeterminate") return "indeterminate";
  if (sonographer === "positive") return reference === "positive" ? "TP" : "FP";
  return reference === "negative" ? "TN" : "FN";
}

/**
 * Clinically significant disagreement (our rule, documented): on a clinical exam, any finding
 * the sonographer read definitely the other way from the reference (a false negative — a
 * possibly missed finding — or a false positive). Indeterminate reads are not counted.
 */
export function significantDisagreement(
  setting: string,
  sonographerReads: { key: string; read: FindingRead }[],
  referenceReads: { key: string; read: FindingRead }[],
): string[] {
  if (setting !== "clinical") return [];
  const ref = new Map(referenceReads.map((r) => [r.key, r.read]));
  return sonographerReads.filter((r) => ref.has(r.key) && ["FP", "FN"].includes(outcome(r.read, ref.get(r.key)!))).map((r) => r.key);
}

export interface CreditRule {
  /** Lowest acceptable level of the `quality` criterion (by its value). */
  minQuality: number;
}

export const DEFAULT_CREDIT_RULE: CreditRule = { minQuality: 3 };

/**
 * The findings the clinician read definitely the other way from the reference (false positives
 * and negatives), on any setting: a misread blocks credit on every setting, while the patient
 * callback (significantDisagreement) stays for clinical exams only.
 */
export function misreadFindings(sonographerReads: { key: string; read: FindingRead }[], referenceReads: { key: string; read: FindingRead }[]): string[] {
  return significantDisagreement("clinical", sonographerReads, referenceReads);
}

/** What the exam itself contributes to its credit beyond the scores. */
export interface CreditFacts {
  /** Labels of the findings misread (any setting). */
  misreads: string[];
  /** Labels of the required views with no clip, when the application's rule asks for a complete study. */
  missingViews: string[];
  /** The deciding read marked the study technically limited by patient factors. */
  limited: boolean;
}

export const NO_CREDIT_FACTS: CreditFacts = { misreads: [], missingViews: [], limited: false };

/** The reason a limited study gives (it earns no credit and is not counted as a failure of technique). */
export const LIMITED_REASON = "Technically limited by patient factors: not counted toward credit, and not a failure of technique";

/**
 * Credentialing credit (README "Review rules", derived results): quality at or above the
 * minimum, no critical criterion at a failing level, no misread finding, every required view
 * when the application asks for a complete study, and not marked technically limited.
 */
export function creditFor(
  criteria: Criterion[],
  applicationCode: string,
  scores: Scores,
  facts: CreditFacts,
  rule: CreditRule = DEFAULT_CREDIT_RULE,
): { credit: boolean; reasons: string[] } {
  const reasons: string[] = [];
  if (facts.limited) reasons.push(LIMITED_REASON);
  const applicable = criteriaFor(criteria, applicationCode);
  const quality = applicable.find((c) => c.key === "quality");
  // A limited study's image quality is the patient's, not the clinician's technique.
  if (quality && !facts.limited && !(Number(scores.quality) >= rule.minQuality)) reasons.push(`Image quality below ${rule.minQuality}`);
  for (const c of applicable.filter((x) => x.critical)) {
    const level = c.levels.find((l) => l.value === String(scores[c.key]));
    if (level?.fails) reasons.push(`${c.label}: ${level.label}`);
  }
  if (facts.misreads.length) reasons.push(`Misread: ${facts.misreads.join(", ")}`);
  if (facts.missingViews.length) reasons.push(`Incomplete study: no clip of ${facts.missingViews.join(", ")}`);
  return { credit: reasons.length === 0, reasons };
}
