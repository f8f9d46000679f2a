// The program's application catalogue (exam types): each application is one code across its
// versions, with its views, findings, transducers, presets, typical depth, orientation
// convention and cautions. The input schema is what Setup → Applications sends and the API
// checks: every error names its field (`views.2.key`, `typicalDepthCm`).
import { z } from "zod";
import { ORIENTATIONS, TRANSDUCERS } from "../catalogue";

export const transducerSchema = z.enum(TRANSDUCERS);
export const orientationSchema = z.enum(ORIENTATIONS);

/**
 * What the exam's application version tells whoever looks at the exam: the version (its id
 * reads its views' and findings' labels at GET /api/applications/:id), the orientation
 * convention the marker is judged by, and its cautions.
 */
export const applicationGuideSchema = z.object({
  applicationId: z.uuid(),
  version: z.number().int(),
  orientation: orientationSchema,
  cautions: z.array(z.string()),
});
export type ApplicationGuide = z.infer<typeof applicationGuideSchema>;

/**
 * How an application's credited exams reach its threshold: the threshold (null: the
 * program's), the most educational and simulated credited exams that count toward it (null:
 * no cap), the credited exams with a positive finding it needs, and whether credit needs
 * every required view.
 */
export const creditRuleSchema = z.object({
  threshold: z.number().int().nullable(),
  nonClinicalCap: z.number().int().nullable(),
  minPositive: z.number().int(),
  requireComplete: z.boolean(),
});
export type CreditRuleOfApplication = z.infer<typeof creditRuleSchema>;

export const applicationViewSchema = z.object({ key: z.string(), label: z.string(), required: z.boolean(), hint: z.string() });
export const applicationFindingSchema = z.object({ key: z.string(), label: z.string(), hint: z.string() });

export const applicationSchema = z.object({
  id: z.uuid(),
  code: z.string(),
  name: z.string(),
  version: z.number().int(),
  status: z.enum(["published", "archived"]),
  active: z.boolean(),
  usualTransducers: z.array(transducerSchema),
  presets: z.array(z.string()),
  typicalDepthCm: z.tuple([z.number(), z.number()]),
  orientation: orientationSchema,
  cautions: z.array(z.string()),
  views: z.array(applicationViewSchema),
  findings: z.array(applicationFindingSchema),
  creditRule: creditRuleSchema,
  publishedAt: z.string(),
});
export type Application = z.infer<typeof applicationSchema>;
export const applicationListSchema = z.object({ applications: z.array(applicationSchema) });
export type ApplicationList = z.infer<typeof applicationListSchema>;
export const applicationAnswerSchema = z.object({ application: applicationSchema });
export type ApplicationAnswer = z.infer<typeof applicationAnswerSchema>;

/** One version in an application's history: when, by whom, and how many exams were recorded under it. */
export const applicationVersionSchema = z.object({
  id: z.uuid(),
  version: z.number().int(),
  status: z.enum(["published", "archived"]),
  name: z.string(),
  publishedAt: z.string(),
  archivedAt: z.string().nullable(),
  createdBy: z.string().nullable(),
  examCount: z.number().int(),
});
export const applicationVersionListSchema = z.object({ versions: z.array(applicationVersionSchema) });
export type ApplicationVersion = z.infer<typeof applicationVersionSchema>;

const KEY = /^[a-z0-9][a-z0-9_]*$/;
const keySchema = (what: string) =>
  z
    .string()
    .trim()
    .min(1, `Give the ${what} a key`)
    .max(60, "Keep keys to 60 characters")
    .regex(KEY, "Use lower-case letters, digits and underscores, starting with a letter or digit");
const labelSchema = (what: string) => z.string().trim().min(1, `Give the ${what} a label`).max(160, "Keep labels to 160 characters");
const hintSchema = z.string().trim().max(400, "Keep hints to 400 characters").default("");

