/**
 * The names an author may write in a sheet: one component per calculator (its
 * registry id in PascalCase: quasi-square → QuasiSquare), `Caution` for safety
 * notes, `Cite` for citations in project documents, `MeasuredWaveform` for an
 * attached scope capture measured against a calculator, and a few plain HTML
 * elements that carry no behaviour.
 */
import { calculators, getCalculator } from "../calc/registry";
import { MEASUREMENT_COMPONENT } from "../waveform/measurement";
import type { SourceKind } from "./types";

/** A block's id: a letter, then letters, digits or underscores, at most 32 characters. */
export const SOURCE_BLOCK_ID_PATTERN = /^[A-Za-z][A-Za-z0-9_]{0,31}$/;

export const CAUTION_COMPONENT = "Caution";
export const CITE_COMPONENT = "Cite";

/** Short id prefixes for new blocks; a calculator not listed here gets its words' initials. */
const BLOCK_ID_PREFIXES: Record<string, string> = {
  "quasi-square": "qs",
  "stepped-wave": "sw",
  "half-bridge": "hb",
  "six-step": "six",
  spwm: "pwm",
  "lc-filter": "lc",
  "harmonic-limits": "lim",
  "dc-link": "dc",
  "switch-stress": "sws",
  formula: "fx",
};

/** The component name of a calculator id: "lc-filter" → "LcFilter". */
export function componentNameOf(calculatorId: string): string {
  return calculatorId
    .split("-")
    .map((word) => word.charAt(0).toUpperCase() + word.slice(1))
    .join("");
}

export interface CalculatorComponent {
  component: string;
  /** Registry id, e.g. "quasi-square". */
  calculator: string;
  title: string;
  summary: string;
  idPrefix: string;
  inputKeys: string[];
}

/** Every calculator component, in catalogue order, for the help page and the editor's palette. */
export const CALCULATOR_COMPONENTS: readonly CalculatorComponent[] = calculators.map((calculator) => ({
  component: componentNameOf(calculator.id),
  calculator: calculator.id,
  title: calculator.title,
  summary: calculator.summary,
  idPrefix:
    BLOCK_ID_PREFIXES[calculator.id] ??
    calculator.id
      .split("-")
      .map((word) => word.charAt(0))
      .join(""),
  inputKeys: calculator.inputs.map((input) => input.key),
}));

const byComponent = new Map(CALCULATOR_COMPONENTS.map((entry) => [entry.component, entry]));
const byCalculator = new Map(CALCULATOR_COMPONENTS.map((entry) => [entry.calculator, entry]));

/** The registry id of a calculator component, or undefined for any other name. */
export function calculatorIdOf(componentName: string): string | undefined {
  return byComponent.get(componentName)?.calculator;
}

/** Component names an author may use in a source of this kind, for messages and the help page. */
export function allowedComponentNames(kind: SourceKind): string[] {
  if (kind === "document") return [CAUTION_COMPONENT, CITE_COMPONENT];
  return [...CALCULATOR_COMPONENTS.map((entry) => entry.component), MEASUREMENT_COMPONENT, CAUTION_COMPONENT];
}

/**
 * Plain HTML an author may write, with the attributes each accepts. Everything
 * here is inert: no scripts, embeds, forms, styles or images (attachments will
 * come with their own component).
 */
export const SAFE_HTML_ELEMENTS: Readonly<Record<string, readonly string[]>> = {
  a: ["href", "title"],
  abbr: ["title"],
  br: [],
  kbd: [],
  mark: [],
  small: [],
  sub: [],
  sup: [],
};

/** Elements that may hold nothing. */
export const VOID_HTML_ELEMENTS: ReadonlySet<string> = new Set(["br"]);

/** The id a new block of this calculator would get: its prefix and the lowest free number (qs1, qs2 …). */
export function nextBlockId(calculatorId: string, existingIds: Iterable<string>): string {
  const entry = byCalculator.get(calculatorId);
  if (!entry) throw new Error(`There is no calculator "${calculatorId}".`);
  const taken = new Set(existingIds);
  let number = 1;
  while (taken.has(`${entry.idPrefix}${number}`)) number += 1;
  return `${entry.idPrefix}${number}`;
}

/** `value` in quotes, written so that MDX reads it back exactly (quotes, `&` and all). */
export function quoteAttributeValue(value: string): string {
  // Inside a tag, a blank line or a line starting like a list or quote ends the tag early.
  if (/[\n\r]/.test(value)) throw new Error("A value must fit on one line.");
  // The parser rewrites NUL; the other control characters are invisible in the editor.
  if (/[\u0000-\u0008\u000b-\u001f\u007f]/.test(value)) {
    throw new Error("A value cannot hold control characters; type it again without them.");
  }
  // MDX decodes character references in attribute values, so a literal "&amp;" must be written "&amp;amp;".
  const escaped = value.replace(/&(?=#?[A-Za-z0-9]+;)/g, "&amp;");
  if (!escaped.includes('"')) return `"${escaped}"`;
  if (!escaped.includes("'")) return `'${escaped}'`;
  return `"${escaped.replace(/"/g, "&quot;")}"`;
}

const SNIPPET_LINE_LENGTH = 80;

/**
 * The MDX of a new block for the editor's palette, e.g.
 * `<QuasiSquare id="qs1" vdc="48 V" alpha="30 deg" f="50 Hz" hmax="49" />`:
 * every input at its default, required inputs without one empty (so the block
 * asks for them by name), optional ones without one left out. Long blocks are
 * written one attribute per line.
 */
export function blockSnippet(calculatorId: string, id: string): string {
  const calculator = getCalculator(calculatorId);
  const component = componentNameOf(calculatorId);
  if (!calculator) throw new Error(`There is no calculator "${calculatorId}".`);
  if (!SOURCE_BLOCK_ID_PATTERN.test(id)) {
    throw new Error("A block id starts with a letter and holds only letters, digits and _ (at most 32 characters).");
  }
  const attributes = [`id=${quoteAttributeValue(id)}`];
  for (const input of calculator.inputs) {
    if (input.default !== undefined || !input.optional) attributes.push(`${input.key}=${quoteAttributeValue(input.default ?? "")}`);
  }
  const oneLine = `<${component} ${attributes.join(" ")} />`;
  if (oneLine.length <= SNIPPET_LINE_LENGTH) return oneLine;
  return `<${component}\n${attributes.map((attribute) => `  ${attribute}\n`).join("")}/>`;
}

/** The MDX of a new measured-waveform block for a capture, linked to a calculator block when one is given. */
export function measurementSnippet(id: string, fileName: string, compare?: string): string {
  const attributes = [`id=${quoteAttributeValue(id)}`, `file=${quoteAttributeValue(fileName)}`];
  if (compare) attributes.push(`compare=${quoteAttributeValue(compare)}`, `harmonics="3, 5, 7"`, `fundamentalTol="3 %"`, `thdTol="2 %"`, `harmonicTol="1.5 %"`);
  return `<${MEASUREMENT_COMPONENT}\n${attributes.map((attribute) => `  ${attribute}\n`).join("")}/>`;
}
