/**
 * The contract of the sheet-source pipeline (pure, runs in the browser and on the server).
 *
 * Authors are not trusted. `checkSheetSource` parses MDX with @mdx-js/mdx's parser,
 * refuses everything that could execute or smuggle markup (ESM, {expressions},
 * unknown components, raw HTML outside a small safe list, event-handler and
 * javascript: attributes, expression and spread attributes), extracts the calculator
 * blocks with their string attributes and source positions, and produces a render
 * tree: plain JSON data (a hast root), never code. React turns that tree into
 * elements through hast-util-to-jsx-runtime with our component map.
 */
import type { Root as HastRoot } from "hast";

/** A problem in the source, with where it is (1-based line and column). */
export interface SourceProblem {
  message: string;
  line: number;
  column: number;
}

/** Where an attribute's value sits in the source, so an edit in the form can be written back. */
export interface AttributeSpan {
  /** Offset of the attribute's name. */
  start: number;
  /** Offset just after the closing quote. */
  end: number;
  /** Offset of the first character inside the quotes. */
  valueStart: number;
  /** Offset just after the last character inside the quotes. */
  valueEnd: number;
}

/** One calculator block as written in the source: `<QuasiSquare id="qs1" vdc="48 V" alpha="30 deg" />`. */
export interface SourceBlock {
  /** The author's block id (the `id` attribute), unique in the sheet; referenced as `=id.output`. */
  id: string;
  /** Registry id of the calculator, e.g. "quasi-square". */
  calculator: string;
  /** The MDX component name, e.g. "QuasiSquare". */
  component: string;
  /** Every attribute except `id`, as the author typed it (strings only). */
  inputs: Record<string, string>;
  line: number;
  column: number;
  /** Offsets of the whole element in the source. */
  start: number;
  end: number;
  /** Where each attribute sits, `id` included. */
  attributes: Record<string, AttributeSpan>;
}

/** A citation of a calc-sheet revision in a project document: `<Cite sheet="CS-0001" rev="B" />`. */
export interface SourceCitation {
  sheet: string;
  rev: string;
  line: number;
  column: number;
  /** Where the rev attribute sits, so an update to a newer revision rewrites only that value. */
  revSpan: AttributeSpan;
}

/** A measured-waveform block: `<MeasuredWaveform id="m1" file="capture.csv" compare="qs1" />`. */
export interface SourceMeasurement {
  id: string;
  /** Every attribute except `id`, as typed. */
  attributes: Record<string, string>;
  line: number;
  column: number;
}

export type CheckedSource =
  | { ok: true; blocks: SourceBlock[]; citations: SourceCitation[]; measurements: SourceMeasurement[]; tree: HastRoot }
  | { ok: false; problems: SourceProblem[] };

/** What kind of document a source is: sheets hold calculators; documents hold citations (never calculators: those are checked in sheets). */
export type SourceKind = "sheet" | "document";

export const SOURCE_LIMITS = {
  /** Characters of source. */
  maxLength: 200_000,
  maxBlocks: 200,
  /** Nesting depth of elements in the tree. */
  maxDepth: 64,
  /** Citations in one document. */
  maxCitations: 200,
  /** Lines: the parser's time grows with them (about 25 µs each), whatever they hold. */
  maxLines: 10_000,
  /** List items plus quotes: the parser slows down sharply past a few thousand. */
  maxListItemsAndQuotes: 1_000,
  /** Characters of TeX over all formulas: KaTeX output is ~100 times its input. */
  maxMathLength: 20_000,
} as const;
