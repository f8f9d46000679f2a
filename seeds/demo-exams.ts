// Invented demo exams for Cedar Hollow: about forty exams across applications and demo
// sonographers, drafts and submitted ones, one with a clip that fails processing. Clips come
// from a small library generated once with ffmpeg (ultrasound-like noise in linear, curved
// and narrow-sector footprints — no patient images) and go through the real pipeline.
import crypto from "node:crypto";
import fs from "node:fs";
import fsp from "node:fs/promises";
import path from "node:path";
import type { Db } from "../server/db/knex";
import type { Storage } from "../server/storage/types";
import type { ClipJob, JobQueue } from "../server/jobs/queue";
import { addClip } from "../server/services/clips";
import { generateDemoClip, generateDemoStill, type DemoClipOptions, type DemoImageOptions } from "./clips/generate";
import { mulberry32 } from "../shared/stats/random";
import type { FindingRead } from "../shared/catalogue";
import { queueSubmittedExam } from "../server/services/queue";
import { recordReview } from "../server/services/reviews";
import { examContext } from "../server/repositories/exams";
import { activeRubricFor } from "../server/repositories/rubrics";
import { getSettings } from "../server/repositories/settings";
import { criteriaFor } from "../shared/rubric/logic";
import type { Rubric, Scores } from "../shared/rubric/types";

interface LibraryItem {
  name: string;
  file: string;
  kind: "video" | "still";
  mime: string;
  make: (out: string) => Promise<void>;
}

const clip = (name: string, o: Partial<DemoClipOptions> & Pick<DemoClipOptions, "footprint">, file = `${name}.mp4`): LibraryItem => ({
  name,
  file,
  kind: "video",
  mime: file.endsWith(".avi") ? "video/x-msvideo" : "video/mp4",
  make: (out) => generateDemoClip(out, { width: 480, height: 360, seconds: 2, fps: 15, ...o }),
});
const still = (name: string, o: DemoImageOptions): LibraryItem => ({
  name,
  file: `${name}.png`,
  kind: "still",
  mime: "image/png",
  make: (out) => generateDemoStill(out, o),
});

/** The clip library, by application code. */
const LIBRARY: Record<string, LibraryItem[]> = {
  efast: [
    clip("efast-ruq", { footprint: "curvilinear", seed: 1, label: "CEDAR HOLLOW  ABD  16cm" }),
    clip("efast-pelvis", { footprint: "curvilinear", seed: 2, fluid: false, label: "CEDAR HOLLOW  ABD  14cm" }),
  ],
  cardiac: [clip("cardiac-plax", { footprint: "phased", seed: 3, label: "CEDAR HOLLOW  CARD  16cm" })],
  aorta: [clip("aorta-deep", { footprint: "curvilinear", seed: 4, unusedDepth: 0.4, fluid: false, label: "CEDAR HOLLOW  ABD  24cm" })],
  biliary: [clip("biliary-bright", { footprint: "curvilinear", seed: 5, gain: "high", label: "CEDAR HOLLOW  ABD  12cm" })],
  renal: [clip("renal-dim", { footprint: "curvilinear", seed: 6, gain: "low", label: "CEDAR HOLLOW  ABD  14cm" }, "renal-dim.avi")],
  lung: [clip("lung-linear", { footprint: "linear", seed: 7, fluid: false, label: "CEDAR HOLLOW  LUNG  5cm" })],
  dvt: [clip("dvt-linear", { footprint: "linear", seed: 8, label: "CEDAR HOLLOW  VASC  4cm" })],
  soft_tissue: [still("soft-tissue", { footprint: "linear", width: 480, height: 360, seed: 9, label: "CEDAR HOLLOW  MSK  3cm" })],
};
const APPS = Object.keys(LIBRARY);

async function buildLibrary(dir: string, apps: string[], log: (s: string) => void): Promise<Map<string, string>> {
  await fsp.mkdir(dir, { recursive: true });
  const files = new Map<string, string>();
  const items = apps.flatMap((a) => LIBRARY[a]);
  let made = 0;
  // Two at a time: ffmpeg already uses both cores well.
  for (let i = 0; i < items.length; i += 2) {
    await Promise.all(
      items.slice(i, i + 2).map(async (item) => {
        const out = path.join(dir, item.file);
        if (!fs.existsSync(out)) {
          await item.make(out);
          made++;
        }
        files.set(item.name, out);
      }),
    );
  }
  if (made) log(`Generated ${made} demo clips in ${dir}`);
  // A file that starts like an MP4 but is cut short: the demo's one failed clip.
  const broken = path.join(dir, "broken.mp4");
  if (!fs.existsSync(broken)) {
    const full = await fsp.readFile([...files.values()].find((f) => f.endsWith(".mp4"))!);
    await fsp.writeFile(broken, full.subarray(0, Math.floor(full.length / 4)));
  }
  files.set("broken", broken);
  return files;
}

