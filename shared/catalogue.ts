// The demo application catalogue. Programs start from this and
// edit their own copy. Views and findings use the trade's plain terms; typical depth is
// a starting value for pre-check hints, not a rule.
export const TRANSDUCERS = ["linear", "curvilinear", "phased", "endocavitary"] as const;
export type Transducer = (typeof TRANSDUCERS)[number];

export const SETTINGS = ["clinical", "educational", "simulated"] as const;
export type ExamSetting = (typeof SETTINGS)[number];

export const FINDING_READS = ["positive", "negative", "indeterminate"] as const;
export type FindingRead = (typeof FINDING_READS)[number];

export interface CatalogueEntry {
  code: string;
  name: string;
  usualTransducers: Transducer[];
  typicalDepthCm: [number, number];
  views: { key: string; label: string }[];
  findings: { key: string; label: string }[];
}

const v = (key: string, label: string) => ({ key, label });

/** Default catalogue seeded into each new program. */
export const DEFAULT_CATALOGUE: CatalogueEntry[] = [
  {
    code: "efast",
    name: "Trauma (FAST / eFAST)",
    usualTransducers: ["curvilinear", "phased", "linear"],
    typicalDepthCm: [12, 20],
    views: [
      v("ruq", "Right upper quadrant"),
      v("luq", "Left upper quadrant"),
      v("pelvis_long", "Pelvis, longitudinal"),
      v("pelvis_trans", "Pelvis, transverse"),
      v("subxiphoid", "Subxiphoid cardiac"),
      v("chest_right", "Right anterior chest"),
      v("chest_left", "Left anterior chest"),
    ],
    findings: [
      v("free_fluid_ruq", "Free fluid, right upper quadrant"),
      v("free_fluid_luq", "Free fluid, left upper quadrant"),
      v("free_fluid_pelvis", "Free fluid, pelvis"),
      v("pericardial_effusion", "Pericardial effusion"),
      v("pneumothorax_right", "Pneumothorax, right"),
      v("pneumothorax_left", "Pneumothorax, left"),
    ],
  },
  {
    code: "cardiac",
    name: "Focused cardiac",
    usualTransducers: ["phased"],
    typicalDepthCm: [14, 20],
    views: [
      v("plax", "Parasternal long axis"),
      v("psax", "Parasternal short axis"),
      v("a4c", "Apical four-chamber"),
      v("subxiphoid", "Subxiphoid"),
      v("ivc", "Inferior vena cava"),
    ],
    findings: [
      v("pericardial_effusion", "Pericardial effusion"),
      v("lv_function_reduced", "Reduced left ventricular function"),
      v("rv_dilated", "Right ventricular dilation"),
      v("ivc_plethoric", "Plethoric IVC"),
    ],
  },
  {
    code: "aorta",
    name: "Abdominal aorta",
    usualTransducers: ["curvilinear"],
    typicalDepthCm: [10, 20],
    views: [
      v("proximal_trans", "Proximal transverse"),
      v("mid_trans", "Mid transverse"),
      v("distal_trans", "Distal transverse"),
      v("longitudinal", "Longitudinal"),
      v("bifurcation", "Bifurcation"),
    ],
    findings: [v("aneurysm", "Aneurysm (3 cm or more)")],
  },
  {
    code: "biliary",
    name: "Biliary",
    usualTransducers: ["curvilinear"],
    typicalDepthCm: [8, 16],
    views: [v("gb_long", "Gallbladder, long axis"), v("gb_trans", "Gallbladder, transverse"), v("cbd", "Common bile duct")],
    findings: [
      v("gallstones", "Gallstones"),
      v("wall_thickening", "Gallbladder wall thickening"),
      v("pericholecystic_fluid", "Pericholecystic fluid"),
      v("cbd_dilated", "Dilated common bile duct"),
    ],
  },
  {
    code: "renal",
    name: "Renal",
    usualTransducers: ["curvilinear"],
    typicalDepthCm: [10, 16],
    views: [
      v("right_long", "Right kidney, long axis"),
      v("right_trans", "Right kidney, transverse"),
      v("left_long", "Left kidney, long axis"),
      v("left_trans", "Left kidney, transverse"),
      v("bladder", "Bladder"),
    ],
    findings: [
      v("hydronephrosis_right", "Hydronephrosis, right"),
      v("hydronephrosis_left", "Hydronephrosis, left"),
      v("bladder_distended", "Distended bladder"),
    ],
  },
  {
    code: "lung",
    name: "Lung / thoracic",
    usualTransducers: ["linear", "curvilinear", "phased"],
    typicalDepthCm: [4, 18],
    views: [
      v("anterior_right", "Right anterior zone"),
      v("anterior_left", "Left anterior zone"),
      v("lateral_right", "Right lateral zone"),
      v("lateral_left", "Left lateral zone"),
      v("base_right", "Right pleural base"),
      v("base_left", "Left pleural base"),
    ],
    findings: [
      v("pneumothorax", "Pneumothorax (absent lung sliding)"),
      v("b_lines", "Diffuse B-lines"),
      v("pleural_effusion", "Pleural effusion"),
      v("consolidation", "Consolidation"),
    ],
  },
  {
    code: "dvt",
    name: "Lower-extremity DVT",
    usualTransducers: ["linear"],
    typicalDepthCm: [3, 6],
    views: [v("cfv", "Common femoral vein"), v("sfj", "Saphenofemoral junction"), v("fv", "Femoral vein"), v("popliteal", "Popliteal vein")],
    findings: [v("non_compressible", "Non-compressible vein segment")],
  },
  {
    code: "pelvic",
    name: "Early pregnancy",
    usualTransducers: ["curvilinear", "endocavitary"],
    typicalDepthCm: [10, 18],
    views: [v("uterus_long", "Uterus, longitudinal"), v("uterus_trans", "Uterus, transverse")],
    findings: [v("iup", "Intrauterine pregnancy"), v("cardiac_activity", "Embryonic cardiac activity"), v("free_fluid", "Free fluid")],
  },
  {
    code: "ocular",
    name: "Ocular",
    usualTransducers: ["linear"],
    typicalDepthCm: [4, 5],
    views: [v("globe_trans", "Globe, transverse"), v("globe_sag", "Globe, sagittal"), v("onsd", "Optic nerve sheath")],
    findings: [
      v("retinal_detachment", "Retinal detachment"),
      v("vitreous_hemorrhage", "Vitreous haemorrhage"),
      v("onsd_enlarged", "Enlarged optic nerve sheath"),
    ],
  },
  {
    code: "soft_tissue",
    name: "Soft tissue / MSK",
    usualTransducers: ["linear"],
    typicalDepthCm: [2, 6],
    views: [v("plane_1", "Area of interest, first plane"), v("plane_2", "Area of interest, second plane")],
    findings: [v("abscess", "Abscess"), v("cobblestoning", "Cobblestoning"), v("foreign_body", "Foreign body")],
  },
  {
    code: "procedure",
    name: "Procedural guidance",
    usualTransducers: ["linear"],
    typicalDepthCm: [2, 6],
    views: [v("target_needle", "Target and needle in plane")],
    findings: [v("target_identified", "Target identified"), v("needle_tip_seen", "Needle tip seen throughout")],
  },
];
