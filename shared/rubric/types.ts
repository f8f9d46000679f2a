// Rubric shapes shared by the scoring screen and the server.
import { z } from "zod";

export const CRITERION_KINDS = ["ordinal", "choice", "yes_no", "number"] as const;
export type CriterionKind = (typeof CRITERION_KINDS)[number];

export const levelSchema = z.object({
  value: z.string().min(1).max(40),
  label: z.string().min(1).max(80),
  /** The anchor text a reviewer reads to pick this level. */
  anchor: z.string().max(400).default(""),
  /** A failing level of a critical criterion blocks credentialing credit. */
  fails: z.boolean().default(false),
  /** A level the program aims for; feedback suggests next steps for any other level. */
  ideal: z.boolean().default(false),
});
export type Level = z.infer<typeof levelSchema>;

export const criterionSchema = z
  .object({
    key: z
      .string()
      .regex(/^[a-z][a-z0-9_]*$/, "Use lower-case letters, digits and _")
      .max(40),
    label: z.string().trim().min(1).max(80),
    help: z.string().max(600).default(""),
    kind: z.enum(CRITERION_KINDS),
    levels: z.array(levelSchema).max(10).default([]),
    min: z.number().nullable().default(null),
    max: z.number().nullable().default(null),
    required: z.boolean().default(true),
    critical: z.boolean().default(false),
    /** How far two reads may differ and still agree: level steps (ordinal), units (number); 0 = must match. */
    tolerance: z.number().min(0).max(100).default(0),
    /** Application codes; empty = every application. */
    applications: z.array(z.string().max(40)).default([]),
  })
  .superRefine((c, ctx) => {
    if (c.kind !== "number" && c.levels.length < 2) ctx.addIssue({ code: "custom", path: ["levels"], message: "Give at least two levels" });
    if (c.kind === "yes_no" && c.levels.length !== 2) ctx.addIssue({ code: "custom", path: ["levels"], message: "A yes/no criterion has exactly two levels" });
    if (new Set(c.levels.map((l) => l.value)).size !== c.levels.length) ctx.addIssue({ code: "custom", path: ["levels"], message: "Level values must differ" });
    if (c.kind === "number" && c.min !== null && c.max !== null && c.min > c.max)
      ctx.addIssue({ code: "custom", path: ["max"], message: "max must be at least min" });
  });
export type Criterion = z.infer<typeof criterionSchema>;

export const rubricInputSchema = z.object({
  name: z.string().trim().min(1, "Name the rubric").max(120),
  criteria: z
    .array(criterionSchema)
    .min(1, "Add at least one criterion")
    .max(40)
    .refine((cs) => new Set(cs.map((c) => c.key)).size === cs.length, "Criterion keys must differ"),
});
export type RubricInput = z.input<typeof rubricInputSchema>;

export const rubricSchema = z.object({
  id: z.uuid(),
  familyId: z.uuid(),
  version: z.number().int(),
  name: z.string(),
  status: z.enum(["draft", "published", "archived"]),
  criteria: z.array(criterionSchema),
  createdAt: z.string(),
  publishedAt: z.string().nullable(),
});
export type Rubric = z.infer<typeof rubricSchema>;

/** A score value: a level value for level kinds, a number for number criteria. */
export type ScoreValue = string | number;
export type Scores = Record<string, ScoreValue>;
