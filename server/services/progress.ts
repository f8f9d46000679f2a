// Learner progress (README "Progress and credentialing"): counts toward each application's
// credentialing threshold, the CUSUM learning curve, per-criterion trends, strengths and
// focus areas, and accuracy against the reviewer and against confirmatory results. One
// batch of queries serves one sonographer (their Progress screen), the roster and the
// program's credentialing report alike.
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import { getSettings } from "../repositories/settings";
import { getRubric } from "../repositories/rubrics";
import {
  peopleByIds,
  programApplications,
  programSonographers,
  progressExams,
  readOutcomesOf,
  sonographersWithOpenFollowUps,
  type ProgressExamRow,
} from "../repositories/progress";
import { assertProgramSonographer } from "../policies/progress";
import type { AuthUser } from "../auth/types";
import { confirmedReadsOf } from "../repositories/confirmations";
import { unreadFeedbackOf } from "../repositories/notifications";
import { criterionSnippets } from "../repositories/feedback";
import { criteriaFor } from "../../shared/rubric/logic";
import type { Criterion, Rubric } from "../../shared/rubric/types";
import {
  accuracyFrom,
  countOutcomes,
  countTowardThreshold,
  criterionAttainment,
  describeThresholdRule,
  rate,
  rollingMean,
  type OutcomeCounts,
} from "../../shared/progress";
import { cusum } from "../../shared/stats/cusum";
import type {
  ApplicationProgress,
  ConfirmationMethod,
  CriterionStanding,
  CusumView,
  Progress,
  RosterFlag,
  RosterRow,
  TrendSeries,
} from "../../shared/schemas/progress";

type Q = Db | Knex.Transaction;

export interface ProgressQuery {
  from?: string;
  to?: string;
  /** Rolling-mean window and the number of recent exams strengths and focus areas look at. */
  window: number;
}

/** How many strengths and focus areas are named. */
const STANDINGS = 3;
/** A criterion at or above this mean attainment is not a focus area. */
const FOCUS_BELOW = 0.9;
/** A criterion needs at least this mean attainment to count as a strength. */
const STRENGTH_FROM = 0.75;
/** Roster flags: no submitted exam for this many days. */
export const STALLED_DAYS = 30;
/** Roster flags: the last FALLING_WINDOW reviewed exams' mean attainment is this much below the previous FALLING_WINDOW's. */
export const FALLING_WINDOW = 5;
export const FALLING_DROP = 0.1;

