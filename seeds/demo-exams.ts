// Invented demo exams for both demo programs, each a case that makes clinical sense: an
// indication that fits the application, a clip of every required view (seeds/demo-library.ts
// draws fluid only where the case has a fluid finding or the anatomy is fluid-filled), the
// clinician's read of every finding, and reviews through the same services the API uses.
// Reviewers score around what the clips show, each with their own habits (one stricter on
// overall quality, one more lenient, one less consistent), so double reads mostly agree, some
// differ within tolerance and a few go to adjudication, as in a real program. A few cases stay
// drafts or wait in the queue; one clip fails processing; each program gets a calibration set.
// Every case, person and result is invented.
import crypto from "node:crypto";
import fsp from "node:fs/promises";
import type { Db } from "../server/db/knex";
import type { Storage } from "../server/storage/types";
import type { ClipJob, JobQueue } from "../server/jobs/queue";
import { addClip } from "../server/services/clips";
import { mulberry32 } from "../shared/stats/random";
import type { FindingRead } from "../shared/catalogue";
import { queueSubmittedExam } from "../server/services/queue";
import { recordReview } from "../server/services/reviews";
import { createCalibrationSet } from "../server/services/calibration";
import { examContext } from "../server/repositories/exams";
import { activeRubricFor } from "../server/repositories/rubrics";
import { getSettings } from "../server/repositories/settings";
import { criteriaFor } from "../shared/rubric/logic";
import type { Rubric, Scores } from "../shared/rubric/types";
import { brokenClip, ensureLibrary, PROTOCOLS, shotFile, shotFor, type Shot } from "./demo-library";

type Setting = "clinical" | "educational" | "simulated";

export interface DemoCase {
  app: string;
  indication: string;
  setting: Setting;
  /** Findings the clips show; every other finding of the application is absent. */
  shows?: string[];
  /** The clinician's own read where it differs from what the clips show. */
  clinician?: Record<string, FindingRead>;
  /** The second reviewer's read where it differs (a double read that needs adjudication). */
  second?: Record<string, FindingRead>;
  /** Overall image quality the clips deserve (1–5, default 4). */
  quality?: number;
  /** Criteria the clips miss, at the level a careful reviewer gives: { depth: "too_deep" }. */
  slips?: Record<string, string>;
  /** Optional views recorded as well (the right upper quadrant when ectopic pregnancy is suspected). */
  extraViews?: string[];
  /** Technically limited by patient factors. */
  limited?: boolean;
  /** "draft": not submitted yet; "waiting": submitted, in the queue; otherwise reviewed. */
  stage?: "draft" | "waiting";
  /** Read twice whatever the program's double-read share. */
  double?: boolean;
  /** Recorded as AVI (the pipeline transcodes it). */
  avi?: boolean;
  /** Exported by the machine as DICOM (ultrasound multi-frame objects with depth calibration). */
  dicom?: boolean;
  /** Part of the program's calibration set. */
  calibrate?: boolean;
}

