/**
 * Shapes of the harmonic-limit tables. Every row says where it comes from, so a
 * verdict can print the standard, edition and table beside itself.
 */

/** "published": confirmed against the text; "memory": recalled, shown as unverified. */
export type LimitStatus = "published" | "memory";

export interface TableOrigin {
  standard: string;
  edition: string;
  table: string;
  status: LimitStatus;
}

/**
 * Individual harmonic limits for a band of orders.
 * `limit` applies at every order in [fromOrder, toOrder] of the given parity;
 * with `scaling: "inverse-order"` the limit is limit × fromOrder / n (IEC's "0.15 × 15/n").
 */
export interface HarmonicLimitRow extends TableOrigin {
  fromOrder: number;
  toOrder: number;
  parity: "odd" | "even" | "all";
  limit: number;
  scaling?: "inverse-order";
  /** "%" of the fundamental (or of the demand current), or "A" RMS. */
  unit: "%" | "A";
  note?: string;
}

/** The limit a row gives at order n, or undefined when n is outside it. */
export function rowLimitAt(row: HarmonicLimitRow, n: number): number | undefined {
  if (n < row.fromOrder || n > row.toOrder) return undefined;
  if (row.parity === "odd" && n % 2 === 0) return undefined;
  if (row.parity === "even" && n % 2 === 1) return undefined;
  return row.scaling === "inverse-order" ? (row.limit * row.fromOrder) / n : row.limit;
}

/** The limit a table gives at order n (first matching row), or undefined. */
export function tableLimitAt(rows: readonly HarmonicLimitRow[], n: number): { limit: number; row: HarmonicLimitRow } | undefined {
  for (const row of rows) {
    const limit = rowLimitAt(row, n);
    if (limit !== undefined) return { limit, row };
  }
  return undefined;
}
