// Shapes every route shares: the error body, ids, pagination.
import { z } from "zod";

export const errorSchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    details: z.unknown().optional(),
  }),
});
export type ApiError = z.infer<typeof errorSchema>;

export const uuidSchema = z.uuid();
export const idParamsSchema = z.object({ id: uuidSchema });

export const pageQuerySchema = z.object({
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});