/** Progress of each of the given sonographers (who must belong to the program), in the order given. */
export async function computeProgress(db: Q, programId: string, userIds: string[], query: ProgressQuery): Promise<Progress[]> {
  if (userIds.length === 0) return [];
  const settings = await getSettings(db, programId);
  const people = await peopleByIds(db, userIds);
  const apps = await programApplications(db, programId);

  const exams = await progressExams(db, programId, userIds, query);
  const examIds = exams.map((e) => e.id);
  const reviewedIds = exams.filter((e) => e.status === "reviewed" && e.credit !== null).map((e) => e.id);

  const [outcomeRows, confirmationRows, snippets, unreadRows, rubrics] = await Promise.all([
    reviewedIds.length ? readOutcomesOf(db, reviewedIds) : [],
    examIds.length ? confirmedReadsOf(db, examIds) : [],
    criterionSnippets(db, programId),
    unreadFeedbackOf(db, programId, userIds),
    loadRubrics(db, programId, exams),
  ]);

  const byExam = <T extends { exam_id: string }>(rows: T[]) => {
    const m = new Map<string, T[]>();
    for (const r of rows) m.set(r.exam_id, [...(m.get(r.exam_id) ?? []), r]);
    return m;
  };
  const outcomesOf = byExam(outcomeRows);
  const confirmationsOf = byExam(confirmationRows);
  const adviceFor = (c: Criterion) => [c.help, ...snippets.filter((s) => s.criterion_key === c.key).map((s) => s.text as string)].filter((x) => x);
  const cusumOptions = { p0: settings.cusumAcceptableRate, p1: settings.cusumUnacceptableRate, alpha: settings.cusumAlpha, beta: settings.cusumBeta };
  const reviewedExamIds = new Set(reviewedIds);

  return userIds.map((userId) => {
    const person = people.find((p) => p.id === userId);
    if (!person) throw new Error(`computeProgress: unknown user ${userId}`);
    const mine = exams.filter((e) => e.sonographer_id === userId);
    const applications: ApplicationProgress[] = [];
    // Recent reviewed exams across applications, for strengths and focus areas.
    const standings = new Map<string, { c: Criterion; values: number[] }>();
    const recent = mine.filter((e) => reviewedExamIds.has(e.id)).slice(-query.window);

    for (const app of apps) {
      const appExams = mine.filter((e) => e.application_code === app.code);
      // Inactive applications are listed only when the learner has exams in them.
      if (!app.active && appExams.length === 0) continue;
      const reviewed = appExams.filter((e) => reviewedExamIds.has(e.id));
      // A study marked technically limited by patient factors is neither a success nor a failure of technique.
      const judged = reviewed.filter((e) => !e.limited);
      const rule = {
        threshold: app.credit_threshold ?? settings.credentialingThreshold,
        nonClinicalCap: app.credit_non_clinical_cap,
        minPositive: app.credit_min_positive,
        requireComplete: app.credit_require_complete,
      };
      const count = countTowardThreshold(
        reviewed.map((e) => ({ setting: e.setting, credit: !!e.credit, limited: !!e.limited, positive: !!e.positive })),
        rule,
      );
      const credited = count.credited;

      const path = cusum(
        judged.map((e) => !e.credit),
        cusumOptions,
      );
      const cusumView: CusumView = {
        ...cusumOptions,
        s: path.s,
        h0: path.h0,
        h1: path.h1,
        points: judged.map((e, i) => ({ n: i + 1, examId: e.id, performedAt: e.performed_at.toISOString(), failed: !e.credit, value: path.path[i] })),
        signal: path.signal,
        signalAtAttempt: path.signalAt === null ? null : path.signalAt + 1,
        signalAtDate: path.signalAt === null ? null : judged[path.signalAt].performed_at.toISOString(),
      };

      const qualityDistribution: Record<string, number> = {};
      const series = new Map<string, { c: Criterion; points: { examId: string; performedAt: string; value: number }[] }>();
      for (const e of reviewed) {
        const scores = e.scores ?? {};
        if (scores.quality !== undefined) qualityDistribution[String(scores.quality)] = (qualityDistribution[String(scores.quality)] ?? 0) + 1;
        const rubric = e.rubric_id ? rubrics.get(e.rubric_id) : undefined;
        for (const c of rubric ? criteriaFor(rubric.criteria, app.code) : []) {
          const value = criterionAttainment(c, scores[c.key]);
          if (value === null) continue;
          const s = series.get(c.key) ?? { c, points: [] };
          s.points.push({ examId: e.id, performedAt: e.performed_at.toISOString(), value });
          series.set(c.key, s);
        }
      }
      const trends: TrendSeries[] = [...series.values()].map(({ c, points }) => {
        const rolling = rollingMean(
          points.map((p) => p.value),
          query.window,
        );
        return { criterionKey: c.key, label: c.label, points: points.map((p, i) => ({ ...p, rolling: rolling[i] })) };
      });

      const vsReviewer = countOutcomes(
        reviewed.flatMap((e) => (outcomesOf.get(e.id) ?? []).map((o) => ({ read: o.sonographer_read, reference: o.reference_read }))),
      );
      const byMethod: Partial<Record<ConfirmationMethod, number>> = {};
      const confirmed: { read: "positive" | "negative" | "indeterminate"; reference: "positive" | "negative" }[] = [];
      for (const e of appExams)
        for (const c of confirmationsOf.get(e.id) ?? []) {
          byMethod[c.method as ConfirmationMethod] = (byMethod[c.method as ConfirmationMethod] ?? 0) + 1;
          if (c.method !== "none" && c.result) confirmed.push({ read: c.read, reference: c.result });
        }

      applications.push({
        application: { code: app.code, name: app.name },
        submitted: appExams.length,
        reviewed: reviewed.length,
        credited,
        creditedBySetting: count.creditedBySetting,
        counted: count.counted,
        positives: count.positives,
        limited: count.limited,
        threshold: rule.threshold,
        creditRule: rule,
        creditRuleText: describeThresholdRule(rule, settings.minQualityForCredit),
        remaining: count.remaining,
        met: count.met,
        indeterminateRate: rate(vsReviewer.indeterminate, vsReviewer.tp + vsReviewer.fp + vsReviewer.tn + vsReviewer.fn + vsReviewer.indeterminate),
        creditRate: rate(credited, judged.length),
        qualityDistribution,
        cusum: cusumView,
        accuracyVsReviewer: accuracyFrom(vsReviewer),
        accuracyVsConfirmatory: { ...accuracyFrom(countOutcomes(confirmed)), byMethod },
        trends,
        lastActivityAt: latest(appExams),
      });

      for (const e of recent.filter((x) => x.application_code === app.code)) {
        const rubric = e.rubric_id ? rubrics.get(e.rubric_id) : undefined;
        for (const c of rubric ? criteriaFor(rubric.criteria, app.code) : []) {
          const value = criterionAttainment(c, (e.scores ?? {})[c.key]);
          if (value === null) continue;
          const s = standings.get(c.key) ?? { c, values: [] };
          s.values.push(value);
          standings.set(c.key, s);
        }
      }
    }

    const ranked: CriterionStanding[] = [...standings.values()]
      .map(({ c, values }) => ({
        criterionKey: c.key,
        label: c.label,
        mean: values.reduce((a, b) => a + b, 0) / values.length,
        exams: values.length,
        advice: adviceFor(c),
      }))
      .sort((a, b) => a.mean - b.mean || a.label.localeCompare(b.label));
    const focusAreas = ranked.filter((s) => s.mean < FOCUS_BELOW).slice(0, STANDINGS);
    const strengths = ranked
      .filter((s) => s.mean >= STRENGTH_FROM && !focusAreas.includes(s))
      .reverse()
      .slice(0, STANDINGS)
      .map((s) => ({ ...s, advice: [] }));

    const reviewedMine = mine.filter((e) => reviewedExamIds.has(e.id));
    return {
      sonographer: { id: person.id, name: person.name, email: person.email },
      window: query.window,
      settings: { threshold: settings.credentialingThreshold, minQualityForCredit: settings.minQualityForCredit, cusum: cusumOptions },
      range: { from: query.from ?? null, to: query.to ?? null },
      total: {
        submitted: mine.length,
        reviewed: reviewedMine.length,
        credited: reviewedMine.filter((e) => e.credit).length,
        applicationsMet: applications.filter((a) => a.met).length,
        applications: applications.length,
      },
      applications,
      strengths,
      focusAreas,
      unreadFeedback: unreadRows.filter((n) => n.user_id === userId && reviewedExamIds.has(n.exam_id)).length,
      unacknowledgedFeedback: reviewedMine.filter((e) => !e.acknowledged).length,
      lastActivityAt: latest(mine),
    };
  });
}

