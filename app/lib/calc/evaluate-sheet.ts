/**
 * Evaluates a calc sheet: blocks that may refer to one another's results through
 * "=" expressions (`=qs1.v1Rms * 1.1`, `=dc1.c to uF`, `=qs1.harmonics`).
 *
 * Blocks run in dependency order (a stable topological order: among blocks that
 * are ready, the earliest on the sheet first). A cycle is named on every block
 * in it; a reference to a missing block or output is named on the referring
 * input; a block that depends on a failed block says which; every other block
 * still computes. The result is deterministic and JSON-safe. Never throws.
 */
import { parseInputs, type DefaultUsed, type InputContext } from "./inputs";
import { getCalculator, calculatorIds } from "./registry";
import { runCalculator } from "./run";
import { BLOCK_ID_PATTERN, checkExpression, type BlockReference } from "./safe-expression";
import type { Calculator, FieldError, OutputSpec, ParsedInputs, Results } from "./types";
import { ENGINE_VERSION } from "./version";

export interface SheetBlock {
  id: string;
  calculator: string;
  inputs: Record<string, unknown>;
}

export type BlockOutcome =
  // defaultsUsed: inputs left empty and the defaults that stood in (older stored outcomes lack it).
  | { ok: true; calculator: string; results: Results; warnings: string[]; inputs: ParsedInputs; defaultsUsed?: DefaultUsed[] }
  | { ok: false; calculator: string; errors: FieldError[] };

export interface SheetEvaluation {
  engineVersion: string;
  blocks: Record<string, BlockOutcome>;
  /** Block ids in the order they were settled: evaluated in dependency order, then blocks caught in cycles. */
  order: string[];
  /** Problems with the sheet itself (not an array, a block without a usable id). Usually empty. */
  errors: FieldError[];
}

export type CalculatorEvaluation =
  | { ok: true; calculator: string; engineVersion: string; results: Results; warnings: string[]; inputs: ParsedInputs; defaultsUsed?: DefaultUsed[] }
  | { ok: false; calculator: string; engineVersion: string; errors: FieldError[] };

/** One calculator on its own, for the single-calculator API. References to other blocks are field errors here. */
export function evaluateCalculator(id: string, rawInputs: unknown): CalculatorEvaluation {
  const calculator = getCalculator(id);
  const name = typeof id === "string" ? id : String(id);
  if (!calculator) {
    return { ok: false, calculator: name, engineVersion: ENGINE_VERSION, errors: [unknownCalculator(name)] };
  }
  const outcome = evaluateBlock(calculator, rawInputs ?? {}, undefined);
  return outcome.ok
    ? { ...outcome, engineVersion: ENGINE_VERSION }
    : { ok: false, calculator: calculator.id, engineVersion: ENGINE_VERSION, errors: outcome.errors };
}

function unknownCalculator(id: string): FieldError {
  return { field: "calculator", message: `unknown calculator "${id.slice(0, 60)}"; available: ${calculatorIds().join(", ")}` };
}

function evaluateBlock(calculator: Calculator, raw: unknown, context: InputContext | undefined): BlockOutcome {
  const parsed = parseInputs(calculator, raw, context);
  if (!parsed.ok) return { ok: false, calculator: calculator.id, errors: parsed.errors };
  const run = runCalculator(calculator, parsed.values, { blockResults: context?.blockResults ?? {} });
  if (!run.ok) return { ok: false, calculator: calculator.id, errors: run.errors };
  return {
    ok: true,
    calculator: calculator.id,
    results: run.results,
    warnings: [...parsed.warnings, ...run.warnings],
    inputs: parsed.values,
    defaultsUsed: parsed.defaultsUsed,
  };
}