/** Seeds the demo exams once (when Cedar Hollow has none); clips are processed by the queue. */
export async function seedDemoExams(
  deps: { db: Db; storage: Storage; jobs: Pick<JobQueue, "enqueueClip"> },
  opts: { libraryDir: string; count?: number; programId?: string; apps?: string[]; log?: (s: string) => void },
): Promise<number> {
  const { db, storage, jobs } = deps;
  const log = opts.log ?? (() => {});
  const program = opts.programId ? { id: opts.programId } : await db("programs").where("slug", "cedar-hollow-em").first("id");
  if (!program) return 0;
  if (await db("exams").where("program_id", program.id).first("id")) return 0;
  const appCodes = opts.apps ?? APPS;
  if (!appCodes.some((a) => LIBRARY[a]?.some((it) => it.kind === "video"))) throw new Error("the demo needs at least one application with a video clip");
  const library = await buildLibrary(opts.libraryDir, appCodes, log);
  const sonographers = await db("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .where("m.program_id", program.id)
    .whereRaw(`'sonographer' = ANY(m.roles)`)
    .orderBy("u.email")
    .select("u.id", "u.email");
  const apps = await db("applications").where("program_id", program.id).whereIn("code", appCodes).orderBy("position").select("id", "code");
  const findings = await db("application_findings")
    .whereIn(
      "application_id",
      apps.map((a) => a.id),
    )
    .select("application_id", "key");
  const rand = mulberry32(20261201);
  const pick = <T>(xs: T[]) => xs[Math.floor(rand() * xs.length)];
  const count = opts.count ?? 40;
  const jobsToSend: { clipId: string; version: number }[] = [];

  const submitted: { id: string; setting: string; performedAt: Date; sonographerId: string }[] = [];
  await db.transaction(async (trx) => {
    for (let i = 0; i < count; i++) {
      const app = apps[i % apps.length];
      const sono = sonographers[i % sonographers.length];
      const daysAgo = Math.floor(rand() * 90) + (i < 8 ? 0 : 1);
      const performedAt = new Date(Date.now() - daysAgo * 86400_000 - Math.floor(rand() * 10) * 3600_000);
      // Most are submitted; the newest few of each person stay drafts.
      const draft = i >= count - 10;
      const [exam] = await trx("exams")
        .insert({
          program_id: program.id,
          sonographer_id: sono.id,
          application_id: app.id,
          code: `EX-D${String(i).padStart(2, "0")}${crypto.randomBytes(2).toString("hex").toUpperCase().slice(0, 3)}`,
          performed_at: performedAt,
          setting: pick(["clinical", "clinical", "educational", "simulated"]),
          transducer: app.code === "cardiac" ? "phased" : ["lung", "dvt", "soft_tissue"].includes(app.code) ? "linear" : "curvilinear",
          preset: { cardiac: "Cardiac", lung: "Lung", dvt: "Vascular", soft_tissue: "MSK" }[app.code as string] ?? "Abdomen",
          indication: pick(["Blunt trauma", "Hypotension", "Shortness of breath", "Abdominal pain", "Leg swelling", "Teaching scan", "Flank pain"]),
          status: draft ? "draft" : "submitted",
          submitted_at: draft ? null : new Date(performedAt.getTime() + 3 * 3600_000),
          attested_at: draft ? null : new Date(performedAt.getTime() + 3 * 3600_000),
          created_at: performedAt,
          updated_at: performedAt,
        })
        .returning(["id", "setting"]);
      if (!draft) submitted.push({ id: exam.id, setting: exam.setting, performedAt, sonographerId: sono.id });
      const keys = findings.filter((f) => f.application_id === app.id).map((f) => f.key);
      if (keys.length) {
        await trx("exam_findings").insert(
          keys.map((key) => ({
            exam_id: exam.id,
            finding_key: key,
            read: (rand() < 0.2 ? "positive" : rand() < 0.1 ? "indeterminate" : "negative") as FindingRead,
          })),
        );
      }
      const items = LIBRARY[app.code];
      const names = items.map((it) => it.name);
      if (i === count - 1 && draft) names.push("broken");
      // Through the same service as an upload; its jobs are sent once everything is committed.
      const clipDeps = { db: trx, storage, jobs: { enqueueClip: async (j: ClipJob) => void jobsToSend.push(j) }, log: (e: unknown) => log(String(e)) };
      for (const name of names) {
        const item = items.find((it) => it.name === name);
        await addClip(clipDeps, null, {
          exam: { id: exam.id, programId: program.id },
          path: library.get(name)!,
          originalName: item?.file ?? "scan.mp4",
          sizeBytes: (await fsp.stat(library.get(name)!)).size,
          view: null,
          media: { kind: item?.kind ?? "video", mime: item?.mime ?? "video/mp4" },
          createdAt: performedAt,
        });
      }
    }
  });
  const reviewed = await reviewSome(db, program.id, submitted, rand);
  for (const j of jobsToSend) await jobs.enqueueClip(j);
  log(`Seeded ${count} demo exams with ${jobsToSend.length} clips (processing in the background); ${reviewed} already reviewed.`);
  return count;
}

/** Plausible invented scores: mostly at the ideal level, sometimes one step off. */
function demoScores(rubric: Rubric, applicationCode: string, rand: () => number): Scores {
  const scores: Scores = {};
  for (const c of criteriaFor(rubric.criteria, applicationCode)) {
    if (c.kind === "number") continue;
    const ideal = c.levels.filter((l) => l.ideal);
    const other = c.levels.filter((l) => !l.ideal && !l.fails);
    const roll = rand();
    const level =
      roll < 0.7 || other.length === 0
        ? ideal[Math.floor(rand() * ideal.length)]
        : roll < 0.95
          ? other[Math.floor(rand() * other.length)]
          : c.levels[c.levels.length - 1];
    scores[c.key] = (level ?? c.levels[0]).value;
  }
  return scores;
}

const DEMO_COMMENTS = [
  "Good windows. Bring the depth up so the target fills the screen.",
  "Clear standard views. Label each clip with its view and side.",
  "Gain is a little high: fluid should be black. Otherwise well done.",
  "Solid study. Fan through the whole organ before recording.",
  "Orientation marker flipped on one view; check the screen marker before recording.",
];

/**
 * Queues every submitted demo exam and reviews the older half through the same services
 * the API uses, so the demo starts with feedback, a double read or two, and history.
 */
async function reviewSome(
  db: Db,
  programId: string,
  submitted: { id: string; setting: string; performedAt: Date; sonographerId: string }[],
  rand: () => number,
): Promise<number> {
  const reviewers = await db("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .where("m.program_id", programId)
    .whereRaw(`'reviewer' = ANY(m.roles)`)
    .orderBy("u.email")
    .select("u.id");
  let reviewed = 0;
  await db.transaction(async (trx) => {
    const settings = await getSettings(trx, programId);
    const rubric = (await activeRubricFor(trx, programId))!;
    const byAge = [...submitted].sort((a, b) => a.performedAt.getTime() - b.performedAt.getTime());
    for (const [i, s] of byAge.entries()) {
      await queueSubmittedExam(trx, { id: s.id, program_id: programId, setting: s.setting }, settings.doubleReadShare);
      if (i >= Math.ceil(byAge.length * 0.6)) continue;
      const exam = (await examContext(trx, programId, s.id))!;
      const assignments = await trx("assignments").where("exam_id", s.id).orderBy("kind", "desc").select("id", "kind");
      const eligible = reviewers.filter((r) => r.id !== s.sonographerId);
      if (eligible.length < assignments.length) continue;
      for (const [k, a] of assignments.entries()) {
        const reviewerId = eligible[(i + k) % eligible.length].id;
        const reads = exam.sonographerReads.map((r) => ({
          key: r.key,
          read: (rand() < 0.9 ? r.read : r.read === "positive" ? "negative" : "positive") as FindingRead,
        }));
        const at = new Date(Math.min(Date.now() - 3600_000, s.performedAt.getTime() + (1 + k + rand() * 2) * 86400_000));
        await trx("assignments").where("id", a.id).update({ rubric_id: rubric.id });
        await recordReview(trx, {
          reviewerId,
          assignment: a,
          exam,
          rubric,
          body: {
            scores: demoScores(rubric, exam.application_code, rand),
            reads,
            feedback: DEMO_COMMENTS[(i + k) % DEMO_COMMENTS.length],
            timeSpentSeconds: 60 + Math.floor(rand() * 240),
          },
          settings,
          at,
        });
      }
      reviewed++;
    }
  });
  return reviewed;
}
