/**
 * Source → checked blocks → engine results → content hash: the one path a sheet
 * takes, in the browser on every keystroke and on the server on every save (where
 * the browser's results are never trusted).
 */
import type { Root as HastRoot } from "hast";
import { evaluateSheet, type SheetEvaluation } from "../calc/evaluate-sheet";
import { checkSheetSource } from "../mdx";
import type { Typesetter } from "../mdx/render";
import type { SourceBlock, SourceCitation, SourceKind, SourceMeasurement, SourceProblem } from "../mdx/types";
import { evaluateMeasurements, type MeasurementOutcome, type StoredCapture } from "../waveform/measurement";
import { revisionHash, type HashedBlock } from "./integrity";

export interface PreparedSheet {
  ok: true;
  blocks: SourceBlock[];
  citations: SourceCitation[];
  measurementBlocks: SourceMeasurement[];
  tree: HastRoot;
  evaluation: SheetEvaluation;
  /** Measured-waveform outcomes by block id (empty when the sheet has none). */
  measurements: Record<string, MeasurementOutcome>;
}

export type PrepareOutcome = PreparedSheet | { ok: false; problems: SourceProblem[] };

/**
 * `captures` are the sheet's analysed CSV attachments by file name: the server loads
 * them, the editor has them from its loader. Without them a measured block says which
 * file it misses. `typeset: null` leaves the formulas as TeX (see `prepareUntrustedSheet` on the server).
 */
export function prepareSheet(
  source: string,
  kind: SourceKind = "sheet",
  captures: Readonly<Record<string, StoredCapture>> = {},
  typeset?: Typesetter | null,
): PrepareOutcome {
  const checked = checkSheetSource(source, kind, typeset);
  if (!checked.ok) return checked;
  const evaluation = evaluateSheet(checked.blocks.map((b) => ({ id: b.id, calculator: b.calculator, inputs: b.inputs })));
  const measurements = evaluateMeasurements(checked.measurements, evaluation, captures);
  return { ok: true, blocks: checked.blocks, citations: checked.citations, measurementBlocks: checked.measurements, tree: checked.tree, evaluation, measurements };
}

/** The blocks as hashed and stored: typed inputs and computed results (or errors), in source order. */
export function hashedBlocks(prepared: PreparedSheet): HashedBlock[] {
  return prepared.blocks.map((block) => {
    const outcome = prepared.evaluation.blocks[block.id];
    return {
      id: block.id,
      calculator: block.calculator,
      inputs: block.inputs,
      results: outcome?.ok ? outcome.results : { errors: outcome?.errors ?? [] },
    };
  });
}

export function hashPrepared(source: string, prepared: PreparedSheet): Promise<string> {
  return revisionHash({ source, blocks: hashedBlocks(prepared), engineVersion: prepared.evaluation.engineVersion, measurements: prepared.measurements });
}

/** The attachment ids a prepared sheet's measured blocks rely on. */
export function measuredAttachmentIds(prepared: PreparedSheet): string[] {
  const ids = new Set<string>();
  for (const outcome of Object.values(prepared.measurements)) if (outcome.ok) ids.add(outcome.attachment.id);
  return [...ids];
}
