/** Small helpers for calculator tests: run through the public API and read scalars. */
import { expect } from "vitest";
import { evaluateCalculator, type CalculatorEvaluation } from "~/lib/calc/evaluate-sheet";
import type { FieldError, ResultValue, Results, ScalarResult } from "~/lib/calc/types";

export function run(id: string, inputs: Record<string, unknown>): { results: Results; warnings: string[] } {
  const outcome: CalculatorEvaluation = evaluateCalculator(id, inputs);
  if (!outcome.ok) throw new Error(`${id} refused ${JSON.stringify(inputs)}: ${JSON.stringify(outcome.errors)}`);
  return outcome;
}

export function refuse(id: string, inputs: Record<string, unknown>): FieldError[] {
  const outcome = evaluateCalculator(id, inputs);
  if (outcome.ok) throw new Error(`${id} accepted ${JSON.stringify(inputs)}`);
  return outcome.errors;
}

export function scalarOf(results: Results, key: string): ScalarResult {
  const value: ResultValue | undefined = results[key];
  expect(value, `output ${key}`).toBeDefined();
  expect(typeof value === "object" && value !== null && !Array.isArray(value) && "value" in value, `${key} is a scalar`).toBe(true);
  return value as ScalarResult;
}

export function valueOf(results: Results, key: string): number {
  return scalarOf(results, key).value;
}
