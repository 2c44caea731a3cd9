import type { SheetEvaluation } from "~/lib/calc/evaluate-sheet";
import type { FieldError, ParsedInputs, Results } from "~/lib/calc/types";
import type { revisionBlocks } from "./sheets";

type BlockRow = Awaited<ReturnType<typeof revisionBlocks>>[number];

/** Rebuilds a sheet evaluation from the stored, server-computed block rows of one revision. */
export function storedEvaluation(engineVersion: string, rows: BlockRow[]): { evaluation: SheetEvaluation; inputsById: Record<string, Record<string, string>> } {
  const evaluation: SheetEvaluation = { engineVersion, blocks: {}, order: [], errors: [] };
  const inputsById: Record<string, Record<string, string>> = {};
  for (const row of rows) {
    inputsById[row.blockId] = row.inputs as Record<string, string>;
    evaluation.order.push(row.blockId);
    evaluation.blocks[row.blockId] = row.ok
      ? { ok: true, calculator: row.calculator, results: row.results as Results, warnings: row.warnings as string[], inputs: (row.parsedInputs ?? {}) as ParsedInputs }
      : { ok: false, calculator: row.calculator, errors: row.errors as FieldError[] };
  }
  return { evaluation, inputsById };
}