/** Cedar Hollow Emergency Medicine: the emergency-medicine spread of applications. */
export const CEDAR_HOLLOW_CASES: DemoCase[] = [
  {
    app: "efast",
    indication: "Motor vehicle collision, hypotensive on arrival",
    setting: "clinical",
    shows: ["free_fluid_ruq", "free_fluid_pelvis"],
    double: true,
    calibrate: true,
  },
  { app: "efast", indication: "Fall from standing height, left rib pain", setting: "clinical", calibrate: true },
  {
    app: "efast",
    indication: "Assault, kicked in the left flank",
    setting: "clinical",
    shows: ["free_fluid_luq"],
    clinician: { free_fluid_luq: "negative" },
    quality: 3,
  },
  {
    app: "efast",
    indication: "Stab wound, right lower chest",
    setting: "clinical",
    shows: ["hemothorax_right"],
    second: { hemothorax_right: "negative" },
    quality: 3,
    slips: { depth: "too_deep" },
  },
  { app: "efast", indication: "Teaching scan on a volunteer", setting: "educational", quality: 3, slips: { gain: "too_high" }, double: true },
  { app: "efast", indication: "Simulation: trauma team drill", setting: "simulated", shows: ["free_fluid_ruq"] },
  { app: "efast", indication: "Pedestrian struck by a car, abdominal pain", setting: "clinical", stage: "waiting" },
  { app: "efast", indication: "Bicycle handlebar injury to the abdomen", setting: "clinical", stage: "draft" },
  { app: "cardiac", indication: "Shortness of breath, known heart failure", setting: "clinical", double: true, calibrate: true },
  {
    app: "cardiac",
    indication: "Chest pain and hypotension",
    setting: "clinical",
    shows: ["pericardial_effusion"],
    clinician: { pericardial_effusion: "indeterminate" },
    quality: 3,
    double: true,
    calibrate: true,
  },
  { app: "cardiac", indication: "Syncope while standing", setting: "clinical", quality: 3, slips: { depth: "too_deep" } },
  { app: "cardiac", indication: "Teaching scan on a volunteer", setting: "educational", quality: 2, slips: { plane: "partly", labels: "incomplete" } },
  { app: "cardiac", indication: "Palpitations and light-headedness", setting: "clinical", stage: "waiting", dicom: true },
  { app: "aorta", indication: "Abdominal pain radiating to the back, age 71", setting: "clinical", calibrate: true },
  { app: "aorta", indication: "Flank pain and hypotension, age 68", setting: "clinical", quality: 3, slips: { depth: "too_deep" }, stage: "draft" },
  { app: "biliary", indication: "Right upper quadrant pain after meals", setting: "clinical", shows: ["pericholecystic_fluid"], double: true },
  { app: "biliary", indication: "Epigastric pain and vomiting", setting: "clinical", quality: 3, slips: { gain: "too_high" } },
  { app: "biliary", indication: "Teaching scan on a volunteer", setting: "educational", stage: "waiting" },
  { app: "renal", indication: "Right flank pain with hematuria", setting: "clinical", shows: ["hydronephrosis_right"], avi: true, calibrate: true },
  { app: "renal", indication: "Unable to pass urine for 12 hours", setting: "clinical", shows: ["bladder_distended"], stage: "draft" },
  { app: "lung", indication: "Shortness of breath and fever", setting: "clinical", shows: ["pleural_effusion_right"], double: true },
  { app: "lung", indication: "Pleuritic chest pain after a long flight", setting: "clinical", quality: 3, slips: { labels: "incomplete" } },
  { app: "lung", indication: "Simulation: the short-of-breath patient", setting: "simulated" },
  { app: "lung", indication: "Wheeze and cough, worse over three days", setting: "clinical", stage: "draft" },
  { app: "dvt", indication: "Left calf swelling for two days", setting: "clinical", double: true },
  { app: "dvt", indication: "Right leg swelling after a long flight", setting: "clinical", quality: 3, slips: { labels: "incomplete" } },
  { app: "dvt", indication: "Teaching scan on a volunteer", setting: "educational", stage: "waiting" },
  { app: "dvt", indication: "Left thigh pain and swelling after knee surgery", setting: "clinical", stage: "draft" },
  { app: "pelvic", indication: "Vaginal bleeding, seven weeks since the last period", setting: "clinical", shows: ["iup"], double: true },
  {
    app: "pelvic",
    indication: "Pelvic pain with a positive pregnancy test, light-headed",
    setting: "clinical",
    shows: ["free_fluid_pelvis", "free_fluid_ruq"],
    extraViews: ["ruq"],
    quality: 3,
  },
  { app: "pelvic", indication: "Simulation: first-trimester bleeding", setting: "simulated", shows: ["iup"], stage: "waiting" },
  { app: "ocular", indication: "Sudden painless loss of vision, right eye", setting: "clinical", limited: true, quality: 3 },
  { app: "ocular", indication: "Blunt injury to the left eye, lid swelling", setting: "clinical", quality: 3, slips: { gain: "too_high" }, stage: "draft" },
  { app: "soft_tissue", indication: "Red, painful swelling of the forearm", setting: "clinical", shows: ["abscess"], double: true },
  { app: "soft_tissue", indication: "Spreading redness and warmth of the lower leg", setting: "clinical", quality: 3 },
  { app: "soft_tissue", indication: "Knee swelling after a fall", setting: "clinical", shows: ["joint_effusion"], stage: "draft" },
  { app: "vascular_access", indication: "Difficult peripheral intravenous access", setting: "clinical" },
  {
    app: "vascular_access",
    indication: "Central venous catheter, internal jugular",
    setting: "clinical",
    quality: 3,
    slips: { needle_tip: "lost" },
    stage: "draft",
  },
  { app: "nerve_block", indication: "Hip fracture: fascia iliaca block", setting: "clinical", double: true },
  { app: "nerve_block", indication: "Simulation: forearm block on a gel model", setting: "simulated", quality: 3, stage: "draft" },
];

