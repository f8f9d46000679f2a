// Invented learning histories for the demo, so Progress and the Roster have something to
// show: one learner well on the way in eFAST (about thirty reviewed exams over six months,
// improving, no learning-curve signal yet) and one whose clean run reaches the acceptable
// failure rate. Each exam records every required eFAST view from the demo library (fluid drawn
// where the exam's truth has free fluid) and is reviewed through the same services the API
// uses; second reads differ from the first now and then within the rubric's tolerance; a few
// exams carry confirmatory results. All people and results are invented.
import crypto from "node:crypto";
import fsp from "node:fs/promises";
import type { Db } from "../server/db/knex";
import type { Storage } from "../server/storage/types";
import type { ClipJob, JobQueue } from "../server/jobs/queue";
import { addClip } from "../server/services/clips";
import { mulberry32 } from "../shared/stats/random";
import type { FindingRead } from "../shared/catalogue";
import type { Scores } from "../shared/rubric/types";
import { queueSubmittedExam } from "../server/services/queue";
import { recordReview } from "../server/services/reviews";
import { examContext } from "../server/repositories/exams";
import { activeRubricFor } from "../server/repositories/rubrics";
import { getSettings } from "../server/repositories/settings";
import { ensureLibrary, shotFile, shotFor } from "./demo-library";

export interface Learner {
  email: string;
  exams: number;
  /** 1-based attempts that fall short of credit (quality 2). */
  failures: number[];
  /** Chance that a non-critical criterion is off its ideal level, first attempt → last. */
  slips: [number, number];
}

export const DEMO_LEARNERS: Learner[] = [
  { email: "sonographer@cedarhollow.example", exams: 28, failures: [2, 5, 9, 16, 24], slips: [0.55, 0.12] },
  { email: "tobias.varga@cedarhollow.example", exams: 22, failures: [], slips: [0.25, 0.05] },
];
const DAYS = 180;
const COMMENTS = [
  "Sweep the whole space before recording; the lower edge was cut off.",
  "Good views. Reduce the depth so the target fills the screen.",
  "Fluid is not quite black: bring the gain down a little.",
  "Clean, well-labelled study.",
  "Hold the probe still for the full clip; the view drifts at the end.",
];
const OFF: Record<string, string[]> = { depth: ["too_deep", "too_shallow"], gain: ["too_high", "too_low"], plane: ["partly"], labels: ["incomplete"] };
const FLUID_FINDINGS = ["free_fluid_ruq", "free_fluid_pelvis", "free_fluid_luq"];

/** A second reviewer's scores: a step away on scan plane, labeling or a good quality now and then, never across the credit line. */
function withinTolerance(scores: Scores, rand: () => number): Scores {
  const out = { ...scores };
  if (rand() < 0.2) out.plane = out.plane === "standard" ? "partly" : "standard";
  if (rand() < 0.15) out.labels = out.labels === "complete" ? "incomplete" : "complete";
  if (Number(out.quality) >= 4 && rand() < 0.3) out.quality = out.quality === "4" ? "5" : "4";
  return out;
}

