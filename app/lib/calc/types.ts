/**
 * The contract every calculator module fulfils. Pure types: no runtime code.
 *
 * A calculator declares its inputs (with dimension, SI unit, range and default),
 * its outputs, its formulas as LaTeX for display, its conventions and its
 * published sources, and a `compute` that works in plain SI numbers.
 * Parsing and validating the strings an engineer types ("4.7 uF", "30°")
 * happens once, at the edge, in `inputs.ts`; `compute` never sees strings.
 */

/** Physical dimensions an input may carry. Each maps to one SI unit. */
export type Dimension =
  | "voltage" // V
  | "current" // A
  | "frequency" // Hz
  | "capacitance" // F
  | "inductance" // H
  | "resistance" // ohm
  | "power" // W
  | "energy" // J
  | "time" // s
  | "angle" // deg (the engine's angle unit is the degree; radians are converted)
  | "temperature" // degC
  | "thermalResistance" // K/W
  | "dimensionless"; // plain number

interface InputSpecBase {
  /** Public API key, e.g. "vdc". Never rename: it is stored in revisions. */
  key: string;
  /** Short label for forms, e.g. "DC-link voltage". */
  label: string;
  /** One sentence on what it is and its convention. */
  description: string;
  /** Absent inputs are allowed when true (the calculator handles undefined). */
  optional?: boolean;
}

/** A physical or dimensionless scalar typed as text ("48 V", "0.8"). */
export interface QuantityInputSpec extends InputSpecBase {
  kind: "quantity";
  dimension: Dimension;
  /** Unit the value is shown in by default, e.g. "V", "uF", "kHz", "deg". */
  displayUnit: string;
  /** Inclusive bounds in SI units, unless the matching *Exclusive flag is set. */
  min?: number;
  max?: number;
  minExclusive?: boolean;
  maxExclusive?: boolean;
  integer?: boolean;
  /** Default as the engineer would type it, e.g. "50 Hz". */
  default?: string;
}

/** One of a fixed set of options, e.g. scheme: bipolar | unipolar. */
export interface ChoiceInputSpec extends InputSpecBase {
  kind: "choice";
  options: { value: string; label: string }[];
  default?: string;
}

/** A list of quantities of one dimension (e.g. switching angles). Accepts a JSON array or a comma-separated string. */
export interface QuantityListInputSpec extends InputSpecBase {
  kind: "quantityList";
  dimension: Dimension;
  displayUnit: string;
  min?: number;
  max?: number;
  /** As for QuantityInputSpec: makes min/max exclusive bounds for every item. */
  minExclusive?: boolean;
  maxExclusive?: boolean;
  minItems?: number;
  maxItems?: number;
  default?: string;
}

/** A harmonic spectrum: JSON array of {n, value}, or a reference to another block's `harmonics`. */
export interface SpectrumInputSpec extends InputSpecBase {
  kind: "spectrum";
  /**
   * What the parsed values are in: percent of the fundamental ("%", the default)
   * or RMS amperes ("A"). Bare numbers are read in this unit; other forms are converted.
   */
  valueUnit?: SpectrumValueUnit;
  /** When the unit follows a choice input, e.g. { input: "standard", units: { "iec61000-3-2-a": "A" } }; unlisted options use valueUnit. */
  valueUnitByChoice?: { input: string; units: Record<string, SpectrumValueUnit> };
  /**
   * When the physical quantity follows a choice input (a current-limit table takes
   * current harmonics only): a referenced spectrum of the other quantity, or typed
   * values in its unit, are refused by dimension. Unlisted options take either.
   */
  quantityByChoice?: { input: string; quantities: Record<string, SpectrumQuantity> };
  /**
   * Key of a dimensionless input saying how far the spectrum reaches ("complete to
   * order"). For a reference it is filled from the source block's `hmax`, so the
   * calculator can refuse a verdict on a spectrum that stops short of its table.
   */
  coverageInput?: string;
  /** Highest harmonic order accepted (default 1000). */
  maxOrder?: number;
  default?: string;
}

export type SpectrumValueUnit = "%" | "A";
export type SpectrumQuantity = "voltage" | "current";