/** Tamsin Ridge Critical Care: an intensive-care unit's applications. */
export const TAMSIN_RIDGE_CASES: DemoCase[] = [
  { app: "cardiac", indication: "Septic shock on norepinephrine", setting: "clinical", double: true, calibrate: true },
  { app: "cardiac", indication: "Hypotension after cardiac surgery", setting: "clinical", shows: ["pericardial_effusion"], double: true, calibrate: true },
  { app: "cardiac", indication: "Failed weaning from the ventilator", setting: "clinical", quality: 3, slips: { depth: "too_deep" } },
  { app: "cardiac", indication: "Teaching scan on a volunteer", setting: "educational", quality: 2, slips: { plane: "partly" } },
  { app: "lung", indication: "Worsening oxygenation on the ventilator", setting: "clinical", shows: ["pleural_effusion_left"], double: true, calibrate: true },
  { app: "lung", indication: "After central line insertion, subclavian", setting: "clinical", calibrate: true },
  { app: "lung", indication: "Simulation: the hypoxic ventilated patient", setting: "simulated", stage: "waiting" },
  {
    app: "shock",
    indication: "Undifferentiated hypotension on admission",
    setting: "clinical",
    shows: ["free_fluid"],
    quality: 3,
    second: { free_fluid: "negative" },
  },
  { app: "shock", indication: "Hypotension after a fall at home", setting: "clinical", stage: "waiting" },
  { app: "cardiac_arrest", indication: "In-hospital cardiac arrest, pulse check", setting: "clinical", shows: ["cardiac_activity"] },
  { app: "vascular_access", indication: "Central venous catheter, internal jugular", setting: "clinical", calibrate: true },
  { app: "vascular_access", indication: "Arterial line, radial", setting: "clinical", quality: 3, slips: { needle_tip: "lost" }, stage: "draft" },
  { app: "cardiac", indication: "New atrial fibrillation with hypotension", setting: "clinical", stage: "draft" },
];

export const DEMO_CASES: Record<string, DemoCase[]> = { "cedar-hollow-em": CEDAR_HOLLOW_CASES, "tamsin-ridge-cc": TAMSIN_RIDGE_CASES };

/** How each demo reviewer scores: how often they drift a step from what the clips show, and any lean on overall quality. */
interface Habit {
  noise: number;
  lean?: { by: number; often: number };
}
const HABITS: Record<string, Habit> = {
  "reviewer@cedarhollow.example": { noise: 0.08, lean: { by: 1, often: 0.2 } },
  "lead@cedarhollow.example": { noise: 0.05 },
  "elias.brunnhold@cedarhollow.example": { noise: 0.1, lean: { by: -1, often: 0.35 } },
  "amara.dunleavy@cedarhollow.example": { noise: 0.18 },
  "reviewer@tamsinridge.example": { noise: 0.07 },
  "ines.falkenrath@tamsinridge.example": { noise: 0.12, lean: { by: -1, often: 0.25 } },
};
const DEFAULT_HABIT: Habit = { noise: 0.1 };

