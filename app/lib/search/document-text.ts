/**
 * The text a calc sheet is found by. Pure: the server builds search documents with
 * it and the engines' tests check it directly.
 *
 * Engineers search for values the way they write them — `fsw 20 kHz`, `20kHz`,
 * `quasi-square 48 V` — so each block contributes its calculator id, its input names
 * with the values as typed, and the same values in the spellings people use for them:
 * the app's display ("1.59 kHz"), trimmed ("20 kHz"), run together ("20khz"), with a
 * plain-letter prefix ("4.7 uF") and in base SI units ("20000 Hz").
 */
import type { Root as HastRoot, RootContent } from "hast";
import { formatQuantity } from "../calc/format";
import { SI_UNIT } from "../calc/format";
import type { Calculator } from "../calc/types";

/**
 * The form of the text below, stored with each search row. Raise it whenever the text a sheet
 * is found by changes: servers rebuild older rows at start, and features that need the new
 * text (named values) wait until a team's rows are all current.
 */
export const SEARCH_TEXT_VERSION = 2;

/** A block of the latest revision as stored: typed inputs, SI inputs and results. */
export interface IndexedBlock {
  blockId: string;
  calculator: string;
  inputs: Record<string, unknown>;
  parsedInputs: Record<string, unknown> | null;
  results: Record<string, unknown> | null;
}

const BLOCK_ELEMENTS = new Set(["p", "h1", "h2", "h3", "h4", "h5", "h6", "li", "blockquote", "pre", "table", "tr", "td", "th", "div", "section"]);

/** The prose of a checked sheet as plain text, one line per paragraph, heading or list item. */
export function proseText(tree: HastRoot): string {
  const lines: string[] = [];
  let line = "";
  const flush = () => {
    const text = line.replace(/\s+/g, " ").trim();
    if (text) lines.push(text);
    line = "";
  };
  const walk = (node: RootContent | HastRoot) => {
    if (node.type === "text") line += node.value;
    else if (node.type === "element" || node.type === "root") {
      // KaTeX's MathML copy repeats the visible text; the annotation holds the LaTeX source.
      if (node.type === "element" && (node.tagName === "annotation" || node.properties?.ariaHidden === "true")) return;
      const block = node.type === "element" && BLOCK_ELEMENTS.has(node.tagName);
      if (block) flush();
      for (const child of node.children) walk(child as RootContent);
      if (block) flush();
      else if (node.type === "element") line += " ";
    }
  };
  walk(tree);
  flush();
  return lines.join("\n");
}

/** Prefixes whose symbol is written with a plain letter as well. */
const ASCII_PREFIX: Record<string, string> = { µ: "u", Ω: "ohm" };

/**
 * The spellings of one quantity people type, lower-cased: "20 khz", "20khz",
 * "20000 hz" for 20 kHz; "4.7 µf", "4.7 uf", "4.7uf", "0.0000047 f" for 4.7 µF.
 */
export function quantitySpellings(value: number, unit: string): string[] {
  if (!Number.isFinite(value)) return [];
  const forms = new Set<string>();
  for (const digits of [3, 4]) forms.add(formatQuantity(value, unit, { digits, trimZeros: true }));
  forms.add(formatQuantity(value, unit));
  const spellings = new Set<string>();
  for (const form of forms) {
    const text = form.toLowerCase();
    spellings.add(text);
    spellings.add(text.replace(/ /g, ""));
    let ascii = text;
    for (const [symbol, letters] of Object.entries(ASCII_PREFIX)) ascii = ascii.replaceAll(symbol.toLowerCase(), letters);
    spellings.add(ascii);
    spellings.add(ascii.replace(/ /g, ""));
  }
  if (unit && unit !== "%" && unit !== "deg" && unit !== "degC" && unit !== "dB" && unit !== "K/W") {
    const base = Number(value.toPrecision(6));
    if (Math.abs(base) >= 1e-6 && Math.abs(base) < 1e9) spellings.add(`${String(base)} ${unit.toLowerCase()}`);
  }
  return [...spellings];
}

