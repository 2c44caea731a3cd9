/** Calls a calculator the way the sheet does, and reads its typed results. */
import { expect } from "vitest";
import type { Calculator, ComputeOutcome, Harmonic, ParsedInputs, Results, ScalarResult, WaveformPoint } from "~/lib/calc/types";

export function run(calculator: Calculator, inputs: ParsedInputs): ComputeOutcome {
  return calculator.compute(inputs, { blockResults: {} });
}

export function scalarOf(results: Results, key: string): number {
  const result = results[key] as ScalarResult | undefined;
  expect(result, `result ${key}`).toBeDefined();
  expect(typeof result!.display).toBe("string");
  return result!.value;
}

export function harmonicsOf(results: Results, key = "harmonics"): Harmonic[] {
  const table = results[key];
  expect(Array.isArray(table), `result ${key}`).toBe(true);
  return table as Harmonic[];
}

export function waveformOf(results: Results, key = "waveform"): WaveformPoint[] {
  const points = results[key];
  expect(Array.isArray(points), `result ${key}`).toBe(true);
  return points as WaveformPoint[];
}

/** Peak of order n in a harmonic table (0 when the order is not listed). */
export function peakAt(table: Harmonic[], n: number): number {
  return table.find((h) => h.n === n)?.peak ?? 0;
}

/** The level of a plotted stepped waveform just after angle θ (degrees). */
export function levelAfter(points: WaveformPoint[], thetaDegrees: number): number {
  let level = points[0]!.v;
  for (const p of points) if (p.theta <= thetaDegrees) level = p.v;
  return level;
}

/** Every scalar and table entry is a finite number. */
export function expectAllFinite(results: Results): void {
  for (const [key, value] of Object.entries(results)) {
    if (Array.isArray(value)) {
      for (const row of value) for (const [field, x] of Object.entries(row)) if (typeof x === "number") expect(Number.isFinite(x), `${key}.${field}`).toBe(true);
    } else if (typeof value === "object" && value !== null && "value" in value) {
      expect(Number.isFinite(value.value), key).toBe(true);
    }
  }
}