/** What a reviewer tells the clinician about a missed criterion. */
const ADVICE: Record<string, string> = {
  "depth:too_deep": "Bring the depth up so the target fills the screen.",
  "depth:too_shallow": "Add depth to see the structures behind the target.",
  "gain:too_high": "The gain is high: fluid should be black. Turn it down until it is.",
  "gain:too_low": "The gain is low and detail is lost; bring it up.",
  "plane:partly": "Fan through to the standard plane before you record.",
  "labels:incomplete": "Label every clip with its view and side.",
  "marker:does_not": "The orientation marker is flipped; check it against the screen before recording.",
  "needle_tip:lost": "Keep the tip on screen: walk it down out of plane, or bring the shaft back into the beam.",
};

/** The scores the clips deserve under the rubric: the case's quality and slips, every other criterion at its ideal level. */
export function caseScores(rubric: Rubric, appCode: string, c: Pick<DemoCase, "quality" | "slips">): Scores {
  const scores: Scores = {};
  for (const cr of criteriaFor(rubric.criteria, appCode)) {
    if (cr.kind === "number") continue;
    const ideal = cr.levels.find((l) => l.ideal) ?? cr.levels[0];
    scores[cr.key] = cr.key === "quality" ? String(c.quality ?? 4) : (c.slips?.[cr.key] ?? ideal.value);
  }
  return scores;
}

/** One reviewer's scores of a case: mostly the deserved ones, sometimes a neighbouring level, with their lean on overall quality. */
export function reviewerScores(rubric: Rubric, appCode: string, deserved: Scores, habit: Habit, rand: () => number): Scores {
  const out: Scores = { ...deserved };
  for (const cr of criteriaFor(rubric.criteria, appCode)) {
    if (cr.kind === "number" || cr.kind === "yes_no" || !(cr.key in deserved)) continue;
    const values = cr.levels.map((l) => l.value);
    const at = values.indexOf(String(deserved[cr.key]));
    let to = at;
    if (cr.key === "quality" && habit.lean && rand() < habit.lean.often) to = at + habit.lean.by;
    else if (rand() < habit.noise) to = at + (rand() < 0.5 ? -1 : 1);
    if (to >= 0 && to < values.length && !cr.levels[to].fails) out[cr.key] = values[to];
  }
  return out;
}

function feedbackOf(c: DemoCase, labels: Map<string, string>): string {
  const parts = Object.entries(c.slips ?? {}).map(([k, v]) => ADVICE[`${k}:${v}`] ?? "");
  const missed = Object.entries(c.clinician ?? {}).filter(([k]) => (c.shows ?? []).includes(k));
  for (const [k] of missed) parts.push(`Look again at the ${(labels.get(k) ?? k).toLowerCase()}: the clip shows it.`);
  if (c.limited) parts.push("A hard study through no fault of yours; the views you got are well taken.");
  if (!parts.filter(Boolean).length) parts.push((c.shows ?? []).length ? "Well found, and every view recorded." : "A clean, complete study.");
  return parts.filter(Boolean).join(" ");
}

interface Person {
  id: string;
  email: string;
}

/**
 * Seeds the demo exams of a program once (when it has none): Cedar Hollow and Tamsin Ridge
 * by default, or the given program with `cases` (Cedar Hollow's by default), optionally only
 * those of `apps`. Clips are processed by the queue. Returns how many exams were seeded.
 */
