// Exams and clips: the submission form and the exam routes validate with these.
import { z } from "zod";
import { FINDING_READS, SETTINGS, TRANSDUCERS } from "../catalogue";
import { isoDateSchema, isoDateTimeSchema } from "./common";
import { applicationGuideSchema } from "./applications";

/** draft → submitted → in_review (→ adjudication) → reviewed. */
export const EXAM_STATUSES = ["draft", "submitted", "in_review", "adjudication", "reviewed"] as const;
/** What the sonographer filters by: drafts, sent and waiting (any stage of review), reviewed. */
export const EXAM_STATUS_FILTERS = ["draft", "submitted", "reviewed"] as const;
export const CLIP_STATES = ["queued", "processing", "ready", "failed"] as const;

/** Accepts an ISO date-time; refuses the future (with a minute's grace for clock skew). */
export const performedAtSchema = isoDateTimeSchema("Enter the date and time the scan was performed")
  .refine((s) => new Date(s).getTime() <= Date.now() + 60_000, "The scan cannot be in the future")
  .refine((s) => new Date(s).getFullYear() >= 2000, "Enter a date from 2000 on");

export const findingReadSchema = z.object({
  key: z.string().min(1).max(60),
  read: z.enum(FINDING_READS, { message: "Choose positive, negative or indeterminate" }),
});

export const examFieldsSchema = z.object({
  applicationCode: z.string().min(1, "Choose an application").max(40),
  performedAt: performedAtSchema,
  setting: z.enum(SETTINGS, { message: "Choose clinical, educational or simulated" }),
  transducer: z.enum(TRANSDUCERS, { message: "Choose the transducer used" }),
  preset: z.string().trim().max(80).default(""),
  indication: z.string().trim().max(1000).default(""),
  findings: z
    .array(findingReadSchema)
    .max(50)
    .default([])
    .refine((f) => new Set(f.map((x) => x.key)).size === f.length, "Each finding may be read once"),
  /**
   * An encounter or accession reference for a callback (optional): sealed at rest, shown only
   * to a QA lead on a follow-up, never returned here. "" removes it; absent leaves it as it is.
   */
  encounterRef: z
    .string()
    .trim()
    .max(64, "An encounter reference has at most 64 characters")
    .regex(/^[A-Za-z0-9 ._:/#-]*$/, "Use letters, digits and . _ : / # - only")
    .optional(),
});
export type ExamFieldsInput = z.input<typeof examFieldsSchema>;

export const examCreateSchema = examFieldsSchema;
export const examUpdateSchema = examFieldsSchema.partial();

export const submitExamSchema = z.object({
  attestNoIdentifiers: z.literal(true, { message: "Confirm that no patient identifiers are visible in any clip" }),
});

export const redactionBoxSchema = z
  .object({ x: z.number().min(0).max(1), y: z.number().min(0).max(1), w: z.number().gt(0).max(1), h: z.number().gt(0).max(1) })
  .refine((b) => b.x + b.w <= 1.0001 && b.y + b.h <= 1.0001, "A box must stay inside the image");
export type RedactionBox = z.infer<typeof redactionBoxSchema>;

export const clipUpdateSchema = z.object({
  view: z.string().max(60).nullable().optional(),
  redactions: z.array(redactionBoxSchema).max(20).optional(),
});

/** What a clip's DICOM object said about its acquisition: depth from the region calibration, transducer, timing. */
export const dicomFactsSchema = z.object({
  sopClass: z.string(),
  transferSyntax: z.string(),
  frames: z.number(),
  frameRate: z.number().nullable(),
  depthCm: z.number().nullable(),
  frequencyMHz: z.number().nullable(),
  transducerType: z.string().nullable(),
  /** The object's Burned In Annotation: true when the machine says text is burned into the pixels. */
  burnedInAnnotation: z.boolean().nullable(),
});
export type DicomFactsView = z.infer<typeof dicomFactsSchema>;

export const clipSchema = z.object({
  id: z.uuid(),
  view: z.string().nullable(),
  kind: z.enum(["video", "still"]),
  state: z.enum(CLIP_STATES),
  error: z.string().nullable(),
  originalName: z.string(),
  sizeBytes: z.number(),
  width: z.number().nullable(),
  height: z.number().nullable(),
  seconds: z.number().nullable(),
  fps: z.number().nullable(),
  frames: z.number().nullable(),
  redactions: z.array(redactionBoxSchema),
  precheck: z.unknown().nullable(),
  /** Facts a DICOM clip carried before de-identification (null for video and image uploads). */
  dicom: dicomFactsSchema.nullable(),
  media: z.object({
    video: z.string().nullable(),
    image: z.string().nullable(),
    poster: z.string().nullable(),
    strip: z.string().nullable(),
    thumb: z.string().nullable(),
  }),
  createdAt: z.string(),
});
export type Clip = z.infer<typeof clipSchema>;

export const examSchema = z.object({
  id: z.uuid(),
  code: z.string(),
  status: z.enum(EXAM_STATUSES),
  application: z.object({ code: z.string(), name: z.string() }),
  guide: applicationGuideSchema,
  performedAt: z.string(),
  setting: z.enum(SETTINGS),
  transducer: z.enum(TRANSDUCERS),
  preset: z.string(),
  indication: z.string(),
  findings: z.array(findingReadSchema),
  sonographer: z.object({ id: z.uuid(), name: z.string() }).nullable(),
  clips: z.array(clipSchema),
  submittedAt: z.string().nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
  /** For the clinician who made the exam: whether an encounter reference is kept (never the reference); null for anyone else. */
  hasEncounterRef: z.boolean().nullable(),
});
export type Exam = z.infer<typeof examSchema>;

export const examListQuerySchema = z.object({
  status: z.enum(EXAM_STATUS_FILTERS).optional(),
  application: z.string().max(40).optional(),
  from: isoDateSchema.optional(),
  to: isoDateSchema.optional(),
  sort: z.enum(["performedAt", "-performedAt", "createdAt", "-createdAt", "application", "-application", "status", "-status"]).default("-performedAt"),
  limit: z.coerce.number().int().min(1).max(100).default(25),
  offset: z.coerce.number().int().min(0).default(0),
});
export type ExamListQuery = z.input<typeof examListQuerySchema>;

export const examListItemSchema = z.object({
  id: z.uuid(),
  code: z.string(),
  status: z.enum(EXAM_STATUSES),
  application: z.object({ code: z.string(), name: z.string() }),
  performedAt: z.string(),
  setting: z.enum(SETTINGS),
  clipCount: z.number(),
  readyClipCount: z.number(),
  failedClipCount: z.number(),
  posterUrl: z.string().nullable(),
  updatedAt: z.string(),
});
export type ExamListItem = z.infer<typeof examListItemSchema>;

// Answers of the exam and clip routes.
export const examResponseSchema = z.object({ exam: examSchema });
export const examListResponseSchema = z.object({ items: z.array(examListItemSchema), total: z.number() });
export const clipResponseSchema = z.object({ clip: clipSchema });
/** An accepted upload: the new clip, queued for processing. */
export const clipUploadResponseSchema = z.object({ id: z.uuid(), state: z.enum(CLIP_STATES), clip: clipSchema });
