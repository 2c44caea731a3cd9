/** Sheets are numbered per team: CS-0001, CS-0002 … ("calc sheet"). */
const PREFIX = "CS-";

export function sheetNumberLabel(number: number): string {
  return `${PREFIX}${String(number).padStart(4, "0")}`;
}

/** Accepts "CS-0007", "cs-7" or "7"; undefined for anything else. */
export function parseSheetNumber(text: string): number | undefined {
  const match = /^(?:cs-)?0*(\d{1,9})$/i.exec(text.trim());
  if (!match) return undefined;
  const n = Number(match[1]);
  return n > 0 ? n : undefined;
}

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
