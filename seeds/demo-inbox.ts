// The demo's received DICOM studies: what the program's ultrasound machines "sent" to its AE
// title, put into each program's inbox through the receiver's own service (so they are
// de-identified and previewed exactly as a real C-STORE would be). In Cedar Hollow one study
// matches Tobias Varga by his operator name, one matches Noa Hartwell, and one from a locum
// matches no one and waits to be claimed; Tamsin Ridge has one unassigned study. The operator
// names are recorded on the clinicians' memberships. Every name and UID is invented; the
// objects are generated (seeds/clips/dicom.ts) and cached beside the demo clips.
import fs from "node:fs";
import fsp from "node:fs/promises";
import path from "node:path";
import type { Db } from "../server/db/knex";
import type { Storage } from "../server/storage/types";
import { receiveIntoInbox } from "../server/services/dicom-inbox";
import { demoDicom, imageOf, shotFor, stableUid } from "./demo-library";

interface DemoStudy {
  program: string;
  name: string;
  callingAe: string;
  operator: string;
  app: string;
  views: string[];
  shows?: string[];
  hoursAgo: number;
}

const STUDIES: DemoStudy[] = [
  {
    program: "cedar-hollow-em",
    name: "varga-efast",
    callingAe: "ED_US_BAY3",
    operator: "Varga^Tobias",
    app: "efast",
    views: ["ruq", "luq"],
    shows: ["free_fluid_ruq"],
    hoursAgo: 3,
  },
  { program: "cedar-hollow-em", name: "hartwell-lung", callingAe: "ED_US_BAY1", operator: "Hartwell^Noa", app: "lung", views: ["anterior_right"], hoursAgo: 6 },
  { program: "cedar-hollow-em", name: "locum-cardiac", callingAe: "ED_US_TRIAGE", operator: "Locum^Night", app: "cardiac", views: ["plax"], hoursAgo: 20 },
  { program: "tamsin-ridge-cc", name: "icu-cardiac", callingAe: "ICU_US_1", operator: "Unlisted^Fellow", app: "cardiac", views: ["a4c"], hoursAgo: 9 },
];

/** Operator names the demo records for its clinicians (by e-mail). */
const OPERATOR_NAMES: Record<string, string[]> = {
  "tobias.varga@cedarhollow.example": ["Varga^Tobias"],
  "sonographer@cedarhollow.example": ["Hartwell^Noa"],
};

/** Seeds the received studies of every demo program whose inbox is empty; returns how many studies it made. */
export async function seedDemoInbox(
  deps: { db: Db; storage: Storage },
  /** programIds: the program to use for a demo program's slug (tests); otherwise found by slug. */
  opts: { libraryDir: string; log?: (s: string) => void; programIds?: Record<string, string> },
): Promise<number> {
  const { db } = deps;
  const log = opts.log ?? (() => {});
  for (const [email, names] of Object.entries(OPERATOR_NAMES)) {
    const user = await db("users").where("email", email).first("id");
    if (user) await db("memberships").where("user_id", user.id).whereRaw("cardinality(dicom_operator_names) = 0").update({ dicom_operator_names: names });
  }
  const dir = path.join(opts.libraryDir, "received");
  await fsp.mkdir(dir, { recursive: true });
  let made = 0;
  for (const study of STUDIES) {
    const program = opts.programIds
      ? opts.programIds[study.program]
        ? { id: opts.programIds[study.program] }
        : undefined
      : await db("programs").where("slug", study.program).first("id");
    if (!program) continue;
    const already = await db("dicom_inbox_studies as s").where("s.program_id", program.id).where("s.calling_ae", study.callingAe).first("s.id");
    if (already) continue;
    const studyUid = stableUid(`demo-study-${study.name}`);
    let studyId: string | null = null;
    for (const view of study.views) {
      const file = path.join(dir, `${study.name}-${view}.dcm`);
      if (!fs.existsSync(file)) {
        const shot = shotFor(study.app, view, study.shows ?? []);
        const bytes = await demoDicom(shot, imageOf(shot, `${study.name}-${view}`), {
          studyUid,
          sopUid: stableUid(`demo-object-${study.name}-${view}`),
          operator: study.operator,
        });
        await fsp.writeFile(file, bytes);
      }
      studyId = await receiveIntoInbox(deps, { programId: program.id, callingAe: study.callingAe, bytes: await fsp.readFile(file) });
    }
    if (studyId) {
      const at = new Date(Date.now() - study.hoursAgo * 3600_000);
      await db("dicom_inbox_studies").where("id", studyId).update({ first_received_at: at, last_received_at: at });
      await db("dicom_inbox_objects").where("study_id", studyId).update({ received_at: at });
      made++;
    }
  }
  if (made) log(`Seeded ${made} received DICOM studies (files in ${dir}).`);
  return made;
}
