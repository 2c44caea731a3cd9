import { CHART_COLUMNS, envelopePoints } from "~/lib/calc/envelope";
import type { SheetEvaluation } from "~/lib/calc/evaluate-sheet";
import { getCalculator } from "~/lib/calc/registry";
import type { FieldError, ParsedInputs, Results, WaveformPoint } from "~/lib/calc/types";
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
      ? { ok: true, calculator: row.calculator, results: forDisplay(row.calculator, row.results as Results), warnings: row.warnings as string[], inputs: (row.parsedInputs ?? {}) as ParsedInputs }
      : { ok: false, calculator: row.calculator, errors: row.errors as FieldError[] };
  }
  return { evaluation, inputsById };
}

/** The page only plots waveforms: thin them to what a chart can show (the stored rows keep every sample). */
function forDisplay(calculatorId: string, results: Results): Results {
  const waveforms = getCalculator(calculatorId)?.outputs.filter((o) => o.kind === "waveform") ?? [];
  if (waveforms.length === 0) return results;
  const thinned = { ...results };
  for (const output of waveforms) {
    const points = results[output.key];
    if (Array.isArray(points)) thinned[output.key] = envelopePoints(points as WaveformPoint[], CHART_COLUMNS);
  }
  return thinned;
}
