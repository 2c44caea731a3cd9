/**
 * IEC 61000-3-2, limits for harmonic current emissions (equipment input current
 * ≤ 16 A per phase), Class A: maximum permissible harmonic current in amperes (RMS).
 * Values as in the project's reference list; the table number is from memory.
 * Orders 2 to 40 are limited.
 */
import type { HarmonicLimitRow, TableOrigin } from "./types";

const CLASS_A: TableOrigin = { standard: "IEC 61000-3-2", edition: "current edition (Class A limits unchanged since 2005; edition from memory)", table: "Table 1 (Class A; table number from memory)", status: "published" };

export const IEC61000_3_2_HIGHEST_ORDER = 40;
/** The standard's scope: equipment with input current up to 16 A per phase. */
export const IEC61000_3_2_MAX_INPUT_CURRENT = 16;

export const IEC61000_3_2_CLASS_A: readonly HarmonicLimitRow[] = [
  { ...CLASS_A, fromOrder: 3, toOrder: 3, parity: "odd", limit: 2.3, unit: "A" },
  { ...CLASS_A, fromOrder: 5, toOrder: 5, parity: "odd", limit: 1.14, unit: "A" },
  { ...CLASS_A, fromOrder: 7, toOrder: 7, parity: "odd", limit: 0.77, unit: "A" },
  { ...CLASS_A, fromOrder: 9, toOrder: 9, parity: "odd", limit: 0.4, unit: "A" },
  { ...CLASS_A, fromOrder: 11, toOrder: 11, parity: "odd", limit: 0.33, unit: "A" },
  { ...CLASS_A, fromOrder: 13, toOrder: 13, parity: "odd", limit: 0.21, unit: "A" },
  { ...CLASS_A, fromOrder: 15, toOrder: 39, parity: "odd", limit: 0.15, scaling: "inverse-order", unit: "A", note: "0.15 × 15/n" },
  { ...CLASS_A, fromOrder: 2, toOrder: 2, parity: "even", limit: 1.08, unit: "A" },
  { ...CLASS_A, fromOrder: 4, toOrder: 4, parity: "even", limit: 0.43, unit: "A" },
  { ...CLASS_A, fromOrder: 6, toOrder: 6, parity: "even", limit: 0.3, unit: "A" },
  { ...CLASS_A, fromOrder: 8, toOrder: 40, parity: "even", limit: 0.23, scaling: "inverse-order", unit: "A", note: "0.23 × 8/n" },
];

export const IEC61000_3_2_CLASS_A_ORIGIN: TableOrigin = CLASS_A;
