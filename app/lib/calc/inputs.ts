/**
 * The edge of the engine: turns the raw inputs of one block (what the editor or
 * the API sends: strings, numbers, arrays, anything) into the SI values a
 * calculator's `compute` receives, or into field errors. Never throws.
 *
 * Two passes. A zod schema generated from the calculator's InputSpecs (cached per
 * calculator) checks the shape, refuses unknown keys, applies defaults and reads
 * typed quantities. Then the parts that need the sheet are resolved: expressions
 * beginning with "=" (`=qs1.v1Rms * 1.1`) and spectrum references
 * (`=qs1.harmonics`), and spectra are put in the unit the calculator asks for.
 *
 * Rules every input follows (stated for users on the Calculators page):
 * - A dimensioned input needs its unit: a bare number, typed or sent as JSON, is
 *   refused with its readings spelled out (`units.ts`); only inputs documented as
 *   dimensionless take bare numbers.
 * - A unit read through a spelling variant ("20 KHz") is echoed in `notes`.
 * - An absent or empty input ("", null) takes the calculator's default, and says
 *   so: `defaultsUsed` lists each one ("f = 50 Hz"), shown beside the result.
 * - A list item with a comma between digits ("9,59 deg") has two readings and is
 *   refused, naming both.
 */
import { z } from "zod";
import { formatQuantity } from "./format";
import { evaluateExpression, checkExpression } from "./safe-expression";
import { checkRange, dimensionExample, parseQuantity, quantityToSpec, type QuantitySpec } from "./units";
import type {
  Calculator,
  ChoiceInputSpec,
  FieldError,
  Harmonic,
  InputSpec,
  OutputSpec,
  ParsedInputs,
  ParsedInputValue,
  QuantityInputSpec,
  QuantityListInputSpec,
  Results,
  SpectrumInputSpec,
  SpectrumLine,
  SpectrumQuantity,
  SpectrumValueUnit,
} from "./types";

/** What a sheet offers an input that refers to other blocks. */
export interface InputContext {
  blockResults: Record<string, Results>;
  /** Each block's output specs, to learn the unit of a referenced output (e.g. harmonics in V or A). */
  blockOutputs?: Record<string, OutputSpec[]>;
  /** Each block's parsed inputs, to learn how far a referenced spectrum reaches (its `hmax`). */
  blockInputs?: Record<string, ParsedInputs>;
}

export type ParseInputsResult =
  | { ok: true; values: ParsedInputs; warnings: string[]; defaultsUsed: DefaultUsed[] }
  | { ok: false; errors: FieldError[] };

/** An input left empty and the default that stood in for it, as typed in the calculator ("50 Hz"). */
export interface DefaultUsed {
  key: string;
  value: string;
}

const MAX_LIST_ITEMS = 1000;
const DEFAULT_MAX_ORDER = 1000;

/** An expression waiting for the sheet's results. */
interface Deferred {
  expression: string;
}

/** A spectrum value as typed, before conversion to the unit the calculator asks for. */
type SpectrumEntryValue = { kind: "bare"; value: number } | { kind: "percent"; value: number } | { kind: "absolute"; value: number; unit: "A" | "V" };

interface SpectrumEntry {
  n: number;
  value: SpectrumEntryValue;
}

/** A quantity read through a spelling variant, with the words that say how it was read. */
interface Understood {
  value: number;
  understood: string;
}

/** A default standing in for an absent input. */
interface Defaulted {
  defaulted: FirstPass;
  text: string;
}

type FirstPass = number | Understood | string | (number | Understood | Deferred)[] | SpectrumEntry[] | Deferred | Defaulted | undefined;

function isUnderstood(value: unknown): value is Understood {
  return typeof value === "object" && value !== null && typeof (value as Understood).understood === "string";
}

function isDefaulted(value: unknown): value is Defaulted {
  return typeof value === "object" && value !== null && "defaulted" in value;
}

function isDeferred(value: unknown): value is Deferred {
  return typeof value === "object" && value !== null && !Array.isArray(value) && typeof (value as Deferred).expression === "string";
}

function isExpressionText(raw: unknown): raw is string {
  return typeof raw === "string" && raw.trimStart().startsWith("=");
}

