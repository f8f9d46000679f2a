// The demo's received DICOM studies (issue 13): seeded through the receiver's own service, so
// each object is de-identified (no invented patient name or operator left in the stored bytes,
// read back with DCMTK's dcmdump) and previewed; studies are grouped, matched by operator name
// to the one clinician who gave it, or left unassigned; a second run adds nothing.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { makeKit, makeMember, makeProgram, type TestKit } from "./helpers";
import { seedDemoInbox } from "../../seeds/demo-inbox";
import { CEDAR_HOLLOW_CASES, seedDemoExams } from "../../seeds/demo-exams";
import { insertCatalogue } from "../../server/repositories/applications";
import { DEFAULT_CATALOGUE } from "../../shared/catalogue";

let kit: TestKit;
let dir: string;
beforeAll(() => {
  kit = makeKit();
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "soundings-demo-inbox-"));
});
afterAll(async () => {
  await kit.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

describe("demo received studies", () => {
  it("lands de-identified, previewed studies in the inbox, matched by operator name, once", async () => {
    const p = await makeProgram(kit.db);
    const varga = await makeMember(kit.db, p.id, ["sonographer"]);
    await kit
      .db("memberships")
      .where({ program_id: p.id, user_id: varga.id })
      .update({ dicom_operator_names: ["VARGA^TOBIAS"] });
    const made = await seedDemoInbox(kit, { libraryDir: dir, programIds: { "cedar-hollow-em": p.id } });
    expect(made).toBe(3);
    const studies = await kit.db("dicom_inbox_studies").where("program_id", p.id).orderBy("first_received_at", "desc");
    expect(studies.map((s) => s.calling_ae)).toEqual(["ED_US_BAY3", "ED_US_BAY1", "ED_US_TRIAGE"]);
    // The eFAST study from Tobias Varga's machine: two objects, matched to him; nobody else gave the other names.
    expect(studies.map((s) => s.matched_user_id)).toEqual([varga.id, null, null]);
    const objects = await kit.db("dicom_inbox_objects").whereIn(
      "study_id",
      studies.map((s) => s.id),
    );
    expect(objects).toHaveLength(4);
    const efast = objects.filter((o) => o.study_id === studies[0].id);
    expect(efast).toHaveLength(2);
    expect(efast[0].facts).toMatchObject({ depthCm: 16, frequencyMHz: 3.5, frames: 30, transducerType: "CURVED LINEAR" });
    for (const o of objects) expect(o.preview_key).toMatch(/\.jpg$/);
    // dcmdump (DCMTK) of a stored object: the invented identity is gone, the identity-removed mark is set.
    const stored = path.join(dir, "stored.dcm");
    await kit.storage.download(efast[0].storage_key, stored);
    const dump = execFileSync("dcmdump", [stored], { encoding: "utf8" });
    for (const value of ["Demo^Patient", "DEMO-0001", "Varga^Tobias", "Cedar Hollow Emergency Department", "DEMO PRIVATE NOTE"])
      expect(dump).not.toContain(value);
    expect(dump).toMatch(/\(0012,0062\) CS \[YES\]/);
    expect(await seedDemoInbox(kit, { libraryDir: dir, programIds: { "cedar-hollow-em": p.id } })).toBe(0);
  }, 120_000);

  it("records the demo's DICOM exam as de-identified DICOM clips that keep their depth", async () => {
    const p = await makeProgram(kit.db);
    await kit.db("applications").where("program_id", p.id).delete();
    await insertCatalogue(
      kit.db,
      p.id,
      DEFAULT_CATALOGUE.filter((a) => a.code === "cardiac"),
    );
    await makeMember(kit.db, p.id, ["sonographer"]);
    const cases = CEDAR_HOLLOW_CASES.filter((c) => c.dicom);
    expect(cases.map((c) => c.app)).toEqual(["cardiac"]);
    await seedDemoExams({ db: kit.db, storage: kit.storage, jobs: { enqueueClip: async () => {} } }, { libraryDir: dir, programId: p.id, cases });
    const clips = await kit.db("clips").where("program_id", p.id);
    expect(clips.length).toBeGreaterThanOrEqual(5);
    for (const c of clips) {
      expect(c.mime).toBe("application/dicom");
      expect(c.dicom).toMatchObject({ depthCm: 16, frequencyMHz: 2.5, transducerType: "SECTOR_PHASED", frames: 30 });
    }
    const stored = path.join(dir, "original.dcm");
    await kit.storage.download(clips[0].original_key, stored);
    const dump = execFileSync("dcmdump", [stored], { encoding: "utf8" });
    expect(dump).not.toContain("Demo^Patient");
    expect(dump).toMatch(/\(0012,0062\) CS \[YES\]/);
  }, 120_000);
});
