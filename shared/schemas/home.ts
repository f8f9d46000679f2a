// "What needs me now": per-role counts for the home page. Only counts the server can
// really compute are sent; an area with nothing behind it yet is simply absent.
import { z } from "zod";
import { roleSchema } from "./auth";

export const homeCardSchema = z.object({
  key: z.string(),
  label: z.string(),
  count: z.number().int().nonnegative(),
  href: z.string().nullable(),
  hint: z.string().nullable(),
});

export const homeSchema = z.object({
  programName: z.string(),
  sections: z.array(
    z.object({
      role: roleSchema,
      title: z.string(),
      cards: z.array(homeCardSchema),
    }),
  ),
});
export type Home = z.infer<typeof homeSchema>;
