/**
 * IEEE Std 1547-2018, interconnection of distributed energy resources: current
 * distortion limits (§7.3). ENTERED FROM MEMORY and not yet confirmed against the
 * standard: every row is status "memory" and any verdict from it is unverified.
 *
 * Odd harmonics as IEEE 519's Isc/IL < 20 row; total rated-current distortion
 * (TRD) 5.0 %. Even-harmonic limits are left out: recollections of them conflict.
 */
import type { HarmonicLimitRow, TableOrigin } from "./types";

const SECTION_7_3: TableOrigin = { standard: "IEEE Std 1547", edition: "2018", table: "§7.3, current distortion limits (table number from memory)", status: "memory" };

export const IEEE1547_HIGHEST_ORDER = 50;

export const IEEE1547_ODD_LIMITS: readonly HarmonicLimitRow[] = [
  { ...SECTION_7_3, fromOrder: 3, toOrder: 10, parity: "odd", limit: 4.0, unit: "%" },
  { ...SECTION_7_3, fromOrder: 11, toOrder: 16, parity: "odd", limit: 2.0, unit: "%" },
  { ...SECTION_7_3, fromOrder: 17, toOrder: 22, parity: "odd", limit: 1.5, unit: "%" },
  { ...SECTION_7_3, fromOrder: 23, toOrder: 34, parity: "odd", limit: 0.6, unit: "%" },
  { ...SECTION_7_3, fromOrder: 35, toOrder: 50, parity: "odd", limit: 0.3, unit: "%" },
];

/** Total rated-current distortion limit, % of rated current. */
export const IEEE1547_TRD = 5.0;

export const IEEE1547_ORIGIN: TableOrigin = SECTION_7_3;