/** Which other blocks a block's raw inputs refer to, with the input that does. */
function referencesOf(calculator: Calculator | undefined, raw: unknown): { field: string; reference: BlockReference }[] {
  if (typeof raw !== "object" || raw === null || Array.isArray(raw)) return [];
  const found: { field: string; reference: BlockReference }[] = [];
  const scan = (field: string, text: unknown, always: boolean) => {
    if (typeof text !== "string") return;
    const isExpression = text.trimStart().startsWith("=");
    if (!always && !isExpression) return;
    const checked = checkExpression(isExpression ? text.trimStart().slice(1) : text);
    if (checked.ok) for (const reference of checked.references) found.push({ field, reference });
  };
  for (const [field, value] of Object.entries(raw as Record<string, unknown>)) {
    const spec = calculator?.inputs.find((s) => s.key === field);
    const always = spec?.kind === "expression";
    if (Array.isArray(value)) value.forEach((item) => scan(field, item, false));
    else scan(field, value, always);
  }
  return found;
}

interface PendingBlock {
  id: string;
  index: number;
  calculatorId: string;
  calculator: Calculator | undefined;
  raw: unknown;
  /** Referenced block → the inputs that refer to it. */
  dependsOn: Map<string, string[]>;
}

/** The shortest path from `start` back to itself through `edges`, or undefined. */
function cycleThrough(start: string, edges: (id: string) => string[]): string[] | undefined {
  const previous = new Map<string, string>();
  const queue = [start];
  const seen = new Set<string>();
  while (queue.length > 0) {
    const node = queue.shift()!;
    for (const next of edges(node)) {
      if (next === start) {
        const path = [node];
        while (path[0] !== start) path.unshift(previous.get(path[0]!)!);
        return [...path, start];
      }
      if (!seen.has(next)) {
        seen.add(next);
        previous.set(next, node);
        queue.push(next);
      }
    }
  }
  return undefined;
}

/**
 * Evaluates every block of a sheet. Never throws; a malformed sheet gives
 * sheet-level errors, a malformed block gives that block's errors.
 */
export function evaluateSheet(blocks: unknown): SheetEvaluation {
  const evaluation: SheetEvaluation = { engineVersion: ENGINE_VERSION, blocks: {}, order: [], errors: [] };
  try {
    evaluateInto(blocks, evaluation);
  } catch (error) {
    evaluation.errors.push({ field: "sheet", message: `the sheet could not be evaluated: ${error instanceof Error ? error.message : String(error)}` });
  }
  return evaluation;
}