function expressionBody(raw: string): string {
  return raw.trimStart().slice(1);
}

function describeRaw(raw: unknown): string {
  if (raw === null) return "null";
  if (Array.isArray(raw)) return "a list";
  if (typeof raw === "object") return "an object";
  if (typeof raw === "string") return `"${raw.slice(0, 40)}"`;
  return typeof raw === "number" || typeof raw === "boolean" ? String(raw) : typeof raw;
}

// ---------------------------------------------------------------- first pass, one reader per kind

type Issue = (message: string) => void;

function readQuantity(spec: QuantityInputSpec, raw: unknown, issue: Issue): FirstPass {
  if (isExpressionText(raw)) return { expression: expressionBody(raw) };
  if (typeof raw !== "number" && typeof raw !== "string") {
    issue(`${spec.key} must be a number with a unit, e.g. ${dimensionExample(spec.dimension)}; got ${describeRaw(raw)}`);
    return undefined;
  }
  const parsed = parseQuantity(raw, spec);
  if (!parsed.ok) {
    issue(parsed.message);
    return undefined;
  }
  return parsed.understood ? { value: parsed.value, understood: parsed.understood } : parsed.value;
}

/** "9,59 deg": a comma between digits reads as a decimal comma or as two items; the engine takes neither silently. */
function decimalCommaProblem(spec: QuantityListInputSpec, text: string): string | undefined {
  // Commas inside parentheses separate function arguments ("min(2,3) deg").
  const match = /(\d+),(\d+)/.exec(text.replace(/\([^()]*\)/g, ""));
  if (!match) return undefined;
  const [whole, left, right] = match as unknown as [string, string, string];
  return (
    `${spec.key}: "${whole}" has two readings — ${left}.${right} (a decimal comma) or ${left} and ${right} (two items); ` +
    `write decimals with a point and separate items with a comma and a space, e.g. ${left}.${right} deg or ${left} deg, ${right} deg`
  );
}

function readChoice(spec: ChoiceInputSpec, raw: unknown, issue: Issue): FirstPass {
  const allowed = spec.options.map((o) => o.value);
  if (typeof raw === "string" && allowed.includes(raw.trim())) return raw.trim();
  issue(`${spec.key} must be one of ${allowed.join(", ")}; got ${describeRaw(raw)}`);
  return undefined;
}

/** Splits "10 deg, min(2,3) deg" at commas outside parentheses. */
function splitTopLevel(text: string): string[] {
  const parts: string[] = [];
  let depth = 0;
  let start = 0;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (ch === "(" || ch === "[") depth++;
    else if (ch === ")" || ch === "]") depth--;
    else if (ch === "," && depth === 0) {
      parts.push(text.slice(start, i));
      start = i + 1;
    }
  }
  parts.push(text.slice(start));
  return parts.map((p) => p.trim());
}

/** A JSON array typed as text, or undefined when the text is not one. */
function jsonArray(text: string): unknown[] | undefined {
  if (!text.trim().startsWith("[")) return undefined;
  try {
    const parsed: unknown = JSON.parse(text);
    return Array.isArray(parsed) ? parsed : undefined;
  } catch {
    return undefined;
  }
}

