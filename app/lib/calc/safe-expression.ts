/**
 * Expressions over other blocks' results, e.g. `qs1.v1Rms * 1.1` or `dc1.c to uF`.
 *
 * The text is parsed by the restricted mathjs instance from `units.ts`, then the
 * tree is checked against an allow-list before anything runs, and evaluated by the
 * small interpreter below — never by mathjs's own compile/evaluate, so nothing
 * outside the list can execute. Allowed:
 * - numbers, unit names (V, uF, kHz …), the constants pi and e;
 * - + − × ÷ ^, unary ±, unit conversion with `to` / `in`, parentheses;
 * - sqrt abs sin cos tan asin acos atan exp log log10 min max round floor ceil pow;
 * - `blockId.outputKey`, resolved from the sheet's results.
 * Everything else (assignment, function definition, strings, arrays, objects,
 * other property access, other functions) is refused with a message saying what.
 *
 * References to scalar results carry their unit; a percent result becomes a
 * fraction in arithmetic (48.3 % → 0.483) and a decibel result its dB number.
 */
import type { MathNode } from "mathjs";
import { formatQuantity } from "./format";
import { dimensionNoun, dimensionOf, math, normaliseUnitText, parseExpressionTree, type MathUnit } from "./units";
import type { ResultValue, Results, ScalarResult } from "./types";

export const MAX_EXPRESSION_LENGTH = 500;
export const MAX_EXPRESSION_DEPTH = 50;

const FUNCTIONS = [
  "sqrt",
  "abs",
  "sin",
  "cos",
  "tan",
  "asin",
  "acos",
  "atan",
  "exp",
  "log",
  "log10",
  "min",
  "max",
  "round",
  "floor",
  "ceil",
  "pow",
] as const;
const ALLOWED_FUNCTIONS = new Set<string>(FUNCTIONS);
const OPERATORS = new Set(["add", "subtract", "multiply", "divide", "pow", "unaryMinus", "unaryPlus", "to"]);
const CONSTANTS: Record<string, number> = { pi: Math.PI, e: Math.E };

/** A block's id, as used in references: a letter, then letters, digits or underscores. */
export const BLOCK_ID_PATTERN = /^[A-Za-z][A-Za-z0-9_]*$/;

export interface BlockReference {
  block: string;
  output: string;
}

export type ExpressionCheck =
  | { ok: true; tree: MathNode; references: BlockReference[] }
  | { ok: false; message: string };

type Value = MathUnit | number;

/** Mathjs node shapes the checker reads (mathjs's own types are looser). */
interface AnyNode {
  type: string;
  [field: string]: unknown;
}

class Refusal extends Error {}

function asNode(value: unknown): AnyNode {
  return value as AnyNode;
}

/** `a.b` as a block reference, or undefined when the accessor is anything else. */
function referenceOf(node: AnyNode): BlockReference | undefined {
  const object = asNode(node.object);
  const index = asNode(node.index);
  const dimensions = (index?.dimensions ?? []) as AnyNode[];
  if (object?.type !== "SymbolNode" || index?.type !== "IndexNode" || index.dotNotation !== true) return undefined;
  if (dimensions.length !== 1 || dimensions[0]!.type !== "ConstantNode") return undefined;
  const output = dimensions[0]!.value;
  const block = object.name as string;
  if (typeof output !== "string" || !BLOCK_ID_PATTERN.test(block) || !BLOCK_ID_PATTERN.test(output)) return undefined;
  return { block, output };
}

