// A calibration set's results from its reads, as plain functions: agreement among all the
// set's reviewers per criterion (Fleiss' kappa over exams every reviewer read, Krippendorff's
// alpha over all reads) plus the reads of findings, and each reviewer against the QA lead's
// reference answers (exact matches, summed and per exam).
import type { Criterion, ScoreValue } from "../../shared/rubric/types";
import type { FindingRead } from "../../shared/catalogue";
import { criteriaFor } from "../../shared/rubric/logic";
import { agreementBand, fleissKappa, krippendorffAlpha } from "../../shared/stats/index";
import { ratingOf } from "../reports/agreement";
import type { ReferenceAnswer } from "../../shared/schemas/calibration";

export interface ItemRow {
  examId: string;
  code: string;
  application: { code: string; name: string };
  reference: ReferenceAnswer | null;
}

export interface ReadRow {
  examId: string;
  reviewerId: string;
  scores: Record<string, ScoreValue>;
  reads: { key: string; read: FindingRead }[];
}

export interface Person {
  id: string;
  name: string;
}

const READ_WORDS: Record<FindingRead, string> = { positive: "Positive", negative: "Negative", indeterminate: "Indeterminate" };
const READS: FindingRead[] = ["positive", "negative", "indeterminate"];
/** The reads of findings as one more row of the agreement table (as on the agreement report). */
export const READ_ROW = { key: "read", label: "Interpretation (reads of findings)" } as const;

const share = (matched: number, compared: number) => (compared ? matched / compared : null);

/** Fleiss' kappa on the complete rows, alpha on all rows, and the band read from kappa. */
function agreementRow(
  key: string,
  label: string,
  matrix: (string | number | null)[][],
  reviewers: number,
  opts: { categories?: (string | number)[]; level: "nominal" | "ordinal" | "interval" },
) {
  // Only units every reviewer has rated; with fewer than two readers there is nothing to compare.
  const completeRows = reviewers < 2 ? [] : matrix.filter((row) => row.every((v) => v !== null));
  const fleiss = completeRows.length && opts.categories ? fleissKappa(completeRows, { categories: opts.categories }) : null;
  const alpha = krippendorffAlpha(matrix, { level: opts.level });
  return {
    key,
    label,
    units: completeRows.length,
    fleiss: fleiss ? { value: fleiss.value, ci95: fleiss.ci95 } : null,
    alpha: { value: alpha.value },
    band: fleiss?.value == null ? null : agreementBand(fleiss.value),
  };
}