export async function seedDemoExams(
  deps: { db: Db; storage: Storage; jobs: Pick<JobQueue, "enqueueClip"> },
  opts: { libraryDir: string; programId?: string; cases?: DemoCase[]; apps?: string[]; log?: (s: string) => void },
): Promise<number> {
  const targets: { id: string; cases: DemoCase[] }[] = [];
  if (opts.programId) targets.push({ id: opts.programId, cases: opts.cases ?? CEDAR_HOLLOW_CASES });
  else
    for (const [slug, cases] of Object.entries(DEMO_CASES)) {
      const p = await deps.db("programs").where("slug", slug).first("id");
      if (p) targets.push({ id: p.id, cases });
    }
  let total = 0;
  for (const t of targets)
    total += await seedProgram(
      deps,
      t.id,
      t.cases.filter((c) => !opts.apps || opts.apps.includes(c.app)),
      opts,
    );
  return total;
}

async function seedProgram(
  deps: { db: Db; storage: Storage; jobs: Pick<JobQueue, "enqueueClip"> },
  programId: string,
  cases: DemoCase[],
  opts: { libraryDir: string; log?: (s: string) => void },
): Promise<number> {
  const { db, storage, jobs } = deps;
  const log = opts.log ?? (() => {});
  if (!cases.length || (await db("exams").where("program_id", programId).first("id"))) return 0;
  const members = (role: string): Promise<Person[]> =>
    db("memberships as m")
      .join("users as u", "u.id", "m.user_id")
      .where("m.program_id", programId)
      .whereNull("m.deactivated_at")
      .whereRaw(`? = ANY(m.roles)`, [role])
      .orderBy("u.email")
      .select("u.id", "u.email");
  const clinicians = await members("sonographer");
  const reviewers = await members("reviewer");
  const leads = await members("qa_lead");
  if (!clinicians.length) return 0;
  const apps = await db("applications").where({ program_id: programId, status: "published" }).select("id", "code");
  const appOf = new Map(apps.map((a) => [a.code as string, a.id as string]));
  const missing = cases.find((c) => !appOf.has(c.app) || !PROTOCOLS[c.app]);
  if (missing) throw new Error(`the demo case "${missing.indication}" needs the application "${missing.app}"`);
  const views = await db("application_views")
    .whereIn("application_id", [...appOf.values()])
    .orderBy("position")
    .select("application_id", "key", "required");
  const findings = await db("application_findings")
    .whereIn("application_id", [...appOf.values()])
    .orderBy("position")
    .select("application_id", "key", "label");
  const labels = new Map(findings.map((f) => [f.key as string, f.label as string]));

  // What each case records: every required view (and its extra ones), drawn the way the case looks.
  const shotsOf = (c: DemoCase): Shot[] => {
    const id = appOf.get(c.app)!;
    const keys = views.filter((v) => v.application_id === id && (v.required || (c.extraViews ?? []).includes(v.key))).map((v) => v.key as string);
    const look = {
      gain: c.slips?.gain === "too_high" ? ("high" as const) : c.slips?.gain === "too_low" ? ("low" as const) : undefined,
      deep: c.slips?.depth === "too_deep",
      container: c.avi ? ("avi" as const) : c.dicom ? ("dcm" as const) : undefined,
    };
    return keys.map((view) => shotFor(c.app, view, c.shows ?? [], look));
  };
  const library = await ensureLibrary(opts.libraryDir, cases.flatMap(shotsOf), log);
  const broken = await brokenClip(opts.libraryDir, [...library.values()].find((f) => f.kind === "video")?.path ?? [...library.values()][0].path);
  const lastDraft = cases.map((c) => c.stage).lastIndexOf("draft");

  const rand = mulberry32(20261201);
  const clipJobs: ClipJob[] = [];
  const made: { c: DemoCase; id: string; clinician: Person; performedAt: Date; truth: { key: string; read: FindingRead }[] }[] = [];
  await db.transaction(async (trx) => {
    const reviewedCount = cases.filter((c) => !c.stage).length;
    let older = 0;
    for (const [i, c] of cases.entries()) {
      const clinician = clinicians[i % clinicians.length];
      // Reviewed cases spread over the last three months; waiting ones this week; drafts the last two days.
      const daysAgo = c.stage === "draft" ? rand() * 2 : c.stage === "waiting" ? 1 + rand() * 5 : 8 + (82 * (reviewedCount - older++)) / reviewedCount;
      const performedAt = new Date(Date.now() - Math.round(daysAgo * 24) * 3600_000 - Math.floor(rand() * 50) * 60_000);
      const sent = c.stage !== "draft";
      const at = new Date(performedAt.getTime() + (1 + Math.floor(rand() * 3)) * 3600_000);
      const p = PROTOCOLS[c.app];
      const [exam] = await trx("exams")
        .insert({
          program_id: programId,
          sonographer_id: clinician.id,
          application_id: appOf.get(c.app),
          code: `EX-D${String(i).padStart(2, "0")}${crypto.randomBytes(2).toString("hex").toUpperCase().slice(0, 3)}`,
          performed_at: performedAt,
          setting: c.setting,
          transducer: p.transducer,
          preset: p.preset,
          indication: c.indication,
          status: sent ? "submitted" : "draft",
          submitted_at: sent ? at : null,
          attested_at: sent ? at : null,
          created_at: performedAt,
          updated_at: sent ? at : performedAt,
        })
        .returning(["id"]);
      const keys = findings.filter((f) => f.application_id === appOf.get(c.app)).map((f) => f.key as string);
      const truth = keys.map((key) => ({ key, read: ((c.shows ?? []).includes(key) ? "positive" : "negative") as FindingRead }));
      if (keys.length) await trx("exam_findings").insert(truth.map((t) => ({ exam_id: exam.id, finding_key: t.key, read: c.clinician?.[t.key] ?? t.read })));
      // Through the same service as an upload; its jobs are sent once everything is committed.
      const clipDeps = { db: trx, storage, jobs: { enqueueClip: async (j: ClipJob) => void clipJobs.push(j) }, log: (e: unknown) => log(String(e)) };
      const files = shotsOf(c).map((s) => ({ view: s.view as string | null, file: library.get(shotFile(s))! }));
      if (i === lastDraft) files.push({ view: null, file: broken });
      for (const { view, file } of files)
        await addClip(clipDeps, null, {
          exam: { id: exam.id, programId },
          path: file.path,
          originalName: file.name,
          sizeBytes: (await fsp.stat(file.path)).size,
          view,
          media: { kind: file.kind, mime: file.mime },
          createdAt: performedAt,
        });
      if (sent) made.push({ c, id: exam.id, clinician, performedAt: at, truth });
    }
    await reviewCases(trx, programId, made, reviewers, labels, rand);
  });
  if (leads.length && reviewers.length >= 2) await seedCalibration(db, programId, leads[0], reviewers, made, rand);
  for (const j of clipJobs) await jobs.enqueueClip(j);
  log(`Seeded ${cases.length} demo exams with ${clipJobs.length} clips (processing in the background).`);
  return cases.length;
}