function evaluateInto(blocks: unknown, evaluation: SheetEvaluation): void {
  if (!Array.isArray(blocks)) {
    evaluation.errors.push({ field: "blocks", message: "a sheet must be a list of blocks {id, calculator, inputs}" });
    return;
  }
  const settle = (id: string, outcome: BlockOutcome) => {
    evaluation.blocks[id] = outcome;
    evaluation.order.push(id);
  };

  // Read each block's id and calculator; set aside those without a usable id.
  const candidates: PendingBlock[] = [];
  const idCount = new Map<string, number>();
  blocks.forEach((block: unknown, index) => {
    const record = typeof block === "object" && block !== null && !Array.isArray(block) ? (block as Record<string, unknown>) : undefined;
    const id = record?.id;
    if (typeof id !== "string" || !BLOCK_ID_PATTERN.test(id) || id.length > 64) {
      evaluation.errors.push({
        field: `blocks[${index}].id`,
        message: `block ${index + 1} needs an id of letters, digits and underscores, starting with a letter (e.g. qs1); got ${typeof id === "string" ? `"${id.slice(0, 40)}"` : String(id)}`,
      });
      return;
    }
    idCount.set(id, (idCount.get(id) ?? 0) + 1);
    const calculatorId = typeof record!.calculator === "string" ? record!.calculator : String(record!.calculator);
    const calculator = getCalculator(calculatorId);
    const dependsOn = new Map<string, string[]>();
    for (const { field, reference } of referencesOf(calculator, record!.inputs)) {
      const fields = dependsOn.get(reference.block) ?? [];
      if (!fields.includes(field)) fields.push(field);
      dependsOn.set(reference.block, fields);
    }
    candidates.push({ id, index, calculatorId, calculator, raw: record!.inputs ?? {}, dependsOn });
  });

  // Duplicate ids cannot be told apart by a reference: they are errors, once each.
  const pending: PendingBlock[] = [];
  const duplicates = new Set<string>();
  for (const block of candidates) {
    const count = idCount.get(block.id)!;
    if (count > 1) {
      if (!duplicates.has(block.id)) {
        duplicates.add(block.id);
        evaluation.blocks[block.id] = {
          ok: false,
          calculator: block.calculatorId,
          errors: [{ field: "id", message: `duplicate block id "${block.id}": ${count} blocks use it; ids must be unique` }],
        };
      }
    } else {
      pending.push(block);
    }
  }

  const known = new Set(pending.map((b) => b.id));
  const blockResults: Record<string, Results> = Object.create(null) as Record<string, Results>;
  const blockOutputs: Record<string, OutputSpec[]> = Object.create(null) as Record<string, OutputSpec[]>;
  const blockInputs: Record<string, ParsedInputs> = Object.create(null) as Record<string, ParsedInputs>;
  const done = new Set<string>();

  // Stable topological order: repeatedly take the earliest block whose dependencies are settled.
  let remaining = pending;
  let progressed = true;
  while (remaining.length > 0 && progressed) {
    progressed = false;
    const next: PendingBlock[] = [];
    for (const block of remaining) {
      const waiting = [...block.dependsOn.keys()].some((dep) => known.has(dep) && dep !== block.id && !done.has(dep));
      const selfReference = block.dependsOn.has(block.id);
      if (waiting || selfReference) {
        next.push(block);
        continue;
      }
      settle(block.id, evaluatePending(block, evaluation, { blockResults, blockOutputs, blockInputs }, known, duplicates));
      done.add(block.id);
      const outcome = evaluation.blocks[block.id]!;
      if (outcome.ok) {
        blockResults[block.id] = outcome.results;
        blockOutputs[block.id] = block.calculator?.outputs ?? [];
        blockInputs[block.id] = outcome.inputs;
      }
      progressed = true;
      // Restart from the top so an earlier block unblocked by this one goes first.
      next.push(...remaining.slice(remaining.indexOf(block) + 1));
      break;
    }
    remaining = next;
  }

  // Whatever is left is in a cycle or waits on one.
  const left = new Set(remaining.map((b) => b.id));
  const edges = (id: string) => [...(remaining.find((b) => b.id === id)?.dependsOn.keys() ?? [])].filter((dep) => left.has(dep));
  for (const block of remaining) {
    const cycle = cycleThrough(block.id, edges);
    const calculator = block.calculatorId;
    if (cycle) {
      const fields = block.dependsOn.get(cycle[1]!) ?? ["inputs"];
      settle(block.id, { ok: false, calculator, errors: fields.map((field) => ({ field, message: `cycle: ${cycle.join(" → ")}` })) });
    } else {
      const blocker = edges(block.id)[0]!;
      const fields = block.dependsOn.get(blocker) ?? ["inputs"];
      settle(block.id, { ok: false, calculator, errors: fields.map((field) => ({ field, message: `depends on "${blocker}", which is caught in a cycle` })) });
    }
  }
  for (const id of duplicates) evaluation.order.push(id);
}

function evaluatePending(
  block: PendingBlock,
  evaluation: SheetEvaluation,
  context: Required<InputContext>,
  known: Set<string>,
  duplicates: Set<string>,
): BlockOutcome {
  if (!block.calculator) return { ok: false, calculator: block.calculatorId, errors: [unknownCalculator(block.calculatorId)] };
  const errors: FieldError[] = [];
  for (const [dep, fields] of block.dependsOn) {
    let message: string | undefined;
    if (duplicates.has(dep)) message = `refers to "${dep}", but several blocks use that id`;
    else if (!known.has(dep)) message = `there is no block "${dep}" on this sheet`;
    else if (!evaluation.blocks[dep]?.ok) message = `depends on "${dep}", which has errors`;
    if (message) for (const field of fields) errors.push({ field, message });
  }
  if (errors.length > 0) return { ok: false, calculator: block.calculator.id, errors };
  return evaluateBlock(block.calculator, block.raw, context);
}
