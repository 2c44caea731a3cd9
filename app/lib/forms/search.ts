import { z } from "zod";

/** The search query string, shared by the page and GET /api/v1/search. Junk values fall back rather than fail. */
export const searchQuery = z.object({
  q: z.string().trim().max(200, "Keep the search under 200 characters.").default(""),
  verified: z.enum(["1", "on", "true"]).optional().catch(undefined),
  project: z.string().max(64).optional().catch(undefined),
  calculator: z.string().max(40).optional().catch(undefined),
  author: z.string().max(64).optional().catch(undefined),
  from: z.string().regex(/^\d{4}-\d{2}-\d{2}$/).optional().catch(undefined),
  page: z.coerce.number().int().min(1).max(100).catch(1),
});

/** Parameter search: a calculator and numeric ranges on its inputs or results. */
export const blockQuery = z.object({
  calculator: z.string().trim().min(1, "Choose a calculator."),
  field: z.string().trim().min(1, "Choose an input or result, e.g. f0."),
  of: z.enum(["inputs", "results"]).catch("results"),
  min: z.string().trim().default(""),
  max: z.string().trim().default(""),
  verified: z.enum(["1", "on", "true"]).optional().catch(undefined),
});