/** Flags the second and later items whose key repeats an earlier one, at `<list>.<i>.key`. */
function uniqueKeys(what: string) {
  return (items: { key: string }[], ctx: z.RefinementCtx) => {
    const seen = new Set<string>();
    items.forEach((item, i) => {
      if (seen.has(item.key)) ctx.addIssue({ code: "custom", path: [i, "key"], message: `Another ${what} already has the key "${item.key}"` });
      seen.add(item.key);
    });
  };
}

function uniqueTexts(what: string) {
  return (items: string[], ctx: z.RefinementCtx) => {
    const seen = new Set<string>();
    items.forEach((item, i) => {
      if (seen.has(item.toLowerCase())) ctx.addIssue({ code: "custom", path: [i], message: `This ${what} is listed twice` });
      seen.add(item.toLowerCase());
    });
  };
}

const applicationFields = z.object({
  name: z.string().trim().min(1, "Name the application").max(120, "Keep the name to 120 characters"),
  active: z.boolean().default(true),
  usualTransducers: z
    .array(transducerSchema)
    .min(1, "Choose at least one usual transducer")
    .refine((ts) => new Set(ts).size === ts.length, "A transducer is listed twice"),
  presets: z
    .array(z.string().trim().min(1, "Name the preset").max(60, "Keep preset names to 60 characters"))
    .max(12)
    .superRefine(uniqueTexts("preset"))
    .default([]),
  typicalDepthCm: z.tuple([
    z.number({ error: "Enter the shallowest typical depth in cm" }).gt(0, "Depth must be more than 0 cm").max(40, "Depth must be at most 40 cm"),
    z.number({ error: "Enter the deepest typical depth in cm" }).gt(0, "Depth must be more than 0 cm").max(40, "Depth must be at most 40 cm"),
  ]),
  orientation: orientationSchema.default("screen_left"),
  cautions: z.array(z.string().trim().min(1, "Write the caution or remove it").max(500, "Keep a caution to 500 characters")).max(10).default([]),
  views: z
    .array(z.object({ key: keySchema("view"), label: labelSchema("view"), required: z.boolean().default(true), hint: hintSchema }))
    .min(1, "Add at least one view")
    .max(30, "At most 30 views")
    .superRefine(uniqueKeys("view")),
  findings: z
    .array(z.object({ key: keySchema("finding"), label: labelSchema("finding"), hint: hintSchema }))
    .max(40, "At most 40 findings")
    .superRefine(uniqueKeys("finding")),
  creditRule: z
    .object({
      threshold: z
        .number({ error: "Enter the number of credited exams, or leave it empty for the program's" })
        .int("Enter a whole number")
        .min(1, "At least 1")
        .max(1000, "At most 1000")
        .nullable()
        .default(null),
      nonClinicalCap: z
        .number({ error: "Enter a whole number, or leave it empty for no cap" })
        .int("Enter a whole number")
        .min(0, "0 or more")
        .max(1000, "At most 1000")
        .nullable()
        .default(null),
      minPositive: z.number({ error: "Enter a whole number" }).int("Enter a whole number").min(0, "0 or more").max(1000, "At most 1000").default(0),
      requireComplete: z.boolean().default(false),
    })
    .default({ threshold: null, nonClinicalCap: null, minPositive: 0, requireComplete: false }),
});

function depthInOrder(a: { typicalDepthCm: [number, number] }, ctx: z.RefinementCtx) {
  const [min, max] = a.typicalDepthCm;
  if (min > max) ctx.addIssue({ code: "custom", path: ["typicalDepthCm"], message: "The shallowest typical depth is deeper than the deepest: swap them" });
}

/** A saved application (its next version). */
export const applicationInputSchema = applicationFields.superRefine(depthInOrder);
export type ApplicationInput = z.input<typeof applicationInputSchema>;

/** A new application: the same fields and its code, which never changes afterwards. */
export const newApplicationSchema = applicationFields
  .extend({
    code: z
      .string()
      .trim()
      .min(1, "Give the application a code")
      .max(40, "Keep the code to 40 characters")
      .regex(/^[a-z][a-z0-9_]*$/, "Use lower-case letters, digits and underscores, starting with a letter"),
  })
  .superRefine(depthInOrder);
export type NewApplicationInput = z.input<typeof newApplicationSchema>;