export async function seedLearningHistory(
  deps: { db: Db; storage: Storage; jobs: Pick<JobQueue, "enqueueClip"> },
  opts: { libraryDir: string; programId?: string; learners?: Learner[]; log?: (s: string) => void },
): Promise<number> {
  const { db, storage, jobs } = deps;
  const program = opts.programId ? { id: opts.programId } : await db("programs").where("slug", "cedar-hollow-em").first("id");
  if (!program) return 0;
  const app = await db("applications").where({ program_id: program.id, code: "efast", status: "published" }).first("id");
  if (!app) return 0;
  const findingKeys: string[] = await db("application_findings").where("application_id", app.id).orderBy("position").pluck("key");
  const viewKeys: string[] = await db("application_views").where({ application_id: app.id, required: true }).orderBy("position").pluck("key");
  // The free-fluid findings a history exam may show, one at a time.
  const fluidKeys = FLUID_FINDINGS.filter((k) => findingKeys.includes(k));
  const library = await ensureLibrary(
    opts.libraryDir,
    [[], ...fluidKeys.map((k) => [k])].flatMap((positives) => viewKeys.map((v) => shotFor("efast", v, positives))),
    opts.log,
  );
  const reviewers = await db("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .where("m.program_id", program.id)
    .whereRaw(`'reviewer' = ANY(m.roles)`)
    .orderBy("u.email")
    .select("u.id");
  const rand = mulberry32(6061);
  const clipJobs: { clipId: string; version: number }[] = [];
  let made = 0;

  await db.transaction(async (trx) => {
    const settings = await getSettings(trx, program.id);
    const rubric = (await activeRubricFor(trx, program.id))!;
    for (const learner of opts.learners ?? DEMO_LEARNERS) {
      const user = await trx("users").where("email", learner.email).first("id");
      if (!user) continue;
      const eligible = reviewers.filter((r) => r.id !== user.id);
      for (let k = 1; k <= learner.exams; k++) {
        const progress = (k - 1) / Math.max(1, learner.exams - 1);
        // Spread over the last six months, oldest first, a few days apart.
        const performedAt = new Date(Date.now() - Math.round((DAYS * (learner.exams - k + 1)) / (learner.exams + 1)) * 86400_000 - (9 + k) * 3600_000);
        const setting = k % 3 === 0 ? "clinical" : "educational";
        const shows = rand() < 0.2 && fluidKeys.length ? [fluidKeys[Math.floor(rand() * fluidKeys.length)]] : [];
        const reads: { key: string; read: FindingRead }[] = findingKeys.map((key) => ({ key, read: shows.includes(key) ? "positive" : "negative" }));
        const at = new Date(performedAt.getTime() + 2 * 3600_000);
        const [exam] = await trx("exams")
          .insert({
            program_id: program.id,
            sonographer_id: user.id,
            application_id: app.id,
            code: `EX-H${crypto.randomBytes(3).toString("hex").toUpperCase()}`,
            performed_at: performedAt,
            setting,
            transducer: "curvilinear",
            preset: "Abdomen",
            indication: ["Blunt trauma", "Hypotension", "Teaching scan", "Abdominal pain"][k % 4],
            status: "submitted",
            submitted_at: at,
            attested_at: at,
            created_at: performedAt,
            updated_at: at,
          })
          .returning(["id"]);
        await trx("exam_findings").insert(reads.map((r) => ({ exam_id: exam.id, finding_key: r.key, read: r.read })));
        // Through the same service as an upload; its jobs are sent once everything is committed.
        for (const view of viewKeys) {
          const file = library.get(shotFile(shotFor("efast", view, shows)))!;
          await addClip(
            { db: trx, storage, jobs: { enqueueClip: async (j: ClipJob) => void clipJobs.push(j) }, log: (e: unknown) => opts.log?.(String(e)) },
            null,
            {
              exam: { id: exam.id, programId: program.id },
              path: file.path,
              originalName: file.name,
              sizeBytes: (await fsp.stat(file.path)).size,
              view,
              media: { kind: file.kind, mime: file.mime },
              createdAt: performedAt,
            },
          );
        }

        await queueSubmittedExam(trx, { id: exam.id, program_id: program.id, setting }, settings.doubleReadShare);
        const slip = learner.slips[0] + (learner.slips[1] - learner.slips[0]) * progress;
        const scores: Scores = { transducer: "suitable", marker: "follows" };
        for (const key of ["depth", "gain", "plane", "labels"])
          scores[key] =
            rand() < slip ? OFF[key][Math.floor(rand() * OFF[key].length)] : { depth: "fits", gain: "balanced", plane: "standard", labels: "complete" }[key]!;
        scores.quality = learner.failures.includes(k) ? "2" : String(rand() < 0.3 + 0.5 * progress ? 4 + Math.round(rand()) : 3);
        // The reviewer agrees with the learner's reads, except now and then on a teaching scan
        // that already fails (a misread blocks credit on every setting, so disagreeing elsewhere
        // would add failures the history does not plan).
        const reviewerReads = reads.map((r) => ({
          key: r.key,
          read: (setting === "educational" && learner.failures.includes(k) && rand() < 0.3
            ? r.read === "positive"
              ? "negative"
              : "positive"
            : r.read) as FindingRead,
        }));
        const ctx = (await examContext(trx, program.id, exam.id))!;
        const assignments = await trx("assignments").where("exam_id", exam.id).orderBy("kind", "desc").select("id", "kind");
        for (const [i, a] of assignments.entries()) {
          await trx("assignments").where("id", a.id).update({ rubric_id: rubric.id });
          await recordReview(trx, {
            reviewerId: eligible[(k + i) % eligible.length].id,
            assignment: a,
            exam: ctx,
            rubric,
            // The final result is the primary's when the reads agree; a second read differs only
            // within tolerance, so the history needs no adjudication and its credit is as planned.
            body: {
              scores: a.kind === "second" ? withinTolerance(scores, rand) : scores,
              reads: reviewerReads,
              feedback: COMMENTS[(k + i) % COMMENTS.length],
              timeSpentSeconds: 90 + Math.floor(rand() * 200),
            },
            settings,
            at: new Date(at.getTime() + (1 + i) * 86400_000),
          });
        }
        if (k % 4 === 1)
          await trx("exams")
            .where("id", exam.id)
            .update({ feedback_acknowledged_at: new Date(at.getTime() + 3 * 86400_000) });
        // Some findings were later confirmed (or no test was done).
        if (k % 5 === 0) {
          const positive = reads.find((r) => r.read === "positive");
          const r = positive ?? reads[0];
          await trx("confirmations").insert({
            exam_id: exam.id,
            program_id: program.id,
            finding_key: r.key,
            method: k % 10 === 0 ? "ct" : "follow_up",
            result: k === 15 ? (r.read === "positive" ? "negative" : "positive") : r.read === "indeterminate" ? "negative" : r.read,
            note: "",
            entered_by: user.id,
            entered_at: new Date(at.getTime() + 7 * 86400_000),
          });
        } else if (k % 7 === 0) {
          await trx("confirmations").insert({
            exam_id: exam.id,
            program_id: program.id,
            finding_key: reads[0].key,
            method: "none",
            result: null,
            entered_by: user.id,
          });
        }
        made++;
      }
    }
  });
  for (const j of clipJobs) await jobs.enqueueClip(j);
  opts.log?.(`Seeded ${made} reviewed exams of learning history.`);
  return made;
}
