/**
 * The catalogue of calculators. Ids are public API: stored in revisions and used
 * by the JSON API, so they are never renamed. Adding a calculator means adding
 * its module here (and bumping ENGINE_VERSION's minor number).
 */
import { calculator as dcLink } from "./calculators/dc-link";
import { calculator as deadTime } from "./calculators/dead-time";
import { calculator as formula } from "./calculators/formula";
import { calculator as halfBridge } from "./calculators/half-bridge";
import { calculator as harmonicElimination } from "./calculators/harmonic-elimination";
import { calculator as harmonicLimits } from "./calculators/harmonic-limits";
import { calculator as inductorRipple } from "./calculators/inductor-ripple";
import { calculator as lcFilter } from "./calculators/lc-filter";
import { calculator as lclFilter } from "./calculators/lcl-filter";
import { calculator as lossesThermal } from "./calculators/losses-thermal";
import { calculator as quasiSquare } from "./calculators/quasi-square";
import { calculator as sixStep } from "./calculators/six-step";
import { calculator as spwm } from "./calculators/spwm";
import { calculator as steppedWave } from "./calculators/stepped-wave";
import { calculator as switchStress } from "./calculators/switch-stress";
import { calculator as threePhasePwm } from "./calculators/three-phase-pwm";
import type { Calculator } from "./types";
import { ENGINE_VERSION } from "./version";

/** Every calculator, in catalogue order: waveforms, then the stages they feed, then checks. */
export const calculators: readonly Calculator[] = [
  quasiSquare,
  steppedWave,
  harmonicElimination,
  sixStep,
  spwm,
  threePhasePwm,
  deadTime,
  halfBridge,
  inductorRipple,
  lcFilter,
  lclFilter,
  dcLink,
  switchStress,
  lossesThermal,
  harmonicLimits,
  formula,
];

const byId = new Map(calculators.map((c) => [c.id, c]));

export function getCalculator(id: string): Calculator | undefined {
  return typeof id === "string" ? byId.get(id) : undefined;
}

export function calculatorIds(): string[] {
  return calculators.map((c) => c.id);
}

/** A calculator as plain data, for the catalogue page and the API. */
export type CatalogueEntry = Omit<Calculator, "compute">;

/** The whole catalogue as JSON-serialisable data (no functions). */
export function catalogue(): { engineVersion: string; calculators: CatalogueEntry[] } {
  return {
    engineVersion: ENGINE_VERSION,
    calculators: calculators.map((c) =>
      structuredClone({
        id: c.id,
        title: c.title,
        summary: c.summary,
        description: c.description,
        inputs: c.inputs,
        outputs: c.outputs,
        formulas: c.formulas,
        conventions: c.conventions,
        sources: c.sources,
        cautions: c.cautions,
      }),
    ),
  };
}
