/**
 * Team-wide numbers: calc sheets CS-0001 … and project documents PD-0001 …; each
 * parser accepts "CS-0007", "cs-7" or "7" and gives undefined for anything else.
 */
function numbering(prefix: string) {
  const pattern = new RegExp(`^(?:${prefix})?0*(\\d{1,9})$`, "i");
  return {
    label: (number: number) => `${prefix}${String(number).padStart(4, "0")}`,
    parse: (text: string): number | undefined => {
      const match = pattern.exec(text.trim());
      if (!match) return undefined;
      const n = Number(match[1]);
      return n > 0 ? n : undefined;
    },
  };
}

const sheetNumbers = numbering("CS-");
const documentNumbers = numbering("PD-");

export const sheetNumberLabel = sheetNumbers.label;
export const parseSheetNumber = sheetNumbers.parse;
export const documentNumberLabel = documentNumbers.label;
export const parseDocumentNumber = documentNumbers.parse;

/** Revision labels run A … Z, then AA, AB … like drawing revisions. */
export function revisionLabel(sequence: number): string {
  let n = sequence;
  let label = "";
  while (n > 0) {
    const rem = (n - 1) % 26;
    label = String.fromCharCode(65 + rem) + label;
    n = Math.floor((n - 1) / 26);
  }
  return label;
}