function isScalar(value: unknown): value is { value: number; unit: string; display: string } {
  return typeof value === "object" && value !== null && !Array.isArray(value) && typeof (value as { value?: unknown }).value === "number" && typeof (value as { display?: unknown }).display === "string";
}

/**
 * Separates, on each block line, what a reader is shown (block, calculator, values as
 * typed) from the extra spellings that are only there to be found. A control
 * character no sheet contains; text search treats it as a blank.
 */
export const SPELLINGS_MARK = "\u001f";

/** A scope as it prefixes a value word: the input, result or calculator id, lower-case, letters and digits only. */
function scopePrefix(scope: string): string {
  return scope.toLowerCase().replace(/[^a-z0-9]/g, "");
}

/**
 * One value as a single search word scoped to the input, result or calculator it belongs to:
 * ("vdc", 400, "V") → "vdc400v"; ("lc-filter", 1e-5, "F") → "lcfilter10uf". PostgreSQL keeps
 * such a word whole, so "vdc 400 V" can match exactly the sheets where vdc is 400 V, through
 * one short index list instead of three long ones ("vdc", "400", "v").
 */
export function scopedValueWord(scope: string, value: number, unit: string): string | undefined {
  if (!Number.isFinite(value) || !unit || unit === "%") return undefined;
  let spelled = formatQuantity(value, unit, { digits: 3, trimZeros: true }).toLowerCase().replace(/\s+/g, "");
  for (const [symbol, letters] of Object.entries(ASCII_PREFIX)) spelled = spelled.replaceAll(symbol.toLowerCase(), letters);
  const prefix = scopePrefix(scope);
  return prefix ? `${prefix}${spelled}` : undefined;
}

/**
 * The query with each "<scope> <value with unit>" written as its scoped value word
 * ("fsw 20 kHz" → "fsw20khz"), where the scope is an input, result or calculator id.
 * Quoted queries are left as typed. `read` turns "20 kHz" into its SI value and unit.
 */
export function scopeValueWords(query: string, isScope: (word: string) => boolean, read: (text: string) => { value: number; unit: string } | undefined): string {
  if (query.includes('"')) return query;
  return query.replace(/(^|\s)([A-Za-z][\w-]*)\s+([-+]?\d+(?:\.\d+)?\s*[A-Za-z\u00b5\u03bc\u03a9\u2126\u00b0]+)(?=\s|$)/g, (whole, space: string, scope: string, quantity: string) => {
    if (!isScope(scope)) return whole;
    const read_ = read(quantity);
    const word = read_ && scopedValueWord(scope, read_.value, read_.unit);
    return word ? `${space}${word}` : whole;
  });
}

/** A value's spellings and its scoped words ("vdc400v", "quasisquare400v"). */
function scopedAndSpelled(scopes: string[], value: number, unit: string): string[] {
  const scoped = scopes.map((scope) => scopedValueWord(scope, value, unit)).filter((word): word is string => Boolean(word));
  return [...quantitySpellings(value, unit), ...scoped];
}

/**
 * One line per block: "qs1 · Quasi-square (quasi-square): vdc 48 V, alpha 30 deg →
 * thd 29.01 %", then SPELLINGS_MARK and each value in the spellings people type.
 * Inputs referencing another block (`=qs1.v1Rms`) contribute their computed value.
 */