function readQuantityList(spec: QuantityListInputSpec, raw: unknown, issue: Issue): FirstPass {
  let items: unknown[];
  if (Array.isArray(raw)) items = raw;
  else if (typeof raw === "string") {
    const asJson = jsonArray(raw);
    if (raw.trim().startsWith("[") && !asJson) {
      issue(`${spec.key}: could not read the list; write e.g. 10 deg, 20 deg or ["10 deg", "20 deg"]`);
      return undefined;
    }
    if (!asJson) {
      const problem = decimalCommaProblem(spec, raw);
      if (problem) {
        issue(problem);
        return undefined;
      }
    }
    items = asJson ?? (raw.trim() === "" ? [] : splitTopLevel(raw));
  } else {
    issue(`${spec.key} must be a list, e.g. ${dimensionExample(spec.dimension)}, …; got ${describeRaw(raw)}`);
    return undefined;
  }
  const minItems = spec.minItems ?? 1;
  const maxItems = Math.min(spec.maxItems ?? MAX_LIST_ITEMS, MAX_LIST_ITEMS);
  if (items.length < minItems || items.length > maxItems) {
    issue(`${spec.key} must have ${minItems === maxItems ? minItems : `${minItems} to ${maxItems}`} item(s); got ${items.length}`);
    return undefined;
  }
  const values: (number | Understood | Deferred)[] = [];
  let failed = false;
  items.forEach((item, i) => {
    const itemSpec: QuantitySpec = { ...spec, key: `${spec.key} item ${i + 1}` };
    if (isExpressionText(item)) {
      values.push({ expression: expressionBody(item) });
      return;
    }
    if (typeof item !== "number" && typeof item !== "string") {
      issue(`${itemSpec.key} must be a number with a unit; got ${describeRaw(item)}`);
      failed = true;
      return;
    }
    const parsed = parseQuantity(item, itemSpec);
    if (parsed.ok) values.push(parsed.understood ? { value: parsed.value, understood: parsed.understood } : parsed.value);
    else {
      issue(parsed.message);
      failed = true;
    }
  });
  return failed ? undefined : values;
}

/** One spectrum value: a number, "2.3 %", "2.3 A" or "5 V". */
function readSpectrumValue(raw: unknown, where: string, issue: Issue): SpectrumEntryValue | undefined {
  if (typeof raw === "number") {
    if (Number.isFinite(raw) && raw >= 0) return { kind: "bare", value: raw };
  } else if (typeof raw === "string") {
    const text = raw.trim();
    const percent = /^(.*\d\.?)\s*%$/.exec(text);
    if (percent) {
      const value = Number(percent[1]);
      if (Number.isFinite(value) && value >= 0) return { kind: "percent", value };
    } else if (/^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i.test(text)) {
      const value = Number(text);
      if (value >= 0) return { kind: "bare", value };
    } else {
      for (const [dimension, unit] of [
        ["current", "A"],
        ["voltage", "V"],
      ] as const) {
        const parsed = parseQuantity(text, { key: where, dimension, displayUnit: unit, min: 0 });
        if (parsed.ok) return { kind: "absolute", value: parsed.value, unit };
      }
    }
  }
  issue(`${where} must be a non-negative number, a percentage (e.g. "2.3 %") or a current (e.g. "0.4 A"); got ${describeRaw(raw)}`);
  return undefined;
}

function readSpectrum(spec: SpectrumInputSpec, raw: unknown, issue: Issue): FirstPass {
  if (isExpressionText(raw)) return { expression: expressionBody(raw) };
  const items = Array.isArray(raw) ? raw : typeof raw === "string" ? jsonArray(raw) : undefined;
  const example = `[{"n": 3, "value": "2.1 %"}, {"n": 5, "value": "1.4 %"}] or =qs1.harmonics`;
  if (!items) {
    issue(`${spec.key} must be a list of harmonics, e.g. ${example}; got ${describeRaw(raw)}`);
    return undefined;
  }
  if (items.length === 0 || items.length > MAX_LIST_ITEMS) {
    issue(`${spec.key} must list 1 to ${MAX_LIST_ITEMS} harmonics; got ${items.length}`);
    return undefined;
  }
  const maxOrder = spec.maxOrder ?? DEFAULT_MAX_ORDER;
  const entries: SpectrumEntry[] = [];
  const seen = new Set<number>();
  let failed = false;
  items.forEach((item, i) => {
    const where = `${spec.key} item ${i + 1}`;
    if (typeof item !== "object" || item === null || Array.isArray(item)) {
      issue(`${where} must be an object {n, value}, e.g. {"n": 3, "value": "2.1 %"}; got ${describeRaw(item)}`);
      failed = true;
      return;
    }
    const record = item as Record<string, unknown>;
    const n = typeof record.n === "string" && record.n.trim() !== "" ? Number(record.n) : record.n;
    if (typeof n !== "number" || !Number.isInteger(n) || n < 1 || n > maxOrder) {
      issue(`${where}: n must be a whole harmonic order from 1 to ${maxOrder}; got ${describeRaw(record.n)}`);
      failed = true;
      return;
    }
    if (seen.has(n)) {
      issue(`${spec.key}: harmonic order ${n} is listed twice`);
      failed = true;
      return;
    }
    seen.add(n);
    const value = readSpectrumValue(record.value, `${where} (n = ${n})`, issue);
    if (!value) {
      failed = true;
      return;
    }
    entries.push({ n, value });
  });
  return failed ? undefined : entries;
}

