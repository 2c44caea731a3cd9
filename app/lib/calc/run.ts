/**
 * Runs one calculator's `compute` on parsed inputs and enforces, in one place,
 * what every result must be: never NaN or ±Infinity. An output that is not
 * finite is omitted with a warning naming it; a CalculationError becomes field
 * errors; any other throw becomes a field error too, so a sheet never breaks.
 */
import { CalculationError } from "./errors";
import type { Calculator, ComputeContext, FieldError, ParsedInputs, ResultValue, Results } from "./types";

export type RunOutcome = { ok: true; results: Results; warnings: string[] } | { ok: false; errors: FieldError[] };

const finite = (value: unknown) => typeof value === "number" && Number.isFinite(value);

/** True when every number in a result is finite (nested one level, as the result types are). */
export function isFiniteResult(value: ResultValue): boolean {
  if (typeof value === "boolean") return true;
  if (Array.isArray(value)) {
    return value.every((item: object) => Object.values(item).every((field) => typeof field !== "number" || finite(field)));
  }
  if (typeof value === "object" && value !== null) {
    return Object.values(value).every((field) => typeof field !== "number" || finite(field));
  }
  return false;
}

export function runCalculator(calculator: Calculator, values: ParsedInputs, context: ComputeContext = { blockResults: {} }): RunOutcome {
  let outcome: ReturnType<Calculator["compute"]>;
  try {
    outcome = calculator.compute(values, context);
  } catch (error) {
    if (error instanceof CalculationError) return { ok: false, errors: error.fieldErrors };
    const detail = error instanceof Error ? error.message : String(error);
    return { ok: false, errors: [{ field: "calculation", message: `${calculator.title} could not compute these inputs: ${detail}` }] };
  }

  const results: Results = {};
  const warnings = Array.isArray(outcome?.warnings) ? outcome.warnings.filter((w) => typeof w === "string") : [];
  for (const [key, value] of Object.entries(outcome?.results ?? {})) {
    if (value === undefined) continue;
    if (isFiniteResult(value)) {
      results[key] = value;
    } else {
      const label = calculator.outputs.find((o) => o.key === key)?.label ?? key;
      warnings.push(`${label} is not shown: it is not a finite number for these inputs.`);
    }
  }
  return { ok: true, results, warnings };
}
