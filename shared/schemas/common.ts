// Shapes every route shares: the error body, ids, dates.
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

/** The years a date the API takes may fall in; PostgreSQL refuses year 0 and the client shows four digits. */
export const MIN_YEAR = 1900;
export const MAX_YEAR = 2100;
const yearOf = (s: string) => Number(/^[+-]?\d+/.exec(s)?.[0] ?? NaN);
const inYears = (s: string) => yearOf(s) >= MIN_YEAR && yearOf(s) <= MAX_YEAR;

/** A calendar date (YYYY-MM-DD, ISO 8601) between 1900 and 2100: report and list ranges. */
export const isoDateSchema = z.iso.date().refine(inYears, `Enter a date between ${MIN_YEAR} and ${MAX_YEAR}`);

/** An ISO 8601 date-time with an offset, between 1900 and 2100. */
export const isoDateTimeSchema = (message?: string) =>
  z.iso.datetime({ offset: true, message }).refine((s) => inYears(s) && Number.isFinite(Date.parse(s)), `Enter a date between ${MIN_YEAR} and ${MAX_YEAR}`);