function checkNode(node: AnyNode, depth: number, references: BlockReference[]): void {
  if (depth > MAX_EXPRESSION_DEPTH) {
    throw new Refusal(`the expression is nested too deeply (more than ${MAX_EXPRESSION_DEPTH} levels)`);
  }
  switch (node.type) {
    case "ConstantNode":
      if (typeof node.value !== "number") throw new Refusal("only numbers and units are allowed (no text, true/false or null)");
      return;
    case "SymbolNode": {
      const name = node.name as string;
      if (Object.hasOwn(CONSTANTS, name) || math.Unit.isValuelessUnit(name)) return;
      if (ALLOWED_FUNCTIONS.has(name)) throw new Refusal(`${name} is a function; call it with an argument, e.g. ${name}(2)`);
      throw new Refusal(`unknown name "${name}"; refer to another block's output as blockId.output, e.g. qs1.v1Rms`);
    }
    case "ParenthesisNode":
      checkNode(asNode(node.content), depth + 1, references);
      return;
    case "OperatorNode": {
      if (!OPERATORS.has(node.fn as string)) throw new Refusal(`the operator "${String(node.op)}" is not allowed; use + - * / ^ and "to"`);
      for (const arg of node.args as AnyNode[]) checkNode(arg, depth + 1, references);
      return;
    }
    case "FunctionNode": {
      const fn = asNode(node.fn);
      if (fn?.type !== "SymbolNode") throw new Refusal("only the listed functions may be called, by name");
      const name = fn.name as string;
      if (!ALLOWED_FUNCTIONS.has(name)) {
        throw new Refusal(`the function "${name}" is not allowed; allowed: ${FUNCTIONS.join(", ")}`);
      }
      for (const arg of node.args as AnyNode[]) checkNode(arg, depth + 1, references);
      return;
    }
    case "AccessorNode": {
      const reference = referenceOf(node);
      if (!reference) throw new Refusal("property access is only allowed as blockId.output, e.g. qs1.v1Rms");
      references.push(reference);
      return;
    }
    case "AssignmentNode":
      throw new Refusal("assignment is not allowed; an expression only computes a value");
    case "FunctionAssignmentNode":
      throw new Refusal("defining functions is not allowed");
    case "BlockNode":
      throw new Refusal("only one expression is allowed (no ';' or line breaks)");
    case "ArrayNode":
    case "ObjectNode":
    case "RangeNode":
    case "IndexNode":
      throw new Refusal("lists, objects, ranges and indexing are not allowed");
    default:
      throw new Refusal(`this kind of expression (${node.type}) is not allowed`);
  }
}

/** Checked expressions by text: a sheet parses each expression several times (dependencies, inputs, evaluation). */
const checkedCache = new Map<string, ExpressionCheck>();
const CACHE_SIZE = 500;

/** Parses and checks an expression without evaluating it. Never throws. */
export function checkExpression(text: unknown): ExpressionCheck {
  if (typeof text !== "string") return { ok: false, message: "an expression must be text" };
  const cached = checkedCache.get(text);
  if (cached) return cached;
  const checked = checkUncached(text);
  if (checkedCache.size >= CACHE_SIZE) checkedCache.delete(checkedCache.keys().next().value!);
  checkedCache.set(text, checked);
  return checked;
}

function checkUncached(text: string): ExpressionCheck {
  const body = text.startsWith("=") ? text.slice(1) : text;
  if (body.length > MAX_EXPRESSION_LENGTH) {
    return { ok: false, message: `the expression is too long (${body.length} characters; the limit is ${MAX_EXPRESSION_LENGTH})` };
  }
  if (body.trim() === "") return { ok: false, message: "the expression is empty; e.g. qs1.v1Rms * 1.1" };
  let tree: MathNode;
  try {
    // The same spellings as typed quantities: µ/μ, Ω, °, °C, Unicode minus.
    tree = parseExpressionTree(normaliseUnitText(body));
  } catch (error) {
    return { ok: false, message: `could not read the expression: ${error instanceof Error ? error.message : String(error)}` };
  }
  const references: BlockReference[] = [];
  try {
    checkNode(asNode(tree), 0, references);
  } catch (error) {
    if (error instanceof Refusal) return { ok: false, message: error.message };
    return { ok: false, message: "the expression could not be checked" };
  }
  return { ok: true, tree, references };
}

/** The blocks an expression refers to (empty when it does not parse). */
export function expressionReferences(text: string): BlockReference[] {
  const checked = checkExpression(text);
  return checked.ok ? [...checked.references] : [];
}

function isScalarResult(value: ResultValue | undefined): value is ScalarResult {
  return typeof value === "object" && value !== null && !Array.isArray(value) && typeof (value as ScalarResult).value === "number" && typeof (value as ScalarResult).unit === "string";
}

/** Looks a reference up in the sheet's results; explains what is missing. */
export function resolveReference(reference: BlockReference, blockResults: Record<string, Results>): { ok: true; value: ResultValue } | { ok: false; message: string } {
  const { block, output } = reference;
  if (!Object.hasOwn(blockResults, block)) return { ok: false, message: `there is no block "${block}" with results on this sheet` };
  const results = blockResults[block]!;
  if (!Object.hasOwn(results, output)) {
    const available = Object.keys(results).join(", ");
    return { ok: false, message: `block "${block}" has no output "${output}"${available ? `; it has ${available}` : ""}` };
  }
  return { ok: true, value: results[output]! };
}