function readExpression(spec: InputSpec, raw: unknown, issue: Issue): FirstPass {
  if (typeof raw !== "string") {
    issue(`${spec.key} must be an expression, e.g. qs1.v1Rms * 2; got ${describeRaw(raw)}`);
    return undefined;
  }
  const text = isExpressionText(raw) ? expressionBody(raw) : raw;
  const checked = checkExpression(text);
  if (!checked.ok) {
    issue(`${spec.key}: ${checked.message}`);
    return undefined;
  }
  return text.trim();
}

function readField(spec: InputSpec, raw: unknown, issue: Issue): FirstPass {
  switch (spec.kind) {
    case "quantity":
      return readQuantity(spec, raw, issue);
    case "choice":
      return readChoice(spec, raw, issue);
    case "quantityList":
      return readQuantityList(spec, raw, issue);
    case "spectrum":
      return readSpectrum(spec, raw, issue);
    case "expression":
      return readExpression(spec, raw, issue);
  }
}

function exampleOf(spec: InputSpec): string {
  switch (spec.kind) {
    case "quantity":
    case "quantityList":
      return dimensionExample(spec.dimension);
    case "choice":
      return spec.options.map((o) => o.value).join(" or ");
    case "spectrum":
      return `=qs1.harmonics`;
    case "expression":
      return "qs1.v1Rms * 2";
  }
}

/** The zod schema for one calculator's raw inputs, built once and cached. */
function schemaFor(calculator: Calculator) {
  const cached = schemas.get(calculator);
  if (cached) return cached;
  const shape: Record<string, z.ZodType<FirstPass>> = {};
  for (const spec of calculator.inputs) {
    // .optional() first, so an absent key still reaches the transform (defaults, "required" messages).
    shape[spec.key] = z.unknown().optional().transform((raw, ctx): FirstPass => {
      const issue: Issue = (message) => ctx.addIssue({ code: "custom", message });
      const absent = raw === undefined || raw === null || (typeof raw === "string" && raw.trim() === "");
      if (absent) {
        if (spec.default !== undefined) {
          const value = readField(spec, spec.default, issue);
          return value === undefined ? z.NEVER : { defaulted: value, text: spec.default };
        }
        if (spec.optional) return undefined;
        issue(`${spec.key} (${spec.label}) is required, e.g. ${exampleOf(spec)}`);
        return z.NEVER;
      }
      const value = readField(spec, raw, issue);
      return value === undefined ? z.NEVER : value;
    });
  }
  const schema = z.strictObject(shape);
  schemas.set(calculator, schema);
  return schema;
}
const schemas = new WeakMap<Calculator, z.ZodType<Record<string, FirstPass>>>();

// ---------------------------------------------------------------- second pass: the sheet

function noSheet(key: string): FieldError {
  return { field: key, message: `${key}: references to other blocks ("=…") work only inside a calc sheet` };
}

function resolveQuantityExpression(spec: QuantitySpec, expression: string, context: InputContext): { ok: true; value: number } | { ok: false; message: string } {
  const outcome = evaluateExpression(expression, context.blockResults);
  if (!outcome.ok) return { ok: false, message: `${spec.key}: ${outcome.message}` };
  if (outcome.kind === "result") {
    const name = `${outcome.reference.block}.${outcome.reference.output}`;
    return { ok: false, message: `${spec.key}: ${name} is not a single quantity; refer to a scalar output` };
  }
  // A referenced percent result is already a fraction; it must not be scaled again by a "%" display unit.
  const single = outcome.single?.value;
  if (spec.dimension === "dimensionless" && single && typeof single === "object" && !Array.isArray(single) && "unit" in single && single.unit === "%") {
    const value = single.value / 100;
    const problem = checkRange(value, spec);
    return problem ? { ok: false, message: problem } : { ok: true, value };
  }
  return quantityToSpec(outcome.quantity, spec);
}

