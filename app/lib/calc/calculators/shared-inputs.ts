/**
 * Inputs and cautions shared by the calculators (DC-link voltage, output
 * frequency, harmonic order, the lethal-voltage caution), and the defensive
 * read of parsed inputs.
 *
 * `inputs.ts` validates typed text against each InputSpec before `compute`
 * runs; these readers check the same spec again so a direct call with a bad
 * number fails with a field error instead of returning NaN.
 */
import { fieldError } from "../errors";
import type { ChoiceInputSpec, ParsedInputs, QuantityInputSpec, QuantityListInputSpec } from "../types";

/** A quantity input written as one line: the spec without its `kind`. */
export const quantityInput = (spec: Omit<QuantityInputSpec, "kind">): QuantityInputSpec => ({ kind: "quantity", ...spec });

/** The DC-link voltage input `vdc` every inverter calculator takes; without a default text the engineer must type it. */
export const dcLinkVoltageInput = (defaultText: string | undefined, description: string): QuantityInputSpec => ({
  key: "vdc",
  label: "DC-link voltage",
  description,
  kind: "quantity",
  dimension: "voltage",
  displayUnit: "V",
  min: 0,
  minExclusive: true,
  max: 1e6,
  ...(defaultText === undefined ? {} : { default: defaultText }),
});

/** The output (fundamental) frequency input `f`, 50 Hz by default; label and description say what it sets. */
export const outputFrequencyInput = (label: string, description: string): QuantityInputSpec => ({
  key: "f",
  label,
  description,
  kind: "quantity",
  dimension: "frequency",
  displayUnit: "Hz",
  min: 0,
  minExclusive: true,
  max: 1e6,
  default: "50 Hz",
});

export const fundamentalFrequencyInput = outputFrequencyInput(
  "Fundamental frequency",
  "Output frequency; sets the frequency shown beside each harmonic order (n × f).",
);

export const highestOrderInput = (defaultText: string): QuantityInputSpec => ({
  key: "hmax",
  label: "Highest harmonic order listed",
  description: "The harmonics table stops at this order. thd, thd40 and thd50 do not depend on it.",
  kind: "quantity",
  dimension: "dimensionless",
  displayUnit: "",
  min: 1,
  max: 5000,
  integer: true,
  default: defaultText,
});

/** Shown beside every waveform result. */
export const LETHAL_VOLTAGE_CAUTION =
  "Inverter DC links and outputs carry voltages that can kill, and DC-link capacitors stay charged after shutdown. " +
  "These figures are ideal-switch estimates for design checks only: hardware work follows local electrical codes, " +
  "the applicable product and installation standards, and review by a licensed or otherwise qualified engineer.";

function inRange(value: number, spec: { min?: number; max?: number; minExclusive?: boolean; maxExclusive?: boolean }): boolean {
  if (spec.min !== undefined && (spec.minExclusive ? value <= spec.min : value < spec.min)) return false;
  if (spec.max !== undefined && (spec.maxExclusive ? value >= spec.max : value > spec.max)) return false;
  return true;
}

function rangeText(spec: { min?: number; max?: number; minExclusive?: boolean; maxExclusive?: boolean }, unit: string): string {
  const low = spec.min === undefined ? "" : `${spec.minExclusive ? ">" : "≥"} ${spec.min}${unit}`;
  const high = spec.max === undefined ? "" : `${spec.maxExclusive ? "<" : "≤"} ${spec.max}${unit}`;
  return [low, high].filter(Boolean).join(" and ");
}

/** The SI number for a quantity input, checked against its spec (range, integer). */
export function readQuantity(inputs: ParsedInputs, spec: QuantityInputSpec): number {
  const value = inputs[spec.key];
  if (typeof value !== "number" || !Number.isFinite(value)) {
    throw fieldError(spec.key, `${spec.label} must be a finite number.`);
  }
  const unit = spec.displayUnit === "deg" ? "°" : spec.displayUnit === "" ? "" : ` ${spec.displayUnit}`;
  if (!inRange(value, spec)) throw fieldError(spec.key, `${spec.label} must be ${rangeText(spec, unit)}.`);
  if (spec.integer && !Number.isInteger(value)) throw fieldError(spec.key, `${spec.label} must be a whole number.`);
  return value;
}

/** The chosen option of a choice input, checked against its options. */
export function readChoice(inputs: ParsedInputs, spec: ChoiceInputSpec): string {
  const value = inputs[spec.key];
  const allowed = spec.options.map((o) => o.value);
  if (typeof value !== "string" || !allowed.includes(value)) {
    throw fieldError(spec.key, `${spec.label} must be one of: ${allowed.join(", ")}.`);
  }
  return value;
}

/** The SI numbers of a quantity-list input, each checked against the spec's range. */
export function readQuantityList(inputs: ParsedInputs, spec: QuantityListInputSpec): number[] {
  const value = inputs[spec.key];
  if (!Array.isArray(value) || !value.every((v): v is number => typeof v === "number" && Number.isFinite(v))) {
    throw fieldError(spec.key, `${spec.label} must be a list of numbers.`);
  }
  if (spec.minItems !== undefined && value.length < spec.minItems) {
    throw fieldError(spec.key, `${spec.label} needs at least ${spec.minItems} value(s).`);
  }
  if (spec.maxItems !== undefined && value.length > spec.maxItems) {
    throw fieldError(spec.key, `${spec.label} takes at most ${spec.maxItems} values.`);
  }
  const unit = spec.displayUnit === "deg" ? "°" : ` ${spec.displayUnit}`;
  for (const item of value) {
    if (!inRange(item, spec)) throw fieldError(spec.key, `Each of ${spec.label.toLowerCase()} must be ${rangeText(spec, unit)}.`);
  }
  return value;
}