/** A scalar result as a mathjs value: unit kept; % as a fraction; dB and pure numbers as numbers. */
function scalarToValue(result: ScalarResult, name: string): Value {
  if (result.unit === "") return result.value;
  if (result.unit === "%") return result.value / 100;
  if (result.unit === "dB") return result.value;
  try {
    return math.unit(result.value, result.unit);
  } catch {
    throw new Refusal(`${name} has a unit (${result.unit}) expressions cannot use`);
  }
}

function describeKind(value: ResultValue): string {
  if (typeof value === "boolean") return "a yes/no verdict";
  if (Array.isArray(value)) return "a list";
  return "not a number";
}

/** A value in evaluation, with whether it still means a percentage (a % result scaled by pure numbers). */
interface Evaluated {
  value: Value;
  percent: boolean;
}

const isPure = (value: Value) => typeof value === "number" || (math.isUnit(value) && value.units.length === 0);
const TEMPERATURE_OFFSET_UNITS = new Set(["degC", "degF", "K", "degR", "celsius", "fahrenheit", "kelvin", "rankine"]);

function isTemperature(value: Value): value is MathUnit {
  return math.isUnit(value) && value.units.length === 1 && TEMPERATURE_OFFSET_UNITS.has(value.units[0]!.unit.name) && value.units[0]!.power === 1;
}

function describeValue(value: Value): string {
  if (typeof value === "number") return `the pure number ${formatQuantity(value, "", { digits: 6, trimZeros: true })}`;
  const dimension = dimensionOf(value);
  return `${value.toString()}${dimension && dimension !== "dimensionless" ? ` (${dimensionNoun(dimension)})` : ""}`;
}

/** Adding or subtracting needs one dimension on both sides; say so in the engineer's words. */
function checkSameDimension(name: string, a: Value, b: Value): void {
  const same = isPure(a) && isPure(b) ? true : math.isUnit(a) && math.isUnit(b) && a.units.length > 0 && b.units.length > 0 && a.equalBase(b);
  if (!same) {
    const verb = name === "add" ? "add" : "subtract";
    throw new Refusal(`cannot ${verb} ${describeValue(b)} ${name === "add" ? "to" : "from"} ${describeValue(a)}: they are different kinds of quantity; check the units`);
  }
}

function evaluateNode(node: AnyNode, lookup: (reference: BlockReference) => Evaluated): Evaluated {
  switch (node.type) {
    case "ConstantNode":
      return { value: node.value as number, percent: false };
    case "SymbolNode": {
      const name = node.name as string;
      if (Object.hasOwn(CONSTANTS, name)) return { value: CONSTANTS[name]!, percent: false };
      return { value: math.unit(name), percent: false };
    }
    case "ParenthesisNode":
      return evaluateNode(asNode(node.content), lookup);
    case "AccessorNode":
      return lookup(referenceOf(node)!);
    case "OperatorNode":
    case "FunctionNode": {
      const name = node.type === "OperatorNode" ? (node.fn as string) : (asNode(node.fn).name as string);
      const args = (node.args as AnyNode[]).map((arg) => evaluateNode(arg, lookup));
      const values = args.map((a) => a.value);
      if ((name === "add" || name === "subtract") && values.length === 2) {
        checkSameDimension(name, values[0]!, values[1]!);
        // The difference of two temperatures is a temperature difference, in kelvin (never an offset scale such as °C).
        if (name === "subtract" && isTemperature(values[0]!) && isTemperature(values[1]!)) {
          return { value: math.unit(values[0]!.toNumber("K") - values[1]!.toNumber("K"), "K"), percent: false };
        }
      }
      const fn = (math as unknown as Record<string, (...a: Value[]) => Value>)[name]!;
      return { value: fn(...values), percent: stillPercent(name, args) };
    }
    default:
      throw new Refusal(`this kind of expression (${node.type}) is not allowed`);
  }
}

/**
 * Whether an operation keeps a percentage a percentage: scaling one by a pure number
 * (qs1.thd * 1.1, qs1.thd / 2), adding or comparing percentages, its sign or magnitude.
 * A product or ratio of percentages, or any unit, gives a plain number.
 */