/** The unit a spectrum input wants, possibly chosen by another input. */
function spectrumUnit(spec: SpectrumInputSpec, values: Record<string, FirstPass>): SpectrumValueUnit {
  const byChoice = spec.valueUnitByChoice;
  if (byChoice) {
    const choice = values[byChoice.input];
    if (typeof choice === "string" && Object.hasOwn(byChoice.units, choice)) return byChoice.units[choice]!;
  }
  return spec.valueUnit ?? "%";
}

function outputUnit(context: InputContext, block: string, output: string): string | undefined {
  return context.blockOutputs?.[block]?.find((o) => o.key === output)?.unit;
}

function isHarmonicList(value: unknown): value is Harmonic[] {
  return Array.isArray(value) && value.every((h) => typeof h === "object" && h !== null && typeof (h as Harmonic).n === "number" && typeof (h as Harmonic).rms === "number" && typeof (h as Harmonic).percent === "number");
}

/** The physical quantity a spectrum input must hold, possibly chosen by another input. */
function spectrumQuantity(spec: SpectrumInputSpec, values: Record<string, FirstPass>): SpectrumQuantity | undefined {
  const byChoice = spec.quantityByChoice;
  if (!byChoice) return undefined;
  const choice = values[byChoice.input];
  return typeof choice === "string" && Object.hasOwn(byChoice.quantities, choice) ? byChoice.quantities[choice] : undefined;
}

function wrongQuantityMessage(spec: SpectrumInputSpec, wanted: SpectrumQuantity, got: string, what: string): string {
  return wanted === "current"
    ? `${spec.key}: this limit table limits harmonic currents, and ${what} ${got === "voltage" ? "are voltage harmonics" : `are in ${got}`}. Current harmonics depend on the load as much as on the inverter: give the load's current spectrum (measured or simulated)`
    : `${spec.key}: this limit table limits voltage harmonics, and ${what} are ${got} harmonics; give the voltage spectrum`;
}

/**
 * How far a referenced spectrum reaches: the source block's `hmax` when it has one
 * (its harmonics list every order it keeps up to there), else its highest listed order.
 */
function referenceCoverage(context: InputContext, block: string, harmonics: Harmonic[]): number {
  const hmax = context.blockInputs?.[block]?.hmax;
  if (typeof hmax === "number" && Number.isFinite(hmax)) {
    // A source that lists only odd orders has half-wave symmetry: the even order after an odd hmax is zero, so it is covered too.
    const oddOnly = harmonics.every((h) => h.n < 2 || (Number.isInteger(h.n) && h.n % 2 === 1));
    return oddOnly && hmax % 2 === 1 ? hmax + 1 : hmax;
  }
  return harmonics.reduce((highest, h) => Math.max(highest, h.n), 1);
}

function resolveSpectrumReference(
  spec: SpectrumInputSpec,
  expression: string,
  unit: SpectrumValueUnit,
  quantity: SpectrumQuantity | undefined,
  context: InputContext,
  warnings: string[],
): { ok: true; lines: SpectrumLine[]; coverage: number } | { ok: false; message: string } {
  const outcome = evaluateExpression(expression, context.blockResults);
  if (!outcome.ok) return { ok: false, message: `${spec.key}: ${outcome.message}` };
  if (outcome.kind !== "result" || !isHarmonicList(outcome.value)) {
    return { ok: false, message: `${spec.key}: a spectrum reference must name a harmonics output, e.g. =qs1.harmonics` };
  }
  const { block, output } = outcome.reference;
  const sourceUnit = outputUnit(context, block, output) ?? "V";
  const maxOrder = spec.maxOrder ?? DEFAULT_MAX_ORDER;
  const harmonics = outcome.value.filter((h) => h.n > 0 && h.n <= maxOrder);
  const coverage = Math.min(referenceCoverage(context, block, outcome.value), maxOrder);
  const kind = sourceUnit === "A" ? "current" : sourceUnit === "V" ? "voltage" : sourceUnit;
  const wanted = unit === "A" ? "current" : quantity;
  if (wanted && kind !== wanted) return { ok: false, message: wrongQuantityMessage(spec, wanted, kind, `${block}.${output}`) };
  if (unit === "A") return { ok: true, lines: harmonics.map((h) => ({ n: h.n, value: h.rms })), coverage };
  warnings.push(`${spec.key} is taken from ${block}.${output}: ${kind} harmonics, in % of the fundamental, listed to order ${coverage}.`);
  return { ok: true, lines: harmonics.map((h) => ({ n: h.n, value: h.percent })), coverage };
}