/** Queues every submitted case and reviews the ones not left waiting, through the services the API uses. */
async function reviewCases(
  trx: Parameters<typeof recordReview>[0],
  programId: string,
  made: { c: DemoCase; id: string; clinician: Person; performedAt: Date; truth: { key: string; read: FindingRead }[] }[],
  reviewers: Person[],
  labels: Map<string, string>,
  rand: () => number,
) {
  const settings = await getSettings(trx, programId);
  const rubric = (await activeRubricFor(trx, programId))!;
  for (const [i, m] of made.entries()) {
    const double = m.c.double || m.c.second !== undefined;
    await queueSubmittedExam(trx, { id: m.id, program_id: programId, setting: m.c.setting }, double ? 1 : 0);
    const eligible = reviewers.filter((r) => r.id !== m.clinician.id);
    if (m.c.stage === "waiting" || eligible.length < (double ? 2 : 1)) continue;
    const exam = (await examContext(trx, programId, m.id))!;
    const assignments = await trx("assignments").where("exam_id", m.id).whereIn("kind", ["primary", "second"]).orderBy("kind").select("id", "kind");
    const deserved = caseScores(rubric, exam.application_code, m.c);
    for (const [k, a] of assignments.entries()) {
      const reviewer = eligible[(i + k) % eligible.length];
      const reads = m.truth.map((t) => ({ key: t.key, read: (a.kind === "second" ? m.c.second?.[t.key] : undefined) ?? t.read }));
      const at = new Date(Math.min(Date.now() - 3600_000, m.performedAt.getTime() + (1 + k + rand() * 2) * 86400_000));
      await trx("assignments").where("id", a.id).update({ rubric_id: rubric.id });
      await recordReview(trx, {
        reviewerId: reviewer.id,
        assignment: a,
        exam,
        rubric,
        body: {
          scores: reviewerScores(rubric, exam.application_code, deserved, HABITS[reviewer.email] ?? DEFAULT_HABIT, rand),
          reads,
          feedback: feedbackOf(m.c, labels),
          timeSpentSeconds: 60 + Math.floor(rand() * 240),
          limited: m.c.limited ?? false,
        },
        settings,
        at,
      });
    }
    if (i % 2 === 0) await trx("exams").where("id", m.id).where("status", "reviewed").update({ feedback_acknowledged_at: trx.fn.now() });
  }
}

