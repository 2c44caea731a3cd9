/**
 * IEEE Std 519-2014, IEEE Recommended Practice and Requirements for Harmonic
 * Control in Electric Power Systems. Values as in the project's reference list.
 *
 * Table 1: voltage distortion limits at the point of common coupling, by bus voltage.
 * Table 2: current distortion limits for systems rated 120 V through 69 kV. Only
 * the Isc/IL < 20 row is tabulated here (the row that applies to all power
 * generation equipment); other rows are refused rather than entered unchecked.
 * Even harmonics are limited to 25 % of the odd-harmonic limits above (Table 2 note).
 * Limits are evaluated to order 50.
 */
import type { HarmonicLimitRow, TableOrigin } from "./types";

export const IEEE519_EDITION = "2014";
export const IEEE519_HIGHEST_ORDER = 50;

const TABLE_1: TableOrigin = { standard: "IEEE Std 519", edition: IEEE519_EDITION, table: "Table 1", status: "published" };
const TABLE_2: TableOrigin = { standard: "IEEE Std 519", edition: IEEE519_EDITION, table: "Table 2", status: "published" };

export interface VoltageDistortionRow extends TableOrigin {
  /** Bus voltage band at the PCC, volts: above `overVolts`, up to and including `upToVolts`. */
  overVolts: number;
  upToVolts: number;
  /** Individual harmonic limit, % of the fundamental. */
  individual: number;
  /** THD limit, %. */
  thd: number;
}

export const IEEE519_VOLTAGE_LIMITS: readonly VoltageDistortionRow[] = [
  { ...TABLE_1, overVolts: 0, upToVolts: 1e3, individual: 5.0, thd: 8.0 },
  { ...TABLE_1, overVolts: 1e3, upToVolts: 69e3, individual: 3.0, thd: 5.0 },
  { ...TABLE_1, overVolts: 69e3, upToVolts: 161e3, individual: 1.5, thd: 2.5 },
  { ...TABLE_1, overVolts: 161e3, upToVolts: Infinity, individual: 1.0, thd: 1.5 },
];

/** The Table 1 row for a bus voltage (V ≤ 1 kV, 1 kV < V ≤ 69 kV, …). */
export function ieee519VoltageRow(busVoltage: number): VoltageDistortionRow | undefined {
  return IEEE519_VOLTAGE_LIMITS.find((row) => busVoltage > row.overVolts && busVoltage <= row.upToVolts);
}

/** Odd-harmonic limits of Table 2, Isc/IL < 20, % of the maximum demand current IL. */
const ODD_BANDS_BELOW_20: { fromOrder: number; toOrder: number; limit: number }[] = [
  { fromOrder: 3, toOrder: 10, limit: 4.0 },
  { fromOrder: 11, toOrder: 16, limit: 2.0 },
  { fromOrder: 17, toOrder: 22, limit: 1.5 },
  { fromOrder: 23, toOrder: 34, limit: 0.6 },
  { fromOrder: 35, toOrder: 50, limit: 0.3 },
];

/** Even harmonics: 25 % of the odd limits of the same band (Table 2 note). */
export const IEEE519_EVEN_SHARE = 0.25;

export const IEEE519_CURRENT_LIMITS_BELOW_20: readonly HarmonicLimitRow[] = [
  ...ODD_BANDS_BELOW_20.map((band) => ({ ...TABLE_2, ...band, parity: "odd" as const, unit: "%" as const })),
  // Order 2 sits below the first band (3 ≤ h < 11); it takes that band's even limit.
  ...ODD_BANDS_BELOW_20.map((band, i) => ({
    ...TABLE_2,
    fromOrder: i === 0 ? 2 : band.fromOrder,
    toOrder: band.toOrder,
    limit: band.limit * IEEE519_EVEN_SHARE,
    parity: "even" as const,
    unit: "%" as const,
    note: "25 % of the odd-harmonic limit" + (i === 0 ? "; order 2 taken with the 3 ≤ h < 11 band (interpretation)" : ""),
  })),
];

/** TDD limit for Isc/IL < 20, %. */
export const IEEE519_TDD_BELOW_20 = 5.0;

export const IEEE519_TABLE_2_ORIGIN: TableOrigin = TABLE_2;
export const IEEE519_TABLE_1_ORIGIN: TableOrigin = TABLE_1;

/** Table 2 applies to systems rated 120 V through 69 kV. */
export const IEEE519_TABLE_2_VOLTAGE_RANGE = { min: 120, max: 69e3 } as const;