/** Puts typed spectrum entries in the wanted unit, converting through the fundamental (n = 1) when needed. */
function convertSpectrum(
  spec: SpectrumInputSpec,
  entries: SpectrumEntry[],
  unit: SpectrumValueUnit,
  quantity: SpectrumQuantity | undefined,
): { ok: true; lines: SpectrumLine[] } | { ok: false; message: string } {
  const absoluteUnits = new Set(entries.flatMap((e) => (e.value.kind === "absolute" ? [e.value.unit] : [])));
  if (absoluteUnits.size > 1) return { ok: false, message: `${spec.key}: mixes volts and amperes; give one kind` };
  const absoluteUnit = [...absoluteUnits][0];
  if (quantity === "current" && absoluteUnit === "V") return { ok: false, message: wrongQuantityMessage(spec, quantity, "voltage", "the values given") };
  if (quantity === "voltage" && absoluteUnit === "A") return { ok: false, message: wrongQuantityMessage(spec, quantity, "current", "the values given") };
  if (unit === "A" && absoluteUnit === "V") {
    return { ok: false, message: `${spec.key}: this check needs currents in amperes; got volts` };
  }
  const fundamental = entries.find((e) => e.n === 1 && e.value.kind !== "percent");
  const fundamentalValue = fundamental?.value.kind === "absolute" || (fundamental?.value.kind === "bare" && unit === "A") ? fundamental.value.value : undefined;

  const lines: SpectrumLine[] = [];
  for (const { n, value } of entries) {
    if (value.kind === "bare") {
      lines.push({ n, value: value.value });
    } else if (value.kind === "percent" && unit === "%") {
      lines.push({ n, value: value.value });
    } else if (value.kind === "absolute" && unit === "A") {
      lines.push({ n, value: value.value });
    } else if (fundamentalValue === undefined || fundamentalValue <= 0) {
      const given = value.kind === "percent" ? `${value.value} %` : formatQuantity(value.value, value.unit);
      const wanted = unit === "%" ? "percent of the fundamental" : "amperes";
      return { ok: false, message: `${spec.key}: to use ${given} (n = ${n}) as ${wanted}, also give the fundamental (n = 1) in amperes; or give every value in ${unit === "%" ? "%" : "A"}` };
    } else if (value.kind === "percent") {
      lines.push({ n, value: (value.value / 100) * fundamentalValue });
    } else {
      lines.push({ n, value: (value.value / fundamentalValue) * 100 });
    }
  }
  return { ok: true, lines: lines.sort((a, b) => a.n - b.n) };
}

// ---------------------------------------------------------------- the public entry point

/**
 * Reads a block's raw inputs for `calculator`. `context` carries the sheet's
 * results for inputs that refer to other blocks; without it, "=" inputs are
 * field errors. Never throws: anything unreadable becomes a FieldError.
 */