/** A mathjs expression with units (formula calculator only). */
export interface ExpressionInputSpec extends InputSpecBase {
  kind: "expression";
  default?: string;
}

export type InputSpec =
  | QuantityInputSpec
  | ChoiceInputSpec
  | QuantityListInputSpec
  | SpectrumInputSpec
  | ExpressionInputSpec;

/** A spectrum line as given to harmonic-limits: order and value (% of fundamental or amperes). */
export interface SpectrumLine {
  n: number;
  value: number;
}

/** The parsed, SI-valued input a compute function receives for each InputSpec kind. */
export type ParsedInputValue =
  | number // quantity (SI; angles in degrees)
  | string // choice, expression
  | number[] // quantityList (SI; angles in degrees)
  | SpectrumLine[] // spectrum
  | undefined; // optional and absent

export type ParsedInputs = Record<string, ParsedInputValue>;

/** A scalar result. `value` is in the SI unit named by `unit` (V, A, Hz, F, H, ohm, W, deg, %, dB, s, degC, K/W, or "" for a pure number). */
export interface ScalarResult {
  value: number;
  unit: string;
  /** The app-wide engineering-notation rendering, e.g. "4.70 µF". */
  display: string;
}

/** One harmonic of a waveform. `percent` is relative to the fundamental (THD_F convention). */
export interface Harmonic {
  n: number;
  peak: number;
  rms: number;
  percent: number;
  /** Frequency of this order in Hz (n × fundamental frequency), when the calculator knows it. */
  frequency?: number;
}

/** A point of a Bode magnitude plot. */
export interface BodePoint {
  f: number;
  gainDb: number;
}

/** A compliance row for harmonic-limits. */
export interface LimitRow {
  n: number;
  value: number;
  limit: number;
  pass: boolean;
  /** limit − value, in the table's unit; negative means over the limit. */
  margin: number;
  /** The table's unit: "%" (of the fundamental) or "A". */
  unit?: string;
}

/** Where a limit table comes from; printed beside every verdict. */
export interface StandardSource {
  standard: string;
  edition: string;
  table: string;
  /** "published" | "memory": memory-status rows are shown as unverified in the UI. */
  status: "published" | "memory";
  note?: string;
}

/** A waveform sample set for plotting one cycle: angle in degrees 0..360, value in V. */
export interface WaveformPoint {
  theta: number;
  v: number;
}

export type ResultValue =
  | ScalarResult
  | Harmonic[]
  | BodePoint[]
  | LimitRow[]
  | WaveformPoint[]
  | StandardSource
  | boolean;

export type Results = Record<string, ResultValue>;

export type OutputKind = "scalar" | "harmonics" | "bode" | "limitRows" | "waveform" | "source" | "boolean";

export interface OutputSpec {
  key: string;
  label: string;
  kind: OutputKind;
  /** SI unit of scalar outputs ("V", "%", "deg", "" …). */
  unit?: string;
  description?: string;
}

export interface FormulaSpec {
  label: string;
  latex: string;
}

export interface ComputeOutcome {
  results: Results;
  /** Plain-language cautions about these particular inputs (e.g. overmodulation). */
  warnings: string[];
}

/**
 * Context a compute function may use: the results of other blocks, for
 * calculators that reference them (formula, harmonic-limits spectrum refs).
 */
export interface ComputeContext {
  blockResults: Record<string, Results>;
}

export interface Calculator {
  /** Public API id, e.g. "quasi-square". Never rename. */
  id: string;
  title: string;
  /** One line for the catalogue. */
  summary: string;
  /** A paragraph: what it computes and when to use it. */
  description: string;
  inputs: InputSpec[];
  outputs: OutputSpec[];
  formulas: FormulaSpec[];
  /** Conventions the user must know, e.g. which angle α is. */
  conventions: string[];
  /** Published sources with edition and equation/table, status words as in the reference list. */
  sources: string[];
  /** Safety or applicability cautions shown beside results. */
  cautions: string[];
  compute(inputs: ParsedInputs, context: ComputeContext): ComputeOutcome;
}

/** A field error: which input, and what to fix. */
export interface FieldError {
  field: string;
  message: string;
}
