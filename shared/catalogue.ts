// The built-in application catalogue: the starting copy each program gets and then edits as
// its own (Setup → Applications; every saved change is a new version of that application).
// Views and findings use the trade's plain terms in US English. Cut-offs in hints and the
// cautions are common practice, written from memory and not taken from a named guideline;
// the one published definition used is the aortic aneurysm's 3 cm. Typical depth is a
// starting value for pre-check hints, not a rule. Technique items (the needle tip seen, a
// short pulse-check pause) are rubric criteria, never findings: findings are what the
// clinician reads as positive, negative or indeterminate, with sensitivity and callbacks.
export const TRANSDUCERS = ["linear", "curvilinear", "phased", "endocavitary"] as const;
export type Transducer = (typeof TRANSDUCERS)[number];

export const SETTINGS = ["clinical", "educational", "simulated"] as const;
export type ExamSetting = (typeof SETTINGS)[number];

export const FINDING_READS = ["positive", "negative", "indeterminate"] as const;
export type FindingRead = (typeof FINDING_READS)[number];

/**
 * How the orientation marker is judged: screen-left (general imaging, the marker toward the
 * patient's head or right shown on the left of the screen) or the cardiology convention
 * (the marker shown on the right of the screen).
 */
export const ORIENTATIONS = ["screen_left", "cardiology"] as const;
export type Orientation = (typeof ORIENTATIONS)[number];

export interface CatalogueView {
  key: string;
  label: string;
  /** A complete study has every required view. */
  required: boolean;
  hint: string;
}

export interface CatalogueFinding {
  key: string;
  label: string;
  /** What makes it positive: a cut-off, what confirms it. */
  hint: string;
}

export interface CatalogueEntry {
  code: string;
  name: string;
  usualTransducers: Transducer[];
  presets: string[];
  typicalDepthCm: [number, number];
  orientation: Orientation;
  /** Shown on the exam and feedback pages. */
  cautions: string[];
  views: CatalogueView[];
  findings: CatalogueFinding[];
}

/** The credit rule a built-in application starts with: the program's threshold, no cap, no minimum of positives, completeness not required. */
export const DEFAULT_APPLICATION_CREDIT_RULE = { threshold: null, nonClinicalCap: null, minPositive: 0, requireComplete: false };

/** The procedure applications; their technique is scored by the rubric's needle criterion. */
export const PROCEDURE_CODES = ["vascular_access", "paracentesis_thoracentesis", "nerve_block", "arthrocentesis", "pericardiocentesis"] as const;

/** A view: required unless `optional` is passed. */
const v = (key: string, label: string, hint = "", optional = false): CatalogueView => ({ key, label, required: !optional, hint });
const opt = (key: string, label: string, hint = "") => v(key, label, hint, true);
const f = (key: string, label: string, hint = ""): CatalogueFinding => ({ key, label, hint });

const SLIDING_ALONE = "Absent lung sliding alone is not a pneumothorax (also bullae, adhesions, a mainstem intubation); the lung point confirms it.";
const LV_GRADE = "Grade left-ventricular function once: normal when none of reduced, severely reduced or hyperdynamic is positive.";
const PROCEDURE_CAUTION =
  "Technique (needle tip seen, in-plane or out-of-plane tracking) is scored on the rubric; local policy governs who performs the procedure.";

/** The compression views both DVT protocols share, each site without and with compression. */
const CFV_VIEWS = [
  v("cfv_open", "Common femoral vein at the saphenofemoral junction, without compression"),
  v("cfv_compressed", "Common femoral vein at the saphenofemoral junction, with compression"),
];
const POPLITEAL_VIEWS = [v("popliteal_open", "Popliteal vein, without compression"), v("popliteal_compressed", "Popliteal vein, with compression")];
const NOT_COMPRESSED = "The vein does not collapse fully with pressure that deforms the artery.";
const DVT_CAUTION = "A limited compression study does not exclude calf-vein DVT; follow local policy for a repeat or a whole-leg study.";
/** Findings of one vein segment, each side. */
const nonCompressible = (segment: string, name: string) => [
  f(`non_compressible_${segment}_right`, `Non-compressible ${name}, right`, NOT_COMPRESSED),
  f(`non_compressible_${segment}_left`, `Non-compressible ${name}, left`, NOT_COMPRESSED),
];

