import fc from "fast-check";
import type { z } from "zod";

/** A zod schema seen through its wrappers (default, catch, optional…), to read the limits it checks. */
function core(schema: z.ZodType): z.ZodType & { maxLength?: number | null; maxValue?: number | null; minValue?: number | null; maxSize?: number } {
  let inner = schema as unknown as { _zod: { def: { innerType?: unknown } } };
  while (inner._zod.def.innerType) inner = inner._zod.def.innerType as typeof inner;
  return inner as never;
}

/**
 * For each field of an object schema that has a limit, values just past it and far past it,
 * as query-string text: read from the schema, so the fuzzing follows when a limit changes.
 */
export function valuesPastLimits(schema: z.ZodObject): Record<string, fc.Arbitrary<string>> {
  const out: Record<string, fc.Arbitrary<string>> = {};
  for (const [key, field] of Object.entries(schema.shape)) {
    const inner = core(field as z.ZodType);
    const options: fc.Arbitrary<string>[] = [];
    if (typeof inner.maxLength === "number") {
      const max = inner.maxLength;
      options.push(
        fc.string({ minLength: max + 1, maxLength: max + 5 }).filter((value) => value.trim().length > max),
        fc.constantFrom("x".repeat(max + 1), "é".repeat(max + 1), "1 kHz ".repeat(Math.ceil((max + 1) / 6) + 1), "a".repeat(max * 10)),
      );
    }
    if (typeof inner.maxValue === "number" && Number.isFinite(inner.maxValue)) options.push(fc.constantFrom(String(inner.maxValue + 1), "1e400", String(Number.MAX_SAFE_INTEGER * 4)));
    if (typeof inner.minValue === "number" && Number.isFinite(inner.minValue)) options.push(fc.constantFrom(String(inner.minValue - 1), "-1e400"));
    if (options.length > 0) out[key] = fc.oneof(...options);
  }
  return out;
}

/** A JSON body whose array fields hold one item more than the schema allows (and far more). */
export function arraysPastLimits(schema: z.ZodObject): Record<string, fc.Arbitrary<unknown[]>> {
  const out: Record<string, fc.Arbitrary<unknown[]>> = {};
  for (const [key, field] of Object.entries(schema.shape)) {
    const inner = core(field as z.ZodType) as unknown as { _zod: { def: { type: string; checks?: { _zod: { def: { check: string; maximum?: number } } }[] } } };
    if (inner._zod.def.type !== "array") continue;
    const max = inner._zod.def.checks?.find((check) => check._zod.def.check === "max_length")?._zod.def.maximum;
    if (typeof max === "number") out[key] = fc.constantFrom(max + 1, max * 5).map((length) => Array.from({ length }, (_, i) => ({ id: `b${i}`, calculator: "quasi-square", inputs: {} })));
  }
  return out;
}
