/**
 * The one way Sinewright reads a quantity an engineer typed ("48 V", "4.7 µF",
 * "20kHz", "30°", "1.5 K/W") and turns it into a plain SI number.
 *
 * Units are read by a lean mathjs instance holding only the factories the engine
 * uses (units, arithmetic, a handful of functions and the expression parser for
 * `safe-expression.ts`). Functions that could change the instance or evaluate
 * arbitrary text are replaced by stubs that refuse, before anything else sees it.
 *
 * Conventions (the Calculators page states them for users):
 * - A dimensioned input needs its unit. A bare number ("4.7e-6", or a JSON
 *   number) is refused with the readings spelled out ("4.7e-6 has no unit: did
 *   you mean 4.7 µF?"), because guessing the unit silently changes magnitudes.
 *   Only inputs documented as dimensionless (ma, mf, pf, hmax …) take bare numbers.
 * - A unit typed in another case or with a habit of the trade ("20 KHz", "48 v",
 *   "10 Ohm", "4.7 uf", "48 VDC", "30º", "60hz") is accepted when exactly one
 *   unit of the input's dimension matches it ignoring case, and echoed as
 *   understood; where two match (mV/MV, mHz/MHz) it is refused with both.
 * - Apparent power (VA) is not real power: a power input refuses "1.5 kVA".
 * - Angles come out in degrees (radians are converted); temperatures in °C.
 * - Dimensionless inputs accept "80 %" as 0.8.
 */
import {
  absDependencies,
  acosDependencies,
  addDependencies,
  asinDependencies,
  atanDependencies,
  ceilDependencies,
  cosDependencies,
  create,
  divideDependencies,
  eDependencies,
  expDependencies,
  floorDependencies,
  log10Dependencies,
  logDependencies,
  maxDependencies,
  minDependencies,
  multiplyDependencies,
  parseDependencies,
  piDependencies,
  powDependencies,
  roundDependencies,
  sinDependencies,
  sqrtDependencies,
  subtractDependencies,
  tanDependencies,
  toDependencies,
  unaryMinusDependencies,
  unaryPlusDependencies,
  unitDependencies,
  type FactoryFunctionMap,
  type MathNode,
  type Unit,
} from "mathjs";
import { formatQuantity, SI_UNIT } from "./format";
import type { Dimension } from "./types";

const instance = create(
  {
    unitDependencies,
    parseDependencies,
    addDependencies,
    subtractDependencies,
    multiplyDependencies,
    divideDependencies,
    powDependencies,
    unaryMinusDependencies,
    unaryPlusDependencies,
    toDependencies,
    sqrtDependencies,
    absDependencies,
    sinDependencies,
    cosDependencies,
    tanDependencies,
    asinDependencies,
    acosDependencies,
    atanDependencies,
    expDependencies,
    logDependencies,
    log10Dependencies,
    minDependencies,
    maxDependencies,
    roundDependencies,
    floorDependencies,
    ceilDependencies,
    piDependencies,
    eDependencies,
  } as FactoryFunctionMap,
  {},
);

/** The parser, kept before the namespace entry is disabled; only safe-expression.ts uses it. */
const parseExpressionTree: (text: string) => MathNode = instance.parse.bind(instance) as (text: string) => MathNode;

// Nothing may extend or re-enter the instance once it exists (defence in depth:
// safe-expression.ts also refuses these names before evaluating anything).
const refuse = (name: string) => () => {
  throw new Error(`${name} is not available in Sinewright expressions`);
};
instance.import(
  Object.fromEntries(
    ["import", "createUnit", "evaluate", "parse", "compile", "simplify", "derivative", "resolve", "config", "reviver", "replacer"].map(
      (name) => [name, refuse(name)],
    ),
  ),
  { override: true },
);

/** The restricted mathjs instance and its parser, for the engine's own modules. */
export const math = instance;
export { parseExpressionTree };
export type { Unit as MathUnit };

/** How messages name a dimension, and an example of typing it. */
const DIMENSION_WORDS: Record<Dimension, { noun: string; example: string }> = {
  voltage: { noun: "a voltage", example: "48 V" },
  current: { noun: "a current", example: "2.3 A" },
  frequency: { noun: "a frequency", example: "20 kHz" },
  capacitance: { noun: "a capacitance", example: "4.7 uF" },
  inductance: { noun: "an inductance", example: "2.2 mH" },
  resistance: { noun: "a resistance", example: "10 ohm" },
  power: { noun: "a power", example: "1.5 kW" },
  energy: { noun: "an energy", example: "120 uJ" },
  time: { noun: "a time", example: "50 ns" },
  angle: { noun: "an angle", example: "30 deg" },
  temperature: { noun: "a temperature", example: "25 degC" },
  thermalResistance: { noun: "a thermal resistance", example: "1.5 K/W" },
  dimensionless: { noun: "a pure number", example: "0.8" },
};