export function blockValuesText(blocks: IndexedBlock[], calculatorById: (id: string) => Calculator | undefined): string {
  return blocks
    .map((block) => {
      const calculator = calculatorById(block.calculator);
      const shown: string[] = [];
      const spellings: string[] = [];
      for (const [name, typed] of Object.entries(block.inputs)) {
        const spec = calculator?.inputs.find((i) => i.key === name);
        const parsed = block.parsedInputs?.[name];
        const computed = spec?.kind === "quantity" && typeof parsed === "number" ? scopedAndSpelled([name, block.calculator], parsed, SI_UNIT[spec.dimension]) : [];
        if (typeof typed === "string" && !typed.startsWith("=")) shown.push(`${name} ${typed}`);
        else if (spec?.kind === "quantity" && typeof parsed === "number") shown.push(`${name} ${formatQuantity(parsed, SI_UNIT[spec.dimension])}`);
        spellings.push(...computed);
      }
      const results: string[] = [];
      for (const [name, result] of Object.entries(block.results ?? {})) {
        if (!isScalar(result)) continue;
        results.push(`${name} ${result.display}`);
        spellings.push(...scopedAndSpelled([name, block.calculator], result.value, result.unit));
      }
      const head = `${block.blockId} · ${calculator?.title ?? block.calculator} (${block.calculator}): ${shown.join(", ")}${results.length ? ` → ${results.join(", ")}` : ""}`;
      return `${head}${SPELLINGS_MARK}${spellings.join(" ")}`;
    })
    .join("\n");
}

/**
 * The block line a query found, as a reader should see it: the line holding the most of
 * the query's words (in its shown half or its spellings), cut to its shown half, with
 * the words that appear there as typed marked. Undefined when no line holds any word.
 */
export function matchedBlockLine(blockValues: string, query: string): string | undefined {
  const words = query
    .toLowerCase()
    .split(/[\s"()]+/)
    .filter((w) => w && w !== "or" && !w.startsWith("-"));
  let best: string | undefined;
  let bestScore = 0;
  for (const line of blockValues.split("\n")) {
    const text = line.toLowerCase();
    const score = words.filter((w) => text.includes(w)).length;
    if (score > bestScore) [best, bestScore] = [line, score];
  }
  if (best === undefined) return undefined;
  const cut = best.indexOf(SPELLINGS_MARK);
  const shown = cut === -1 ? best : best.slice(0, cut);
  return shown.replace(/[\p{L}\p{N}.%°-]+/gu, (token) => (words.includes(token.toLowerCase()) ? `${HIT_START}${token}${HIT_STOP}` : token));
}

/**
 * The part of marked block-value text a reader should see: the shown half of the first
 * line holding a match (the match highlighted when it fell there), never the spellings.
 */
export function shownBlockValues(marked: string, start: string): string {
  const lines = marked.split("\n");
  const line = lines.find((l) => l.includes(start)) ?? lines[0] ?? "";
  const cut = line.indexOf(SPELLINGS_MARK);
  return cut === -1 ? line : line.slice(0, cut);
}

/** A piece of a snippet: plain text, and whether it is a match to highlight. */
export interface SnippetSegment {
  text: string;
  hit: boolean;
}

/**
 * Splits engine output that marks matches with `start`…`stop` into segments. The
 * markers are control characters no sheet contains, so author text is never parsed
 * as markup and the UI renders segments as text.
 */
export function markedToSegments(marked: string, start: string, stop: string): SnippetSegment[] {
  const segments: SnippetSegment[] = [];
  const push = (text: string, hit: boolean) => {
    if (!text) return;
    const last = segments.at(-1);
    if (last && last.hit === hit) last.text += text;
    else segments.push({ text, hit });
  };
  let rest = marked;
  while (rest) {
    const open = rest.indexOf(start);
    if (open < 0) {
      push(rest, false);
      break;
    }
    push(rest.slice(0, open), false);
    const close = rest.indexOf(stop, open + start.length);
    const end = close < 0 ? rest.length : close;
    push(rest.slice(open + start.length, end), true);
    rest = close < 0 ? "" : rest.slice(close + stop.length);
  }
  return segments;
}

/** Marker characters for highlights (ASCII STX / ETX). */
export const HIT_START = "\u0002";
export const HIT_STOP = "\u0003";