/** The program's calibration set: its calibrate cases, sent to every reviewer; all reads in but one. */
async function seedCalibration(
  db: Db,
  programId: string,
  lead: Person,
  reviewers: Person[],
  made: { c: DemoCase; id: string; truth: { key: string; read: FindingRead }[] }[],
  rand: () => number,
) {
  const chosen = made.filter((m) => m.c.calibrate);
  if (chosen.length < 2) return;
  const rubric = (await activeRubricFor(db, programId))!;
  const apps = new Map<string, string>(
    (
      await db("exams as e")
        .join("applications as a", "a.id", "e.application_id")
        .whereIn(
          "e.id",
          chosen.map((m) => m.id),
        )
        .select("e.id", "a.code")
    ).map((r) => [r.id, r.code]),
  );
  const setId = await createCalibrationSet(
    db,
    { programId, userId: lead.id, ip: null },
    {
      name: "Quarterly calibration",
      // The QA lead's reference answer on the first half: what the clips show.
      exams: chosen.map((m, i) => ({
        examId: m.id,
        reference: i < Math.ceil(chosen.length / 2) ? { scores: caseScores(rubric, apps.get(m.id)!, m.c), reads: m.truth } : undefined,
      })),
    },
  );
  await db.transaction(async (trx) => {
    const settings = await getSettings(trx, programId);
    const reads = await trx("assignments")
      .where("calibration_set_id", setId)
      .orderBy(["assigned_to", "exam_id"])
      .select("id", "kind", "exam_id", "assigned_to");
    for (const [i, a] of reads.entries()) {
      if (i === reads.length - 1) break; // one read still out
      const m = chosen.find((x) => x.id === a.exam_id)!;
      const exam = (await examContext(trx, programId, a.exam_id))!;
      const reviewer = reviewers.find((r) => r.id === a.assigned_to)!;
      await recordReview(trx, {
        reviewerId: reviewer.id,
        assignment: a,
        exam,
        rubric,
        body: {
          scores: reviewerScores(rubric, exam.application_code, caseScores(rubric, exam.application_code, m.c), HABITS[reviewer.email] ?? DEFAULT_HABIT, rand),
          reads: m.truth,
          feedback: "",
          timeSpentSeconds: 90 + Math.floor(rand() * 200),
        },
        settings,
      });
    }
  });
}
