// Hand-built Progress values for the credentialing report tests: invented people of the demo
// program, counts chosen so every kind of cell shows up (met and not met, all three CUSUM
// results, rates at 100%, "—" for n = 0, a latin-ext name, an application without exams).
import type { Accuracy, ApplicationProgress, ConfirmationMethod, Progress, Rate } from "../../shared/schemas/progress";
import { cusum } from "../../shared/stats/cusum";
import { wilsonInterval } from "../../shared/stats/wilson";
import { describeThresholdRule } from "../../shared/progress";

export const PROGRAM = "Cedar Hollow Emergency Medicine";

function rate(successes: number, n: number): Rate {
  return { successes, n, value: n === 0 ? null : successes / n, ci95: wilsonInterval(successes, n) };
}

export function accuracy(tp: number, fp: number, tn: number, fn: number, indeterminate = 0): Accuracy {
  return { tp, fp, tn, fn, indeterminate, sensitivity: rate(tp, tp + fn), specificity: rate(tn, tn + fp), ppv: rate(tp, tp + fp), npv: rate(tn, tn + fn) };
}

const day = (i: number) => new Date(Date.UTC(2026, 8, 1 + i, 10)).toISOString();

interface AppSpec {
  code: string;
  name: string;
  submitted: number;
  threshold?: number;
  /** Failure (no credit) per reviewed exam, in the order performed. */
  outcomes: boolean[];
  cusum?: { p0: number; p1: number; alpha: number; beta: number };
  quality?: Record<string, number>;
  reviewer?: Accuracy;
  confirmatory?: Accuracy;
  byMethod?: Partial<Record<ConfirmationMethod, number>>;
}

export function application(spec: AppSpec): ApplicationProgress {
  const options = spec.cusum ?? { p0: 0.1, p1: 0.2, alpha: 0.1, beta: 0.1 };
  const c = cusum(spec.outcomes, options);
  const reviewed = spec.outcomes.length;
  const credited = spec.outcomes.filter((f) => !f).length;
  const threshold = spec.threshold ?? 25;
  return {
    application: { code: spec.code, name: spec.name },
    submitted: spec.submitted,
    reviewed,
    credited,
    creditedBySetting: { clinical: credited, educational: 0, simulated: 0 },
    counted: credited,
    positives: 0,
    limited: 0,
    threshold,
    creditRule: { threshold, nonClinicalCap: null, minPositive: 0, requireComplete: false },
    creditRuleText: describeThresholdRule({ threshold, nonClinicalCap: null, minPositive: 0, requireComplete: false }, 3),
    remaining: Math.max(0, threshold - credited),
    met: credited >= threshold,
    indeterminateRate: rate(0, 0),
    creditRate: rate(credited, reviewed),
    qualityDistribution: spec.quality ?? {},
    cusum: {
      ...options,
      s: c.s,
      h0: c.h0,
      h1: c.h1,
      points: spec.outcomes.map((failed, i) => ({ n: i + 1, examId: `exam-${spec.code}-${i}`, performedAt: day(i), failed, value: c.path[i] })),
      signal: c.signal,
      signalAtAttempt: c.signalAt === null ? null : c.signalAt + 1,
      signalAtDate: c.signalAt === null ? null : day(c.signalAt),
    },
    accuracyVsReviewer: spec.reviewer ?? accuracy(0, 0, 0, 0),
    accuracyVsConfirmatory: { ...(spec.confirmatory ?? accuracy(0, 0, 0, 0)), byMethod: spec.byMethod ?? {} },
    trends: [],
    lastActivityAt: reviewed ? day(reviewed - 1) : null,
  };
}

/** Outcomes with failures at the given 1-based attempts. */
export function outcomes(n: number, failuresAt: number[]): boolean[] {
  return Array.from({ length: n }, (_, i) => failuresAt.includes(i + 1));
}

export function progress(name: string, email: string, applications: ApplicationProgress[]): Progress {
  const sum = (k: "submitted" | "reviewed" | "credited") => applications.reduce((s, a) => s + a[k], 0);
  return {
    sonographer: {
      id: `00000000-0000-4000-8000-${String(Math.abs(hash(email)))
        .padStart(12, "0")
        .slice(0, 12)}`,
      name,
      email,
    },
    window: 10,
    settings: { threshold: 25, minQualityForCredit: 3, cusum: { p0: 0.1, p1: 0.2, alpha: 0.1, beta: 0.1 } },
    range: { from: "2026-01-01", to: "2026-12-31" },
    total: {
      submitted: sum("submitted"),
      reviewed: sum("reviewed"),
      credited: sum("credited"),
      applicationsMet: applications.filter((a) => a.met).length,
      applications: applications.length,
    },
    applications,
    strengths: [],
    focusAreas: [],
    unreadFeedback: 0,
    unacknowledgedFeedback: 0,
    lastActivityAt: null,
  };
}

function hash(s: string): number {
  let h = 0;
  for (const ch of s) h = (h * 31 + ch.codePointAt(0)!) | 0;
  return h;
}

/** The main fixture: one sonographer with five applications. */
export function zdenka(): Progress {
  return progress("Zdenka Hořejší", "zdenka.horejsi@cedarhollow.example", [
    application({
      code: "efast",
      name: "Trauma (FAST / eFAST)",
      submitted: 30,
      outcomes: outcomes(26, [2, 5, 9, 14]),
      cusum: { p0: 0.2, p1: 0.4, alpha: 0.05, beta: 0.2 },
      quality: { "1": 1, "2": 3, "3": 8, "4": 10, "5": 4 },
      reviewer: accuracy(20, 3, 40, 2, 1),
      confirmatory: accuracy(5, 1, 7, 0),
      byMethod: { ct: 8, follow_up: 5 },
    }),
    application({
      code: "cardiac",
      name: "Focused cardiac",
      submitted: 12,
      outcomes: outcomes(10, [1, 2, 3, 4, 7]),
      quality: { "1": 2, "2": 3, "3": 2, "4": 3 },
      reviewer: accuracy(3, 2, 10, 1),
    }),
    application({ code: "lung", name: "Lung", submitted: 3, outcomes: outcomes(2, []), quality: { "4": 2 }, reviewer: accuracy(1, 0, 3, 0) }),
    application({ code: "ocular", name: "Ocular", submitted: 0, outcomes: [] }),
    application({
      code: "procedure",
      name: "Procedural guidance",
      submitted: 263,
      threshold: 50,
      // 81 credited of 263 reviewed: Newcombe's (1998) first worked example.
      outcomes: Array.from({ length: 263 }, (_, i) => i % 263 >= 81),
      quality: { "2": 182, "3": 81 },
      reviewer: accuracy(81, 0, 182, 0),
    }),
  ]);
}