/** Default catalogue seeded into each new program. */
export const DEFAULT_CATALOGUE: CatalogueEntry[] = [
  {
    code: "efast",
    name: "Trauma (FAST / eFAST)",
    usualTransducers: ["curvilinear", "phased", "linear"],
    presets: ["Abdomen", "Lung"],
    typicalDepthCm: [12, 20],
    orientation: "screen_left",
    cautions: [
      "A negative FAST does not exclude intra-abdominal injury (retroperitoneal and hollow-organ injury are often missed); repeat the study when the patient's condition changes.",
    ],
    views: [
      v("ruq", "Right upper quadrant", "Include the diaphragm with the pleural space above it, the hepatorenal space and the liver tip."),
      v("luq", "Left upper quadrant", "Include the subdiaphragmatic space, the pleural space above the diaphragm, the splenorenal space and the spleen tip."),
      v("pelvis_long", "Pelvis, longitudinal"),
      v("pelvis_trans", "Pelvis, transverse"),
      v("subxiphoid", "Subxiphoid cardiac"),
      v("chest_right", "Right anterior chest", "Lung sliding at the pleural line, in the least dependent zone."),
      v("chest_left", "Left anterior chest", "Lung sliding at the pleural line, in the least dependent zone."),
    ],
    findings: [
      f("free_fluid_ruq", "Free fluid, right upper quadrant"),
      f("free_fluid_luq", "Free fluid, left upper quadrant"),
      f("free_fluid_pelvis", "Free fluid, pelvis"),
      f("pericardial_effusion", "Pericardial effusion"),
      f("hemothorax_right", "Pleural fluid (hemothorax), right", "Anechoic fluid above the diaphragm; the spine seen above the diaphragm."),
      f("hemothorax_left", "Pleural fluid (hemothorax), left", "Anechoic fluid above the diaphragm; the spine seen above the diaphragm."),
      f("pneumothorax_right", "Pneumothorax, right", SLIDING_ALONE),
      f("pneumothorax_left", "Pneumothorax, left", SLIDING_ALONE),
    ],
  },
  {
    code: "cardiac",
    name: "Focused cardiac",
    usualTransducers: ["phased"],
    presets: ["Cardiac"],
    typicalDepthCm: [14, 20],
    orientation: "cardiology",
    cautions: [
      "A focused cardiac study grades function by eye; it does not replace a formal echocardiogram.",
      "IVC size and collapse depend on breathing and on positive-pressure ventilation; read them with the clinical picture.",
    ],
    views: [
      v("plax", "Parasternal long axis"),
      v("psax", "Parasternal short axis"),
      v("a4c", "Apical four-chamber"),
      v("subxiphoid", "Subxiphoid"),
      v("ivc", "Inferior vena cava", "Long axis, entering the right atrium, through a breathing cycle."),
    ],
    findings: [
      f("pericardial_effusion", "Pericardial effusion"),
      f("tamponade", "Tamponade physiology", "An effusion with right-atrial systolic or right-ventricular diastolic collapse, and a plethoric IVC."),
      f("lv_function_reduced", "Left-ventricular function reduced", LV_GRADE),
      f("lv_function_severely_reduced", "Left-ventricular function severely reduced", LV_GRADE),
      f("lv_hyperdynamic", "Left-ventricular function hyperdynamic", LV_GRADE),
      f("rv_dilated", "Right-ventricular dilation", "The right ventricle as large as the left or larger in the apical four-chamber view."),
      f("ivc_plethoric", "IVC plethoric", "Wide (over about 2 cm) with little change with breathing."),
      f("ivc_small", "IVC small or collapsing", "Narrow, or collapsing by more than about half with breathing."),
    ],
  },
  {
    code: "aorta",
    name: "Abdominal aorta",
    usualTransducers: ["curvilinear"],
    presets: ["Abdomen"],
    typicalDepthCm: [10, 20],
    orientation: "screen_left",
    cautions: ["A normal aortic diameter does not exclude aortic dissection."],
    views: [
      v("proximal_trans", "Proximal transverse"),
      v("mid_trans", "Mid transverse"),
      v("distal_trans", "Distal transverse"),
      v("longitudinal", "Longitudinal"),
      v("bifurcation", "Bifurcation"),
    ],
    findings: [f("aneurysm", "Aneurysm (3 cm or more)", "Outer wall to outer wall at the widest point, in transverse.")],
  },
  {
    code: "shock",
    name: "Shock / hypotension",
    usualTransducers: ["phased", "curvilinear"],
    presets: ["Cardiac", "Abdomen"],
    typicalDepthCm: [12, 20],
    orientation: "screen_left",
    cautions: ["A shock protocol narrows the causes; a limited or missing window excludes none of them."],
    views: [
      v("plax", "Heart, parasternal long axis"),
      v("subxiphoid", "Heart, subxiphoid"),
      opt("a4c", "Heart, apical four-chamber"),
      v("ivc", "Inferior vena cava"),
      v("ruq", "Right upper quadrant"),
      v("luq", "Left upper quadrant"),
      v("pelvis", "Pelvis"),
      v("aorta", "Abdominal aorta"),
      v("lung_right", "Right anterior lung"),
      v("lung_left", "Left anterior lung"),
    ],
    findings: [
      f("pericardial_effusion", "Pericardial effusion"),
      f("tamponade", "Tamponade physiology", "An effusion with right-atrial systolic or right-ventricular diastolic collapse, and a plethoric IVC."),
      f("lv_function_reduced", "Left-ventricular function reduced", LV_GRADE),
      f("lv_function_severely_reduced", "Left-ventricular function severely reduced", LV_GRADE),
      f("lv_hyperdynamic", "Left-ventricular function hyperdynamic", LV_GRADE),
      f("rv_dilated", "Right-ventricular dilation"),
      f("ivc_plethoric", "IVC plethoric", "Wide (over about 2 cm) with little change with breathing."),
      f("ivc_small", "IVC small or collapsing", "Narrow, or collapsing by more than about half with breathing."),
      f("free_fluid", "Free fluid, abdomen or pelvis"),
      f("aneurysm", "Abdominal aortic aneurysm (3 cm or more)"),
      f("pneumothorax_right", "Pneumothorax, right", SLIDING_ALONE),
      f("pneumothorax_left", "Pneumothorax, left", SLIDING_ALONE),
      f("b_lines", "Diffuse B-lines, both sides"),
    ],
  },
  {
    code: "cardiac_arrest",
    name: "Cardiac arrest",
    usualTransducers: ["phased", "curvilinear"],
    presets: ["Cardiac"],
    typicalDepthCm: [14, 20],
    orientation: "cardiology",
    cautions: [
      "Scanning must not lengthen pauses in chest compressions: aim for a pulse-check pause under 10 seconds, recording the clip and reviewing it after compressions resume.",
      "Cardiac activity seen or not seen informs, but does not alone decide, when resuscitation stops.",
    ],
    views: [v("subxiphoid", "Subxiphoid", "Recorded during the pulse check."), opt("plax", "Parasternal long axis"), opt("a4c", "Apical four-chamber")],
    findings: [
      f("cardiac_activity", "Organized cardiac activity", "Wall or valve motion; negative is cardiac standstill."),
      f("pericardial_effusion", "Pericardial effusion"),
      f("rv_dilated", "Right-ventricular dilation"),
    ],
  },
  {
    code: "biliary",
    name: "Biliary",
    usualTransducers: ["curvilinear"],
    presets: ["Abdomen"],
    typicalDepthCm: [8, 16],
    orientation: "screen_left",
    cautions: ["Wall thickening is not specific: it also follows a meal and occurs with ascites, heart failure and liver disease."],
    views: [
      v("gb_long", "Gallbladder, long axis"),
      v("gb_trans", "Gallbladder, transverse"),
      v("cbd", "Common bile duct", "At the portal vein, with color Doppler to tell duct from vessel where available."),
    ],
    findings: [
      f("gallstones", "Gallstones", "Echogenic, shadowing, and moving with position."),
      f("wall_thickening", "Gallbladder wall thickening", "Anterior wall over 3 mm."),
      f("pericholecystic_fluid", "Pericholecystic fluid"),
      f("murphy_sign", "Sonographic Murphy sign", "Greatest tenderness under the transducer over the gallbladder."),
      f("cbd_dilated", "Dilated common bile duct", "Over about 6 mm inner wall to inner wall; the normal limit rises with age and after cholecystectomy."),
    ],
  },
  {
    code: "renal",
    name: "Renal",
    usualTransducers: ["curvilinear"],
    presets: ["Abdomen"],
    typicalDepthCm: [10, 16],
    orientation: "screen_left",
    cautions: [],
    views: [
      v("right_long", "Right kidney, long axis"),
      v("right_trans", "Right kidney, transverse"),
      v("left_long", "Left kidney, long axis"),
      v("left_trans", "Left kidney, transverse"),
      v("bladder", "Bladder"),
    ],
    findings: [
      f("hydronephrosis_right", "Hydronephrosis, right"),
      f("hydronephrosis_left", "Hydronephrosis, left"),
      f("bladder_distended", "Distended bladder"),
    ],
  },
  {
    code: "lung",
    name: "Lung / thoracic",
    usualTransducers: ["linear", "curvilinear", "phased"],
    presets: ["Lung"],
    typicalDepthCm: [4, 18],
    orientation: "screen_left",
    cautions: [SLIDING_ALONE],
    views: [
      v("anterior_right", "Right anterior zone"),
      v("anterior_left", "Left anterior zone"),
      v("lateral_right", "Right lateral zone"),
      v("lateral_left", "Left lateral zone"),
      v("base_right", "Right pleural base"),
      v("base_left", "Left pleural base"),
    ],
    findings: [
      f("sliding_absent_right", "Lung sliding absent, right", SLIDING_ALONE),
      f("sliding_absent_left", "Lung sliding absent, left", SLIDING_ALONE),
      f("lung_point_right", "Lung point (pneumothorax), right"),
      f("lung_point_left", "Lung point (pneumothorax), left"),
      f("b_lines_right", "B-lines, right", "Three or more in one intercostal space, in more than one zone."),
      f("b_lines_left", "B-lines, left", "Three or more in one intercostal space, in more than one zone."),
      f("pleural_effusion_right", "Pleural effusion, right"),
      f("pleural_effusion_left", "Pleural effusion, left"),
      f("consolidation_right", "Consolidation, right"),
      f("consolidation_left", "Consolidation, left"),
    ],
  },
  {
    code: "dvt",
    name: "Lower-extremity DVT, 2-point",
    usualTransducers: ["linear"],
    presets: ["Vascular"],
    typicalDepthCm: [3, 6],
    orientation: "screen_left",
    cautions: [DVT_CAUTION],
    views: [...CFV_VIEWS, ...POPLITEAL_VIEWS],
    findings: [...nonCompressible("cfv", "common femoral vein"), ...nonCompressible("popliteal", "popliteal vein")],
  },
  {
    code: "dvt_3point",
    name: "Lower-extremity DVT, 3-point",
    usualTransducers: ["linear"],
    presets: ["Vascular"],
    typicalDepthCm: [3, 6],
    orientation: "screen_left",
    cautions: [DVT_CAUTION],
    views: [
      ...CFV_VIEWS,
      v("fv_open", "Femoral vein, proximal thigh, without compression"),
      v("fv_compressed", "Femoral vein, proximal thigh, with compression"),
      ...POPLITEAL_VIEWS,
    ],
    findings: [...nonCompressible("cfv", "common femoral vein"), ...nonCompressible("fv", "femoral vein"), ...nonCompressible("popliteal", "popliteal vein")],
  },
  {
    code: "pelvic",
    name: "Early pregnancy",
    usualTransducers: ["curvilinear", "endocavitary"],
    presets: ["Obstetric", "Abdomen"],
    typicalDepthCm: [10, 18],
    orientation: "screen_left",
    cautions: [
      "No intrauterine pregnancy seen does not exclude an ectopic pregnancy.",
      "A gestational sac without a yolk sac or fetal pole may be a pseudosac.",
    ],
    views: [
      v("uterus_long", "Uterus, longitudinal"),
      v("uterus_trans", "Uterus, transverse"),
      v("rectouterine", "Rectouterine pouch"),
      opt("ruq", "Right upper quadrant", "When ectopic pregnancy is suspected: free fluid in the hepatorenal space."),
    ],
    findings: [
      f("iup", "Intrauterine pregnancy", "A yolk sac or fetal pole within a gestational sac in the uterus; a sac alone may be a pseudosac."),
      f("cardiac_activity", "Embryonic cardiac activity"),
      f("free_fluid_pelvis", "Free fluid, pelvis"),
      f("free_fluid_ruq", "Free fluid, right upper quadrant"),
    ],
  },
  {
    code: "ocular",
    name: "Ocular",
    usualTransducers: ["linear"],
    presets: ["Ocular (low output)"],
    typicalDepthCm: [4, 5],
    orientation: "screen_left",
    cautions: ["Use a low-output ocular preset.", "Do not press on a possibly open globe: scan through plenty of gel over the closed lid."],
    views: [v("globe_trans", "Globe, transverse"), v("globe_sag", "Globe, sagittal"), opt("onsd", "Optic nerve sheath")],
    findings: [
      f("retinal_detachment", "Retinal detachment", "A bright membrane tethered at the optic disc."),
      f("posterior_vitreous_detachment", "Posterior vitreous detachment", "A thin membrane not tethered at the disc, moving freely with eye movement."),
      f("vitreous_hemorrhage", "Vitreous hemorrhage"),
      f("lens_dislocation", "Lens dislocation"),
      f("onsd_enlarged", "Enlarged optic nerve sheath", "Over about 5 mm in adults, measured 3 mm behind the globe."),
    ],
  },
  {
    code: "soft_tissue",
    name: "Soft tissue / MSK",
    usualTransducers: ["linear"],
    presets: ["MSK", "Superficial"],
    typicalDepthCm: [2, 6],
    orientation: "screen_left",
    cautions: ["Subcutaneous gas suggests necrotizing infection and calls for urgent surgical review; its absence does not exclude one."],
    views: [v("plane_1", "Area of interest, first plane"), v("plane_2", "Area of interest, second plane")],
    findings: [
      f("abscess", "Abscess"),
      f("cobblestoning", "Cobblestoning (subcutaneous edema)"),
      f("foreign_body", "Foreign body"),
      f("subcutaneous_gas", "Subcutaneous gas", "Bright foci with dirty shadowing."),
      f("joint_effusion", "Joint effusion"),
      f("fracture", "Cortical break (fracture)"),
    ],
  },
  {
    code: "vascular_access",
    name: "Procedure: vascular access",
    usualTransducers: ["linear"],
    presets: ["Vascular"],
    typicalDepthCm: [1, 5],
    orientation: "screen_left",
    cautions: [PROCEDURE_CAUTION],
    views: [
      v("target_short", "Target vessel, short axis", "Out-of-plane: the needle tip followed down to the vessel."),
      opt("target_long", "Target vessel, long axis", "In-plane: the whole needle shaft and tip."),
      opt("wire", "Wire in the vessel"),
    ],
    findings: [f("vessel_thrombosed", "Target vein thrombosed (non-compressible)")],
  },
  {
    code: "paracentesis_thoracentesis",
    name: "Procedure: paracentesis / thoracentesis",
    usualTransducers: ["curvilinear", "phased"],
    presets: ["Abdomen", "Lung"],
    typicalDepthCm: [6, 16],
    orientation: "screen_left",
    cautions: [PROCEDURE_CAUTION],
    views: [v("pocket", "Fluid pocket at the chosen site", "With bowel, lung or diaphragm away from the path."), opt("needle", "Needle in the pocket")],
    findings: [],
  },
  {
    code: "nerve_block",
    name: "Procedure: nerve block",
    usualTransducers: ["linear", "curvilinear"],
    presets: ["Nerve", "MSK"],
    typicalDepthCm: [1, 8],
    orientation: "screen_left",
    cautions: [PROCEDURE_CAUTION],
    views: [v("target", "Target nerve or fascial plane"), v("spread", "Spread of the injection around the target")],
    findings: [],
  },
  {
    code: "arthrocentesis",
    name: "Procedure: arthrocentesis",
    usualTransducers: ["linear", "curvilinear"],
    presets: ["MSK"],
    typicalDepthCm: [2, 8],
    orientation: "screen_left",
    cautions: [PROCEDURE_CAUTION],
    views: [v("recess", "Joint recess with the effusion"), opt("needle", "Needle in the recess")],
    findings: [f("joint_effusion", "Joint effusion")],
  },
  {
    code: "pericardiocentesis",
    name: "Procedure: pericardiocentesis",
    usualTransducers: ["phased", "curvilinear"],
    presets: ["Cardiac"],
    typicalDepthCm: [10, 20],
    orientation: "cardiology",
    cautions: [PROCEDURE_CAUTION],
    views: [v("approach", "Effusion at the chosen approach (subxiphoid, apical or parasternal)"), opt("needle", "Needle in the pericardial space")],
    findings: [f("pericardial_effusion", "Pericardial effusion")],
  },
];