function stillPercent(name: string, args: Evaluated[]): boolean {
  const [a, b] = args;
  switch (name) {
    case "multiply":
      return args.length === 2 && a!.percent !== b!.percent && isPure(a!.percent ? b!.value : a!.value);
    case "divide":
      return args.length === 2 && a!.percent && !b!.percent && isPure(b!.value);
    case "add":
    case "subtract":
    case "min":
    case "max":
      return args.length > 0 && args.every((x) => x.percent);
    case "unaryMinus":
    case "unaryPlus":
    case "abs":
    case "round":
    case "floor":
    case "ceil":
      return args.length >= 1 && a!.percent;
    default:
      return false;
  }
}

export type ExpressionOutcome =
  | {
      ok: true;
      kind: "quantity";
      /** The computed value: a mathjs unit or a pure number. */
      quantity: Value;
      /** Set when the whole expression is one reference: the referenced result, untouched. */
      single?: { reference: BlockReference; value: ResultValue };
      /** Set when the expression ends in `to <unit>`: the unit the engineer asked to see. */
      targetUnit?: string;
      /** True when a pure-number result still means a percentage (a % result scaled by pure numbers): show it in %. */
      percent?: boolean;
    }
  /** The whole expression is one reference to a result that is not a scalar (harmonics, a verdict …). */
  | { ok: true; kind: "result"; reference: BlockReference; value: ResultValue }
  | { ok: false; message: string };

function unwrap(node: AnyNode): AnyNode {
  return node.type === "ParenthesisNode" ? unwrap(asNode(node.content)) : node;
}

/**
 * Checks and evaluates an expression against the sheet's results. Never throws.
 * A non-finite result (e.g. 1/0) is an error, not a value.
 */
export function evaluateExpression(text: unknown, blockResults: Record<string, Results>): ExpressionOutcome {
  const checked = checkExpression(text);
  if (!checked.ok) return checked;
  const root = unwrap(asNode(checked.tree));

  if (root.type === "AccessorNode") {
    const reference = referenceOf(root)!;
    const resolved = resolveReference(reference, blockResults);
    if (!resolved.ok) return resolved;
    if (!isScalarResult(resolved.value)) {
      return { ok: true, kind: "result", reference, value: resolved.value };
    }
  }

  const lookup = (reference: BlockReference): Evaluated => {
    const resolved = resolveReference(reference, blockResults);
    if (!resolved.ok) throw new Refusal(resolved.message);
    const name = `${reference.block}.${reference.output}`;
    if (!isScalarResult(resolved.value)) throw new Refusal(`${name} is ${describeKind(resolved.value)}, not a number with a unit`);
    return { value: scalarToValue(resolved.value, name), percent: resolved.value.unit === "%" };
  };

  let quantity: Value;
  let percent: boolean;
  try {
    ({ value: quantity, percent } = evaluateNode(root, lookup));
  } catch (error) {
    if (error instanceof Refusal) return { ok: false, message: error.message };
    return { ok: false, message: `could not evaluate the expression: ${error instanceof Error ? error.message : String(error)}` };
  }

  if (typeof quantity !== "number" && !math.isUnit(quantity)) {
    return { ok: false, message: "the expression must give a number or a quantity with a unit" };
  }
  if (math.isUnit(quantity) && quantity.value === null) {
    return { ok: false, message: "the expression gives a unit without a number; e.g. write 5 V, not V" };
  }
  const numeric = typeof quantity === "number" ? quantity : (quantity.value as number);
  if (!Number.isFinite(numeric)) return { ok: false, message: "the expression does not give a finite number (division by zero?)" };

  const outcome: ExpressionOutcome & { kind: "quantity" } = { ok: true, kind: "quantity", quantity };
  if (percent && isPure(quantity)) outcome.percent = true;
  if (root.type === "AccessorNode") {
    const reference = referenceOf(root)!;
    const resolved = resolveReference(reference, blockResults);
    if (resolved.ok) outcome.single = { reference, value: resolved.value };
  }
  if (root.type === "OperatorNode" && root.fn === "to") {
    const target = unwrap(asNode((root.args as AnyNode[])[1]));
    if (target.type === "SymbolNode") outcome.targetUnit = target.name as string;
  }
  return outcome;
}