export function dimensionNoun(dimension: Dimension): string {
  return DIMENSION_WORDS[dimension].noun;
}

export function dimensionExample(dimension: Dimension): string {
  return DIMENSION_WORDS[dimension].example;
}

/** One unit per dimension, built once, to compare dimensions against. */
const REFERENCE_UNITS = Object.fromEntries(
  (Object.entries(SI_UNIT) as [Dimension, string][])
    .filter(([, unit]) => unit !== "")
    .map(([dimension, unit]) => [dimension, instance.unit(unit)]),
) as Partial<Record<Dimension, Unit>>;

/** What parseQuantity needs to know about the input: a QuantityInputSpec fits. */
export interface QuantitySpec {
  key: string;
  dimension: Dimension;
  displayUnit: string;
  min?: number;
  max?: number;
  minExclusive?: boolean;
  maxExclusive?: boolean;
  integer?: boolean;
}

/** `understood` is set when the text was read through a spelling variant: how it was read, to echo to the engineer. */
export type QuantityParse = { ok: true; value: number; understood?: string } | { ok: false; message: string };

/**
 * Rewrites the spellings engineers type into ones mathjs reads: the micro sign
 * and Greek mu, Ω and the ohm sign, ° and °C, Unicode minus and odd spaces.
 */
export function normaliseUnitText(text: string): string {
  return text
    .replace(/[\u00a0\u2009\u202f]/g, " ")
    .replace(/\u2212/g, "-")
    .replace(/[\u00b5\u03bc]/g, "u")
    .replace(/[\u03a9\u2126]/g, "ohm")
    .replace(/°\s*C\b/g, "degC")
    .replace(/°\s*F\b/g, "degF")
    .replace(/°/g, "deg")
    .trim();
}

/** Which of our dimensions a mathjs unit has, if any. */
export function dimensionOf(quantity: Unit | number): Dimension | undefined {
  if (typeof quantity === "number") return "dimensionless";
  if (quantity.units.length === 0) return "dimensionless";
  for (const [dimension, reference] of Object.entries(REFERENCE_UNITS) as [Dimension, Unit][]) {
    if (quantity.equalBase(reference)) return dimension;
  }
  return undefined;
}

/**
 * A mathjs unit as our engine's plain value in `dimension`'s SI unit, rounded to
 * 15 significant figures so prefix arithmetic leaves no float dust: "10 uF" is
 * 1e-5 exactly as "1e-5 F" is, and "4.7 uF" equals "4700 nF".
 */
function toSi(quantity: Unit, dimension: Dimension): number {
  const unit = SI_UNIT[dimension];
  const value = unit === "" ? quantity.toNumber() : quantity.toNumber(unit);
  return Number.isFinite(value) ? Number(value.toPrecision(15)) : value;
}

/**
 * Any quantity with a unit, as its value in our SI unit for its dimension:
 * "20 kHz" → { value: 20000, unit: "Hz" }. Undefined for plain numbers, unknown units and
 * units outside our dimensions. For search, where no input spec says what is expected.
 */
export function readQuantity(text: string): { value: number; unit: string } | undefined {
  const cleaned = normaliseUnitText(text);
  if (!/^[-+]?\d/.test(cleaned) || cleaned.length > 40) return undefined;
  try {
    const quantity = instance.unit(cleaned);
    const dimension = dimensionOf(quantity);
    if (!dimension || dimension === "dimensionless") return undefined;
    const value = toSi(quantity, dimension);
    return Number.isFinite(value) ? { value, unit: SI_UNIT[dimension] } : undefined;
  } catch {
    return undefined;
  }
}

/** How a quantity reads back in an error message ("5 V", "0.2 rad"). */
function describe(quantity: Unit | number): string {
  if (typeof quantity === "number") return formatQuantity(quantity, "", { digits: 6 });
  return quantity.toString();
}

