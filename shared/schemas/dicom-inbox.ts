// The DICOM inbox as the client reads it: received studies not yet made into exams, each with
// its objects' acquisition facts (never a patient's name or identifier), who the operator name
// matched, and who claimed it.
import { z } from "zod";
import { dicomFactsSchema } from "./exams";

export const inboxPersonSchema = z.object({ id: z.uuid(), name: z.string() });

export const inboxStudySchema = z.object({
  id: z.uuid(),
  receivedAt: z.string(),
  lastReceivedAt: z.string(),
  callingAe: z.string(),
  objects: z.array(z.object({ id: z.uuid(), facts: dicomFactsSchema, sizeBytes: z.number(), hasPreview: z.boolean() })),
  matchedTo: inboxPersonSchema.nullable(),
  claimedBy: inboxPersonSchema.nullable(),
});
export type InboxStudy = z.infer<typeof inboxStudySchema>;
export const inboxListSchema = z.object({ items: z.array(inboxStudySchema) });
export const inboxStudyResponseSchema = z.object({ study: inboxStudySchema });
export const inboxPreviewParamsSchema = z.object({ id: z.uuid(), objectId: z.uuid() });