function latest(exams: ProgressExamRow[]): string | null {
  let best: Date | null = null;
  for (const e of exams) if (!best || e.submitted_at > best) best = e.submitted_at;
  return best ? best.toISOString() : null;
}

async function loadRubrics(db: Q, programId: string, exams: ProgressExamRow[]): Promise<Map<string, Rubric>> {
  const ids = [...new Set(exams.map((e) => e.rubric_id).filter((x): x is string => !!x))];
  const out = new Map<string, Rubric>();
  for (const id of ids) {
    const r = await getRubric(db, programId, id);
    if (r) out.set(id, r);
  }
  return out;
}

/** Mean attainment over every scored criterion of each reviewed exam, oldest first. */
function examAttainments(p: Progress): { at: string; value: number }[] {
  const perExam = new Map<string, { at: string; sum: number; n: number }>();
  for (const a of p.applications)
    for (const t of a.trends)
      for (const pt of t.points) {
        const x = perExam.get(pt.examId) ?? { at: pt.performedAt, sum: 0, n: 0 };
        x.sum += pt.value;
        x.n += 1;
        perExam.set(pt.examId, x);
      }
  return [...perExam.values()].map((x) => ({ at: x.at, value: x.sum / x.n })).sort((a, b) => a.at.localeCompare(b.at));
}

/** The roster: every active sonographer of the program with progress and flags. */
export async function roster(db: Q, programId: string, now = new Date()): Promise<RosterRow[]> {
  const people = await programSonographers(db, programId);
  const progress = await computeProgress(
    db,
    programId,
    people.map((p) => p.id),
    { window: 10 },
  );
  const openFollowUps = await sonographersWithOpenFollowUps(db, programId);
  const stalledBefore = now.getTime() - STALLED_DAYS * 86_400_000;
  return people.map((person, i) => {
    const p = progress[i];
    const flags: RosterFlag[] = [];
    const last = p.lastActivityAt ? Date.parse(p.lastActivityAt) : person.created_at.getTime();
    if (last < stalledBefore) flags.push("stalled");
    const series = examAttainments(p).map((x) => x.value);
    if (series.length >= 2 * FALLING_WINDOW) {
      const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
      const lastWindow = mean(series.slice(-FALLING_WINDOW));
      const before = mean(series.slice(-2 * FALLING_WINDOW, -FALLING_WINDOW));
      if (before - lastWindow >= FALLING_DROP) flags.push("falling_quality");
    }
    if (openFollowUps.has(person.id)) flags.push("follow_up_open");
    if (p.applications.some((a) => a.cusum.signal === "unacceptable")) flags.push("cusum_unacceptable");
    return {
      id: person.id,
      name: person.name,
      email: person.email,
      lastActivityAt: p.lastActivityAt,
      total: { submitted: p.total.submitted, reviewed: p.total.reviewed, credited: p.total.credited },
      applications: p.applications.map((a) => ({
        code: a.application.code,
        name: a.application.name,
        submitted: a.submitted,
        credited: a.credited,
        reviewed: a.reviewed,
        threshold: a.threshold,
        met: a.met,
        signal: a.cusum.signal,
      })),
      flags,
    };
  });
}

export type { OutcomeCounts };

/** The caller's own progress. */
export async function myProgress(db: Q, user: AuthUser, query: ProgressQuery): Promise<Progress> {
  return (await computeProgress(db, user.programId, [user.id], query))[0];
}

/** One sonographer's progress, for a QA lead of the program. */
export async function sonographerProgress(db: Q, programId: string, sonographerId: string, query: ProgressQuery): Promise<Progress> {
  await assertProgramSonographer(db, programId, sonographerId);
  return (await computeProgress(db, programId, [sonographerId], query))[0];
}