/** "between 1 Hz and 1 MHz", "at least 0 V", … in engineering notation. */
export function describeRange(spec: QuantitySpec): string | undefined {
  const unit = SI_UNIT[spec.dimension];
  const show = (v: number) => formatQuantity(v, unit, { digits: 6, trimZeros: true });
  const { min, max } = spec;
  if (min !== undefined && max !== undefined) {
    if (!spec.minExclusive && !spec.maxExclusive) return `between ${show(min)} and ${show(max)}`;
    const lo = spec.minExclusive ? `above ${show(min)}` : `at least ${show(min)}`;
    const hi = spec.maxExclusive ? `below ${show(max)}` : `at most ${show(max)}`;
    return `${lo} and ${hi}`;
  }
  if (min !== undefined) return spec.minExclusive ? `greater than ${show(min)}` : `at least ${show(min)}`;
  if (max !== undefined) return spec.maxExclusive ? `less than ${show(max)}` : `at most ${show(max)}`;
  return undefined;
}

/**
 * Checks a value already in SI units against the spec's range and integer rule.
 * Returns the message for the engineer, or undefined when it is acceptable.
 */
export function checkRange(value: number, spec: QuantitySpec): string | undefined {
  const unit = SI_UNIT[spec.dimension];
  const got = Number.isNaN(value) ? "not a number" : formatQuantity(value, unit, { digits: 6, trimZeros: true });
  const range = describeRange(spec);
  if (!Number.isFinite(value)) {
    return range ? `${spec.key} must be ${range}; got ${got}` : `${spec.key} must be a finite number; got ${got}`;
  }
  const below = spec.min !== undefined && (spec.minExclusive ? value <= spec.min : value < spec.min);
  const above = spec.max !== undefined && (spec.maxExclusive ? value >= spec.max : value > spec.max);
  if (below || above) return `${spec.key} must be ${range}; got ${got}`;
  if (spec.integer && !Number.isInteger(value)) return `${spec.key} must be a whole number; got ${got}`;
  return undefined;
}

/**
 * Checks a mathjs value (from typed text or an expression) against the spec's
 * dimension, converts it to SI, and checks the range. A pure number takes the
 * spec's display unit.
 */
export function quantityToSpec(quantity: Unit | number, spec: QuantitySpec): QuantityParse {
  let value: number;
  const bare = typeof quantity === "number" || quantity.units.length === 0;
  if (bare) {
    const number = typeof quantity === "number" ? quantity : quantity.toNumber();
    const converted = bareNumberToSi(number, spec);
    if (!converted.ok) return converted;
    value = converted.value;
  } else {
    if (spec.dimension === "power" && isApparentPower(quantity)) {
      return { ok: false, message: `${spec.key}: ${describe(quantity)} is an apparent power (VA); this input is real power in W — give P = S·pf, e.g. ${formatQuantity(quantity.toNumber("VA") * 0.9, "W", { digits: 3, trimZeros: true })} for pf 0.9` };
    }
    if (dimensionOf(quantity) !== spec.dimension) {
      return { ok: false, message: `${spec.key} must be ${dimensionNoun(spec.dimension)}; got ${describe(quantity)}` };
    }
    value = toSi(quantity, spec.dimension);
  }
  const problem = checkRange(value, spec);
  return problem ? { ok: false, message: problem } : { ok: true, value: Object.is(value, -0) ? 0 : value };
}

function isApparentPower(quantity: Unit): boolean {
  return quantity.units.length === 1 && ["VA", "VAR"].includes(quantity.units[0]!.unit.name);
}

/**
 * A bare number: a pure number for dimensionless inputs ("%" display counts as a
 * hundredth); refused for any other dimension, naming the readings it could have.
 */
function bareNumberToSi(number: number, spec: QuantitySpec): QuantityParse {
  if (spec.dimension === "dimensionless") {
    return { ok: true, value: spec.displayUnit === "%" ? number / 100 : number };
  }
  if (!Number.isFinite(number)) return { ok: true, value: number };
  return { ok: false, message: bareNumberMessage(number, spec) };
}

/** "c: 4.7e-6 has no unit: did you mean 4.7 µF? write the unit" — the SI reading, and the display-unit reading when it differs and is in range. */
export function bareNumberMessage(number: number, spec: QuantitySpec): string {
  const unit = SI_UNIT[spec.dimension];
  const show = (v: number) => formatQuantity(v, unit, { digits: 6, trimZeros: true });
  const readings = [number];
  const display = normaliseUnitText(spec.displayUnit || unit);
  if (display !== unit) readings.push(toSi(instance.unit(number, display), spec.dimension));
  const inRange = readings.filter((v) => checkRange(v, spec) === undefined);
  const offered = [...new Set((inRange.length > 0 ? inRange : readings.slice(0, 1)).map(show))];
  return `${spec.key}: ${formatQuantity(number, "", { digits: 15, trimZeros: true })} has no unit: did you mean ${offered.join(" or ")}? Write the unit (only pure numbers such as ma or pf are typed bare)`;
}

