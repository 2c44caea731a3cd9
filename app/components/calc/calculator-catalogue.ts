/**
 * The calculators as plain data — title, inputs, outputs, cautions; no compute code — for
 * components that show blocks without running them (a sheet being read, a preview's
 * results). Generated from the registry when the app is built (`calculatorCatalogue` in
 * scripts/vite-plugins.ts), so it cannot drift from the engine and needs no registration
 * of its own; importing the registry instead would put the engine on every reading page.
 */
import entries from "virtual:calculator-catalogue";
import type { Calculator } from "~/lib/calc/types";

/** What a block shows of its calculator. */
export type CalculatorDescription = Pick<Calculator, "id" | "title" | "inputs" | "outputs" | "cautions">;

export const describedCalculators: readonly CalculatorDescription[] = entries;

const byId = new Map(entries.map((entry) => [entry.id, entry]));

export function describeCalculator(id: string): CalculatorDescription | undefined {
  return byId.get(id);
}
