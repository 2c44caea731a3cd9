import { z } from "zod";

export const SEARCH_QUERY_MAX_LENGTH = 200;

/** The search query string, shared by the page and GET /api/v1/search. Junk values fall back rather than fail. */
export const searchQuery = z.object({
  q: z.string().trim().max(SEARCH_QUERY_MAX_LENGTH, `Keep the search to ${SEARCH_QUERY_MAX_LENGTH} characters or fewer.`).default(""),
  verified: z.enum(["1", "on", "true"]).optional().catch(undefined),
  project: z.string().max(64).optional().catch(undefined),
  calculator: z.string().max(40).optional().catch(undefined),
  author: z.string().max(64).optional().catch(undefined),
  from: z.string().regex(/^\d{4}-\d{2}-\d{2}$/).optional().catch(undefined),
  page: z.coerce.number().int().min(1).max(100).catch(1),
});

/** Parameter search: a calculator and numeric ranges on its inputs or results. */
export const blockQuery = z.object({
  calculator: z.string().trim().min(1, "Choose a calculator.").max(40, "No calculator has a name that long."),
  field: z.string().trim().min(1, "Choose an input or result, e.g. f0.").max(40, "No input or result has a name that long."),
  of: z.enum(["inputs", "results"]).catch("results"),
  min: z.string().trim().max(60, "Write the lower bound in at most 60 characters, e.g. 1 kHz.").default(""),
  max: z.string().trim().max(60, "Write the upper bound in at most 60 characters, e.g. 3 kHz.").default(""),
  verified: z.enum(["1", "on", "true"]).optional().catch(undefined),
});
