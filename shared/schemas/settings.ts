// Answers of Program settings and of the feedback snippets, as the client reads them.
import { z } from "zod";
import { programSettingsSchema } from "./reviews";

export const settingsAnswerSchema = z.object({ settings: programSettingsSchema });
export type SettingsAnswer = z.infer<typeof settingsAnswerSchema>;

export const snippetSchema = z.object({
  id: z.uuid(),
  /** The rubric criterion the snippet belongs to; null = any criterion. */
  criterionKey: z.string().nullable(),
  text: z.string(),
});
export type Snippet = z.infer<typeof snippetSchema>;

export const snippetListSchema = z.object({ snippets: z.array(snippetSchema) });
export const snippetAnswerSchema = z.object({ snippet: snippetSchema });
