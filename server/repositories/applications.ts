// Reading and seeding a program's application catalogue.
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import type { Application } from "../../shared/schemas/applications";
import type { CatalogueEntry, Transducer } from "../../shared/catalogue";

type Q = Db | Knex.Transaction;

export async function listApplications(db: Q, programId: string): Promise<Application[]> {
  const apps = await db("applications").where("program_id", programId).orderBy(["position", "name"]);
  const ids = apps.map((a) => a.id);
  const [views, findings] = await Promise.all([
    db("application_views").whereIn("application_id", ids).orderBy("position"),
    db("application_findings").whereIn("application_id", ids).orderBy("position"),
  ]);
  const byApp = (rows: { application_id: string; key: string; label: string }[], id: string) =>
    rows.filter((r) => r.application_id === id).map((r) => ({ key: r.key, label: r.label }));
  return apps.map((a) => ({
    id: a.id,
    code: a.code,
    name: a.name,
    active: a.active,
    usualTransducers: a.usual_transducers as Transducer[],
    typicalDepthCm: [Number(a.depth_min_cm), Number(a.depth_max_cm)],
    views: byApp(views, a.id),
    findings: byApp(findings, a.id),
  }));
}

/** Copies a catalogue into a program (used when a program is created). */
export async function insertCatalogue(db: Q, programId: string, catalogue: CatalogueEntry[]): Promise<void> {
  const apps = await db("applications")
    .insert(
      catalogue.map((c, i) => ({
        program_id: programId,
        code: c.code,
        name: c.name,
        usual_transducers: c.usualTransducers,
        depth_min_cm: c.typicalDepthCm[0],
        depth_max_cm: c.typicalDepthCm[1],
        position: i,
      })),
    )
    .returning(["id", "code"]);
  const idOf = new Map(apps.map((a) => [a.code, a.id]));
  const rows = (pick: (c: CatalogueEntry) => { key: string; label: string }[]) =>
    catalogue.flatMap((c) => pick(c).map((x, i) => ({ application_id: idOf.get(c.code), key: x.key, label: x.label, position: i })));
  await db("application_views").insert(rows((c) => c.views));
  await db("application_findings").insert(rows((c) => c.findings));
}

/** The views and findings of the exam's application, in their catalogue order. */
export async function viewsAndFindingsOfExam(db: Q, examId: string) {
  const [views, findings] = await Promise.all([
    db("application_views as v")
      .join("exams as e", "e.application_id", "v.application_id")
      .where("e.id", examId)
      .orderBy("v.position")
      .select<{ key: string; label: string }[]>("v.key", "v.label"),
    findingsOfApplication(db, examId, "exam"),
  ]);
  return { views, findings };
}

/** The findings of an application (or of an exam's application), in their catalogue order. */
export function findingsOfApplication(db: Q, id: string, of: "application" | "exam" = "application") {
  if (of === "application")
    return db("application_findings").where("application_id", id).orderBy("position").select<{ key: string; label: string }[]>("key", "label");
  return db("application_findings as f")
    .join("exams as e", "e.application_id", "f.application_id")
    .where("e.id", id)
    .orderBy("f.position")
    .select<{ key: string; label: string }[]>("f.key", "f.label");
}
