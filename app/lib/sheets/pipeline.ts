/**
 * Source → checked blocks → engine results → content hash: the one path a sheet
 * takes, in the browser on every keystroke and on the server on every save (where
 * the browser's results are never trusted).
 */
import type { Root as HastRoot } from "hast";
import { evaluateSheet, type SheetEvaluation } from "../calc/evaluate-sheet";
import { checkSheetSource } from "../mdx";
import type { SourceBlock, SourceCitation, SourceKind, SourceProblem } from "../mdx/types";
import { revisionHash, type HashedBlock } from "./integrity";

export interface PreparedSheet {
  ok: true;
  blocks: SourceBlock[];
  citations: SourceCitation[];
  tree: HastRoot;
  evaluation: SheetEvaluation;
}

export type PrepareOutcome = PreparedSheet | { ok: false; problems: SourceProblem[] };

export function prepareSheet(source: string, kind: SourceKind = "sheet"): PrepareOutcome {
  const checked = checkSheetSource(source, kind);
  if (!checked.ok) return checked;
  const evaluation = evaluateSheet(checked.blocks.map((b) => ({ id: b.id, calculator: b.calculator, inputs: b.inputs })));
  return { ok: true, blocks: checked.blocks, citations: checked.citations, tree: checked.tree, evaluation };
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
  return revisionHash({ source, blocks: hashedBlocks(prepared), engineVersion: prepared.evaluation.engineVersion });
}
