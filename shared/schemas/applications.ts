// The program's application catalogue (exam types) with views and findings.
import { z } from "zod";
import { TRANSDUCERS } from "../catalogue";

export const transducerSchema = z.enum(TRANSDUCERS);

export const applicationSchema = z.object({
  id: z.uuid(),
  code: z.string(),
  name: z.string(),
  active: z.boolean(),
  usualTransducers: z.array(transducerSchema),
  typicalDepthCm: z.tuple([z.number(), z.number()]),
  views: z.array(z.object({ key: z.string(), label: z.string() })),
  findings: z.array(z.object({ key: z.string(), label: z.string() })),
});
export type Application = z.infer<typeof applicationSchema>;
export const applicationListSchema = z.object({ applications: z.array(applicationSchema) });
export type ApplicationList = z.infer<typeof applicationListSchema>;