export function parseInputs(calculator: Calculator, raw: Record<string, unknown> | unknown, context?: InputContext): ParseInputsResult {
  let first: Record<string, FirstPass>;
  try {
    const parsed = schemaFor(calculator).safeParse(raw);
    if (!parsed.success) return { ok: false, errors: issuesToErrors(parsed.error.issues, calculator) };
    first = parsed.data;
  } catch (error) {
    // Exotic inputs (proxies, getters that throw) must still give a field error.
    return { ok: false, errors: [{ field: "inputs", message: `the inputs could not be read: ${error instanceof Error ? error.message : String(error)}` }] };
  }

  const errors: FieldError[] = [];
  const warnings: string[] = [];
  const defaultsUsed: DefaultUsed[] = [];
  const values: ParsedInputs = {};
  for (const [key, value] of Object.entries(first)) {
    if (isDefaulted(value)) {
      defaultsUsed.push({ key, value: value.text });
      first[key] = value.defaulted;
    }
  }
  const coverages: Record<string, number> = {};
  for (const spec of calculator.inputs) {
    const value = first[spec.key];
    const resolved = resolveField(spec, value, first, context, warnings);
    if ("error" in resolved) errors.push(resolved.error);
    else if (resolved.value !== undefined) values[spec.key] = resolved.value;
    if ("coverage" in resolved && resolved.coverage !== undefined && spec.kind === "spectrum" && spec.coverageInput) coverages[spec.coverageInput] = resolved.coverage;
  }
  // A referenced spectrum reaches as far as its source lists: that fact fills the coverage input, and a typed claim is refused.
  for (const [key, coverage] of Object.entries(coverages)) {
    if (values[key] !== undefined && !defaultsUsed.some((d) => d.key === key)) {
      errors.push({ field: key, message: `${key} is for typed spectra; a referenced spectrum reaches as far as its source lists it (order ${coverage}): raise the source's hmax instead` });
    }
    values[key] = coverage;
  }
  return errors.length > 0 ? { ok: false, errors } : { ok: true, values, warnings, defaultsUsed };
}

function resolveField(
  spec: InputSpec,
  value: FirstPass,
  first: Record<string, FirstPass>,
  context: InputContext | undefined,
  warnings: string[],
): { value: ParsedInputValue; coverage?: number } | { error: FieldError } {
  const fail = (message: string) => ({ error: { field: spec.key, message } });
  if (value === undefined) return { value: undefined };
  switch (spec.kind) {
    case "quantity": {
      if (isUnderstood(value)) {
        warnings.push(`${value.understood}.`);
        return { value: value.value };
      }
      if (!isDeferred(value)) return { value: value as number };
      if (!context) return { error: noSheet(spec.key) };
      const resolved = resolveQuantityExpression(spec, value.expression, context);
      return resolved.ok ? { value: resolved.value } : fail(resolved.message);
    }
    case "quantityList": {
      const items = value as (number | Understood | Deferred)[];
      const out: number[] = [];
      for (const [i, item] of items.entries()) {
        if (isUnderstood(item)) {
          warnings.push(`${item.understood}.`);
          out.push(item.value);
          continue;
        }
        if (!isDeferred(item)) {
          out.push(item);
          continue;
        }
        if (!context) return { error: noSheet(spec.key) };
        const resolved = resolveQuantityExpression({ ...spec, key: `${spec.key} item ${i + 1}` }, item.expression, context);
        if (!resolved.ok) return fail(resolved.message);
        out.push(resolved.value);
      }
      return { value: out };
    }
    case "spectrum": {
      const unit = spectrumUnit(spec, first);
      const quantity = spectrumQuantity(spec, first);
      if (isDeferred(value)) {
        if (!context) return { error: noSheet(spec.key) };
        const resolved = resolveSpectrumReference(spec, value.expression, unit, quantity, context, warnings);
        return resolved.ok ? { value: resolved.lines, coverage: resolved.coverage } : fail(resolved.message);
      }
      const converted = convertSpectrum(spec, value as SpectrumEntry[], unit, quantity);
      return converted.ok ? { value: converted.lines } : fail(converted.message);
    }
    case "choice":
    case "expression":
      return { value: value as string };
  }
}

function issuesToErrors(issues: z.core.$ZodIssue[], calculator: Calculator): FieldError[] {
  const known = calculator.inputs.map((s) => s.key).join(", ");
  return issues.flatMap((issue): FieldError[] => {
    if (issue.code === "unrecognized_keys") {
      return issue.keys.map((key) => ({ field: key, message: `unknown input "${key.slice(0, 40)}"; ${calculator.id} takes ${known}` }));
    }
    const field = issue.path.length > 0 ? String(issue.path[0]) : "inputs";
    if (issue.code === "invalid_type" && issue.path.length === 0) {
      return [{ field, message: `inputs must be an object of input names to values, e.g. {"${calculator.inputs[0]?.key ?? "x"}": "…"}` }];
    }
    return [{ field, message: issue.message }];
  });
}
