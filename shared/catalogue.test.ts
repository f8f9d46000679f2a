// The built-in catalogue, the starting copy every program edits. Each entry must pass the
// schema the API uses for an edit (shared/schemas/applications.ts). The clinical content
// checked here is common practice in emergency and critical-care point-of-care ultrasound,
// written from memory (no guideline is named as its source); the 3 cm aortic aneurysm is the
// usual published definition. The checks hold the corrections in place.
import { describe, expect, it } from "vitest";
import { DEFAULT_CATALOGUE, PROCEDURE_CODES, type CatalogueEntry } from "./catalogue";
import { newApplicationSchema } from "./schemas/applications";
import { DEFAULT_CRITERIA } from "./rubric/default-rubric";
import { criteriaFor } from "./rubric/logic";

const app = (code: string): CatalogueEntry => {
  const a = DEFAULT_CATALOGUE.find((x) => x.code === code);
  if (!a) throw new Error(`no ${code} in the catalogue`);
  return a;
};
const findingKeys = (code: string) => app(code).findings.map((f) => f.key);
const hintOf = (code: string, key: string) => [...app(code).findings, ...app(code).views].find((x) => x.key === key)?.hint ?? "";

describe("the built-in catalogue", () => {
  it("passes the API's own check, entry by entry, with codes that differ", () => {
    for (const entry of DEFAULT_CATALOGUE) {
      const parsed = newApplicationSchema.safeParse({ ...entry, active: true });
      expect(parsed.success, `${entry.code}: ${parsed.error?.issues.map((i) => `${i.path.join(".")} ${i.message}`).join("; ")}`).toBe(true);
    }
    expect(new Set(DEFAULT_CATALOGUE.map((a) => a.code)).size).toBe(DEFAULT_CATALOGUE.length);
  });

  it("uses one spelling throughout (US English)", () => {
    const all = JSON.stringify(DEFAULT_CATALOGUE) + JSON.stringify(DEFAULT_CRITERIA);
    for (const british of [/haemo/i, /oedema/i, /colour/i, /recognis/i, /labell/i, /organis/i, /centre/i, /oesoph/i, /foet/i, /anaes/i])
      expect(all.match(new RegExp(`.{0,30}${british.source}.{0,30}`, "i"))?.[0] ?? null, String(british)).toBeNull();
  });

  it("eFAST: hemothorax on each side, and upper-quadrant views that take in the pleural space and the liver or spleen tip", () => {
    expect(findingKeys("efast")).toEqual(expect.arrayContaining(["hemothorax_right", "hemothorax_left", "pneumothorax_right", "pneumothorax_left"]));
    expect(hintOf("efast", "ruq")).toMatch(/diaphragm/);
    expect(hintOf("efast", "ruq")).toMatch(/pleural space/);
    expect(hintOf("efast", "ruq")).toMatch(/liver tip/);
    expect(hintOf("efast", "luq")).toMatch(/pleural space/);
    expect(hintOf("efast", "luq")).toMatch(/spleen tip/);
  });

  it("cardiac: graded left-ventricular function, tamponade physiology, and the IVC plethoric or small", () => {
    expect(findingKeys("cardiac")).toEqual(
      expect.arrayContaining(["lv_function_reduced", "lv_function_severely_reduced", "lv_hyperdynamic", "tamponade", "ivc_plethoric", "ivc_small"]),
    );
    expect(hintOf("cardiac", "lv_function_reduced")).toMatch(/normal when none/);
  });

  it("has a shock application over heart, IVC, abdomen, aorta and lung, and a cardiac-arrest one with the 10-second pause", () => {
    const views = app("shock").views.map((v) => v.key);
    expect(views).toEqual(expect.arrayContaining(["plax", "subxiphoid", "ivc", "ruq", "luq", "pelvis", "aorta", "lung_right", "lung_left"]));
    expect(findingKeys("cardiac_arrest")).toContain("cardiac_activity");
    expect(app("cardiac_arrest").cautions.join(" ")).toMatch(/under 10 seconds/);
    // The pause is technique: a rubric criterion for this application only, never a finding.
    expect(criteriaFor(DEFAULT_CRITERIA, "cardiac_arrest").map((c) => c.key)).toContain("pause");
    expect(criteriaFor(DEFAULT_CRITERIA, "efast").map((c) => c.key)).not.toContain("pause");
  });

  it("biliary: the sonographic Murphy sign, the 3 mm anterior wall and the about-6 mm duct with age", () => {
    expect(findingKeys("biliary")).toContain("murphy_sign");
    expect(hintOf("biliary", "wall_thickening")).toMatch(/Anterior wall over 3 mm/);
    expect(hintOf("biliary", "cbd_dilated")).toMatch(/6 mm/);
    expect(hintOf("biliary", "cbd_dilated")).toMatch(/age/);
  });

  it("lung: absent sliding is not a pneumothorax by itself, the lung point confirms it, and findings carry a side", () => {
    expect(findingKeys("lung")).not.toContain("pneumothorax");
    expect(hintOf("lung", "sliding_absent_right")).toMatch(/not a pneumothorax/);
    expect(hintOf("lung", "sliding_absent_right")).toMatch(/lung point confirms/);
    for (const key of findingKeys("lung")) expect(key).toMatch(/_(right|left)$/);
  });

  it("DVT: 2-point and 3-point protocols, views with and without compression, findings with a side", () => {
    const two = app("dvt").views.map((v) => v.label);
    expect(two.filter((l) => /without compression/.test(l))).toHaveLength(2);
    expect(two.filter((l) => /with compression/.test(l))).toHaveLength(2);
    expect(two.join(" ")).toMatch(/saphenofemoral junction/);
    expect(two.join(" ")).toMatch(/Popliteal/);
    expect(app("dvt_3point").views).toHaveLength(6);
    for (const code of ["dvt", "dvt_3point"]) for (const key of findingKeys(code)) expect(key).toMatch(/_(right|left)$/);
    expect(app("dvt").cautions.join(" ")).toMatch(/does not exclude calf-vein DVT/);
  });

  it("early pregnancy: a yolk sac or fetal pole within the sac, the right upper quadrant, free fluid by site", () => {
    expect(hintOf("pelvic", "iup")).toMatch(/yolk sac or fetal pole within a gestational sac/);
    expect(hintOf("pelvic", "iup")).toMatch(/pseudosac/);
    const ruq = app("pelvic").views.find((v) => v.key === "ruq")!;
    expect(ruq.required).toBe(false);
    expect(ruq.hint).toMatch(/ectopic/);
    expect(findingKeys("pelvic")).toEqual(expect.arrayContaining(["free_fluid_pelvis", "free_fluid_ruq"]));
    expect(app("pelvic").cautions.join(" ")).toMatch(/No intrauterine pregnancy seen does not exclude an ectopic pregnancy/);
  });

  it("ocular: posterior vitreous detachment, lens dislocation, a low-output preset and no pressure on the globe", () => {
    expect(findingKeys("ocular")).toEqual(expect.arrayContaining(["posterior_vitreous_detachment", "lens_dislocation"]));
    expect(app("ocular").presets.join(" ")).toMatch(/low output/);
    expect(app("ocular").cautions.join(" ")).toMatch(/low-output/);
    expect(app("ocular").cautions.join(" ")).toMatch(/Do not press on a possibly open globe/);
  });

  it("soft tissue: subcutaneous gas, joint effusion and fracture", () => {
    expect(findingKeys("soft_tissue")).toEqual(expect.arrayContaining(["subcutaneous_gas", "joint_effusion", "fracture"]));
  });

  it("procedures: one application per procedure, technique on the rubric and never a finding", () => {
    expect([...PROCEDURE_CODES].sort()).toEqual(["arthrocentesis", "nerve_block", "paracentesis_thoracentesis", "pericardiocentesis", "vascular_access"]);
    for (const code of PROCEDURE_CODES) {
      expect(findingKeys(code).some((k) => /needle|target_identified/.test(k))).toBe(false);
      expect(criteriaFor(DEFAULT_CRITERIA, code).map((c) => c.key)).toContain("needle_tip");
    }
    expect(app("paracentesis_thoracentesis").usualTransducers).toContain("curvilinear");
    expect(
      app("vascular_access")
        .views.map((v) => v.hint)
        .join(" "),
    ).toMatch(/Out-of-plane/);
  });

  it("puts cautions on the applications where a negative study is often over-read", () => {
    for (const code of ["efast", "dvt", "pelvic", "lung", "ocular"]) expect(app(code).cautions.length, code).toBeGreaterThan(0);
  });
});