/** Dimensions whose SI unit takes metric prefixes, so a case variant of it ("KHz", "uf") can be read. */
const PREFIXED_DIMENSIONS = new Set<Dimension>(["voltage", "current", "frequency", "capacitance", "inductance", "resistance", "power", "energy", "time"]);
const VARIANT_PREFIXES = ["p", "n", "u", "m", "", "k", "M", "G"];

/**
 * Reads "20 KHz", "48 v", "10 Ohm", "4.7 uf", "48 VDC", "30º", "60hz": the units of
 * the input's dimension that match the typed unit ignoring case. One match is
 * read (and said); two (milli or mega: "mv", "MHZ") are refused with both; none
 * gives undefined so the caller's own message stands.
 */
function readUnitVariant(cleaned: string, spec: QuantitySpec): QuantityParse | undefined {
  const match = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:e[+-]?\d+)?)\s*(.+)$/i.exec(cleaned.replace(/\u00ba/g, "deg"));
  if (!match) return undefined;
  const [, numberText, typedUnit] = match as unknown as [string, string, string];
  let unitText = typedUnit.trim();
  if (spec.dimension === "voltage") unitText = unitText.replace(/\s*dc$/i, "");
  let candidates: string[];
  if (spec.dimension === "angle") candidates = /^deg$/i.test(unitText) ? ["deg"] : [];
  else {
    if (!PREFIXED_DIMENSIONS.has(spec.dimension)) return undefined;
    const base = SI_UNIT[spec.dimension];
    candidates = VARIANT_PREFIXES.map((p) => p + base).filter((c) => c.toLowerCase() === unitText.toLowerCase());
  }
  if (candidates.length === 0) return undefined;
  if (candidates.length > 1) {
    return { ok: false, message: `${spec.key}: "${typedUnit}" could be ${candidates.join(" or ")} (milli or mega); write the unit exactly` };
  }
  const parsed = quantityToSpec(instance.unit(`${numberText} ${candidates[0]}`), spec);
  if (!parsed.ok) return parsed;
  const understood = formatQuantity(parsed.value, SI_UNIT[spec.dimension], { digits: 15, trimZeros: true });
  return { ...parsed, understood: `${spec.key}: read "${cleaned}" as ${understood}` };
}

/**
 * Reads what an engineer typed for one quantity input.
 * parseQuantity("4.7 µF", cSpec) → { ok: true, value: 4.7e-6 }.
 * Never throws: unreadable text, a wrong dimension, a non-finite value or an
 * out-of-range value each give a message naming the input and what is expected.
 */
export function parseQuantity(text: string | number, spec: QuantitySpec): QuantityParse {
  if (typeof text === "number") return quantityToSpec(text, spec);
  const cleaned = normaliseUnitText(text);
  const unreadable: QuantityParse = {
    ok: false,
    message: `${spec.key}: could not read "${text.slice(0, 60)}" as ${dimensionNoun(spec.dimension)}; type a number and a unit, e.g. ${dimensionExample(spec.dimension)}`,
  };
  if (cleaned === "" || cleaned.length > 100) return unreadable;

  if (spec.dimension === "dimensionless") {
    const percent = /^(.*\d\.?)\s*%$/.exec(cleaned);
    if (percent) {
      const number = Number(percent[1]);
      return Number.isNaN(number) ? unreadable : quantityToSpec(number / 100, { ...spec, displayUnit: "" });
    }
  }
  // mathjs reads "Infinity" and "NaN" as unit names; a plain Number() catches them first.
  const plainNumber = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i.test(cleaned) ? Number(cleaned) : undefined;
  if (plainNumber !== undefined) return quantityToSpec(plainNumber, spec);
  if (/^[+-]?(infinity|inf|nan)$/i.test(cleaned)) return quantityToSpec(cleaned.startsWith("-") ? -Infinity : cleaned.toLowerCase().includes("nan") ? NaN : Infinity, spec);

  let quantity: Unit;
  try {
    quantity = instance.unit(cleaned);
  } catch {
    return readUnitVariant(cleaned, spec) ?? unreadable;
  }
  // "V" on its own reads as a valueless unit: the engineer forgot the number.
  if (quantity.value === null) return unreadable;
  const parsed = quantityToSpec(quantity, spec);
  if (!parsed.ok && dimensionOf(quantity) !== spec.dimension) return readUnitVariant(cleaned, spec) ?? parsed;
  return parsed;
}
