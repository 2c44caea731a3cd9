import { describe, expect, it } from "vitest";
import { IEC61000_3_2_CLASS_A } from "~/lib/standards/iec61000-3-2";
import { IEEE1547_ODD_LIMITS, IEEE1547_TRD } from "~/lib/standards/ieee1547";
import { IEEE519_CURRENT_LIMITS_BELOW_20, IEEE519_TDD_BELOW_20, IEEE519_VOLTAGE_LIMITS, ieee519VoltageRow } from "~/lib/standards/ieee519";
import { rowLimitAt, tableLimitAt, type HarmonicLimitRow } from "~/lib/standards/types";

const allRows: HarmonicLimitRow[] = [...IEEE519_CURRENT_LIMITS_BELOW_20, ...IEC61000_3_2_CLASS_A, ...IEEE1547_ODD_LIMITS];

describe("limit tables carry their origin", () => {
  it("every row names standard, edition, table and status", () => {
    for (const row of [...allRows, ...IEEE519_VOLTAGE_LIMITS]) {
      expect(row.standard).toMatch(/^(IEEE Std 519|IEEE Std 1547|IEC 61000-3-2)$/);
      expect(row.edition.length).toBeGreaterThan(0);
      expect(row.table.length).toBeGreaterThan(0);
      expect(["published", "memory"]).toContain(row.status);
    }
  });

  it("IEEE 1547 rows are marked memory; the others published", () => {
    expect(IEEE1547_ODD_LIMITS.every((r) => r.status === "memory")).toBe(true);
    expect([...IEEE519_CURRENT_LIMITS_BELOW_20, ...IEC61000_3_2_CLASS_A, ...IEEE519_VOLTAGE_LIMITS].every((r) => r.status === "published")).toBe(true);
  });

  it("no order is covered twice within a table", () => {
    for (const table of [IEEE519_CURRENT_LIMITS_BELOW_20, IEC61000_3_2_CLASS_A, IEEE1547_ODD_LIMITS]) {
      for (let n = 2; n <= 50; n++) expect(table.filter((row) => rowLimitAt(row, n) !== undefined).length).toBeLessThanOrEqual(1);
    }
  });
});

describe("IEEE Std 519-2014 (published)", () => {
  it("Table 1 bands: ≤ 1 kV 5/8, 1–69 kV 3/5, 69–161 kV 1.5/2.5, > 161 kV 1/1.5", () => {
    expect([120, 1e3, 1001, 69e3, 69001, 161e3, 500e3].map((v) => [ieee519VoltageRow(v)!.individual, ieee519VoltageRow(v)!.thd])).toEqual([
      [5, 8],
      [5, 8],
      [3, 5],
      [3, 5],
      [1.5, 2.5],
      [1.5, 2.5],
      [1, 1.5],
    ]);
  });

  it("Table 2, Isc/IL < 20: every odd order 3–50 limited, TDD 5.0 %", () => {
    for (let n = 3; n <= 49; n += 2) expect(tableLimitAt(IEEE519_CURRENT_LIMITS_BELOW_20, n), `order ${n}`).toBeDefined();
    expect(tableLimitAt(IEEE519_CURRENT_LIMITS_BELOW_20, 51)).toBeUndefined();
    expect(IEEE519_TDD_BELOW_20).toBe(5);
  });
});

describe("IEC 61000-3-2 Class A (published; table number from memory)", () => {
  it("limits orders 2–40 and nothing above", () => {
    for (let n = 2; n <= 40; n++) expect(tableLimitAt(IEC61000_3_2_CLASS_A, n), `order ${n}`).toBeDefined();
    expect(tableLimitAt(IEC61000_3_2_CLASS_A, 41)).toBeUndefined();
  });

  it("applies 0.15·15/n from order 15", () => {
    expect(tableLimitAt(IEC61000_3_2_CLASS_A, 25)!.limit).toBeCloseTo(0.09, 12);
  });
});

describe("IEEE Std 1547-2018 (memory — unverified)", () => {
  it("limits odd orders only, TRD 5.0 %", () => {
    expect(tableLimitAt(IEEE1547_ODD_LIMITS, 4)).toBeUndefined();
    expect(tableLimitAt(IEEE1547_ODD_LIMITS, 5)!.limit).toBe(4);
    expect(IEEE1547_TRD).toBe(5);
  });
});