/** The results document of GET /calibration-sets/:id/results (without the set's id and name). */
export function calibrationResults(
  items: ItemRow[],
  reads: ReadRow[],
  reviewers: Person[],
  rubricCriteria: Criterion[],
  /** An application's findings in catalogue order. */
  findingsOf: (applicationCode: string) => { key: string; label: string }[],
) {
  const readOf = (examId: string, reviewerId: string) => reads.find((r) => r.examId === examId && r.reviewerId === reviewerId);
  const apps = [...new Set(items.map((i) => i.application.code))];
  // Criteria that apply to at least one exam of the set; on exams they do not apply to, nobody rates them.
  const criteria = rubricCriteria.filter((c) => apps.some((a) => criteriaFor([c], a).length > 0));
  const perCriterion = criteria.map((c) => {
    const rate = ratingOf(c);
    // One row per exam, one column per reviewer; a missing read is null.
    const matrix = items.map((it) =>
      criteriaFor([c], it.application.code).length === 0
        ? reviewers.map(() => null)
        : reviewers.map((rv) => {
            const v = readOf(it.examId, rv.id)?.scores?.[c.key];
            return rate(v === undefined || v === null ? null : String(v)) as string | number | null;
          }),
    );
    const categories = c.kind === "ordinal" ? c.levels.map((_, i) => i) : c.kind === "number" ? undefined : c.levels.map((l) => l.value);
    return agreementRow(c.key, c.label, matrix, reviewers.length, {
      categories,
      level: c.kind === "ordinal" ? "ordinal" : c.kind === "number" ? "interval" : "nominal",
    });
  });
  // Reads of findings: one unit per exam and finding any reviewer read.
  const readMatrix = items.flatMap((it) => {
    const keys = [...new Set(reads.filter((r) => r.examId === it.examId).flatMap((r) => r.reads.map((x) => x.key)))].sort();
    return keys.map((key) => reviewers.map((rv) => readOf(it.examId, rv.id)?.reads.find((x) => x.key === key)?.read ?? null));
  });
  const readRow = agreementRow(READ_ROW.key, READ_ROW.label, readMatrix, reviewers.length, { categories: READS, level: "nominal" });

  const criterionByKey = new Map(rubricCriteria.map((c) => [c.key, c]));
  const scoreLabel = (key: string, v: ScoreValue) => criterionByKey.get(key)?.levels.find((l) => l.value === String(v))?.label ?? String(v);
  // Rows in the rubric's and the catalogue's order; unknown keys last.
  const LAST = Number.MAX_SAFE_INTEGER;
  const order = (key: string) => {
    const i = rubricCriteria.findIndex((c) => c.key === key);
    return i < 0 ? LAST : i;
  };
  const findingOrder = (app: string, key: string) => {
    const i = findingsOf(app).findIndex((f) => f.key === key);
    return i < 0 ? LAST : i;
  };
  const withReference = items.filter((it): it is ItemRow & { reference: ReferenceAnswer } => it.reference !== null);

  // Per reference exam: each reference value beside every reviewer's, matched exactly or not.
  const referenceDetail = withReference.map((it) => ({
    examId: it.examId,
    code: it.code,
    rows: [
      ...Object.entries(it.reference.scores)
        .sort(([a], [b]) => order(a) - order(b))
        .map(([key, value]) => ({
          kind: "score" as const,
          key,
          label: criterionByKey.get(key)?.label ?? key,
          reference: { value, label: scoreLabel(key, value) },
          given: reviewers.map((rv) => {
            const mine = readOf(it.examId, rv.id)?.scores?.[key];
            return mine === undefined || mine === null
              ? { reviewerId: rv.id, value: null, label: null, matches: null }
              : { reviewerId: rv.id, value: mine, label: scoreLabel(key, mine), matches: String(mine) === String(value) };
          }),
        })),
      ...[...(it.reference.reads ?? [])]
        .sort((a, b) => findingOrder(it.application.code, a.key) - findingOrder(it.application.code, b.key))
        .map((r) => ({
          kind: "read" as const,
          key: r.key,
          label: findingsOf(it.application.code).find((f) => f.key === r.key)?.label ?? r.key,
          reference: { value: r.read, label: READ_WORDS[r.read] },
          given: reviewers.map((rv) => {
            const mine = readOf(it.examId, rv.id)?.reads.find((x) => x.key === r.key)?.read;
            return mine === undefined
              ? { reviewerId: rv.id, value: null, label: null, matches: null }
              : { reviewerId: rv.id, value: mine, label: READ_WORDS[mine], matches: mine === r.read };
          }),
        })),
    ],
  }));

  // Each reviewer against the reference: scores and finding reads matched exactly, out of those compared.
  const vsReference = reviewers.map((rv, i) => {
    const tally = (kind: "score" | "read") => {
      const cells = referenceDetail.flatMap((d) => d.rows.filter((r) => r.kind === kind).map((r) => r.given[i]));
      const compared = cells.filter((g) => g.matches !== null).length;
      const matched = cells.filter((g) => g.matches === true).length;
      return { compared, matched, share: share(matched, compared) };
    };
    const scores = tally("score");
    return { reviewer: rv, ...scores, reads: tally("read") };
  });

  return {
    exams: items.map((i) => ({ id: i.examId, code: i.code, application: i.application, hasReference: i.reference !== null })),
    reviewers,
    criteria: [...perCriterion, ...(readMatrix.length ? [readRow] : [])],
    vsReference,
    referenceDetail,
  };
}
