import { z } from "zod";

/** Request bodies of the JSON API, beside the query schemas in `search.ts`, so the fuzzing reads their limits. */
export const MAX_EVALUATE_BLOCKS = 200;

export const evaluateBody = z.object({
  blocks: z
    .array(z.unknown(), { message: "`blocks` must be a list of {id, calculator, inputs}." })
    .max(MAX_EVALUATE_BLOCKS, `A sheet holds at most ${MAX_EVALUATE_BLOCKS} blocks.`),
});

export const calculatorInputsBody = z.object({
  inputs: z.record(z.string(), z.unknown(), { message: "`inputs` must be an object of input key → value, e.g. {\"vdc\": \"48 V\"}." }).default({}),
});
