/** Writing an input edited in a block's form back into the sheet's MDX source. */
import { getCalculator } from "../calc/registry";
import { parseSheetNumber } from "../sheets/numbering";
import { quoteAttributeValue } from "./components";
import type { SourceBlock, SourceCitation } from "./types";

/**
 * The source with `key` of `block` set to `value`: the attribute's value is
 * replaced where it exists, otherwise the attribute is added after the block's
 * last one (on a line of its own when the block is written one attribute per
 * line). Everything else in the source stays as it was.
 *
 * Throws, with a message the editor can show, when the calculator has no such
 * input, when the value holds control characters, or when the source no longer
 * matches the block (it was edited since the block was read).
 */
export function setBlockInput(source: string, block: SourceBlock, key: string, value: string): string {
  const calculator = getCalculator(block.calculator);
  if (!calculator) throw new Error(`There is no calculator "${block.calculator}".`);
  if (!calculator.inputs.some((input) => input.key === key)) {
    throw new Error(`${block.component} has no input "${key}". Its inputs are: ${calculator.inputs.map((input) => input.key).join(", ")}.`);
  }
  const quoted = quoteAttributeValue(value);
  if (!stillMatches(source, block)) {
    throw new Error("The sheet changed since this block was read. Check the sheet again and retry.");
  }

  const existing = block.attributes[key];
  if (existing) {
    return source.slice(0, existing.valueStart - 1) + quoted + source.slice(existing.valueEnd + 1);
  }

  const last = Object.values(block.attributes).reduce((latest, span) => (span.end > latest.end ? span : latest));
  const lineStart = source.lastIndexOf("\n", last.start - 1) + 1;
  const indent = source.slice(lineStart, last.start);
  const separator = /^[ \t]*$/.test(indent) ? `\n${indent}` : " ";
  return source.slice(0, last.end) + `${separator}${key}=${quoted}` + source.slice(last.end);
}

/** The block's tag and attribute spans still sit where they were read. */
function stillMatches(source: string, block: SourceBlock): boolean {
  if (!source.startsWith(`<${block.component}`, block.start) || block.end > source.length) return false;
  return Object.entries(block.attributes).every(([name, span]) => {
    const quote = source.charAt(span.end - 1);
    return (
      source.startsWith(name, span.start) &&
      (quote === '"' || quote === "'") &&
      source.charAt(span.valueStart - 1) === quote &&
      span.valueEnd === span.end - 1
    );
  });
}

/**
 * The source with every citation of `sheet` at revision `from` moved to revision `to`;
 * only the rev values change. `citations` are the source's checked citations.
 */
export function setCitationRevision(source: string, citations: readonly SourceCitation[], sheet: string, from: string, to: string): string {
  if (!/^[A-Z]{1,3}$/.test(to)) throw new Error(`"${to}" is not a revision label (A, B … AA).`);
  const targets = citations.filter((c) => sameSheet(c.sheet, sheet) && c.rev.trim().toUpperCase() === from.trim().toUpperCase());
  if (targets.length === 0) throw new Error(`The document no longer cites ${sheet} revision ${from}.`);
  // Right to left, so earlier offsets stay valid.
  let next = source;
  for (const c of [...targets].sort((a, b) => b.revSpan.valueStart - a.revSpan.valueStart)) {
    next = next.slice(0, c.revSpan.valueStart) + to + next.slice(c.revSpan.valueEnd);
  }
  return next;
}

/** "CS-0003", "cs-3" and "3" name the same sheet. */
function sameSheet(a: string, b: string): boolean {
  const [na, nb] = [parseSheetNumber(a), parseSheetNumber(b)];
  return na !== undefined && nb !== undefined ? na === nb : a.trim().toUpperCase() === b.trim().toUpperCase();
}
