import { STAMP_MEANING } from "~/lib/cautions";

/** Opens the browser's print dialog; the print stylesheet turns the sheet into a calculation document. */
export function PrintButton() {
  return (
    <button type="button" className="btn btn-quiet print:hidden" onClick={() => window.print()}>
      Print / save as PDF
    </button>
  );
}

/** A CSS string literal: quotes, backslashes and line breaks escaped. */
function cssString(text: string): string {
  return `"${text.replace(/[\\"]/g, "\\$&").replace(/[\r\n]+/g, " ")}"`;
}

/** The foot of every printed page: which copy is controlled, and what a stamp is. */
const PRINT_FOOTER = `Printed from Sinewright: the on-line revision is the controlled copy. ${STAMP_MEANING}`;

/**
 * The sheet's identity in the top margin of every printed page, and the footer in the bottom one. Page margin
 * boxes repeat reliably in print, unlike fixed elements; the text comes from the sheet.
 */
export function PrintTitleStrip({ left, center, right }: { left: string; center: string; right: string }) {
  const css = `@page { @top-left { content: ${cssString(left)}; } @top-center { content: ${cssString(center)}; } @top-right { content: ${cssString(right)}; } @bottom-left { content: ${cssString(PRINT_FOOTER)}; } }`;
  return <style>{css}</style>;
}
