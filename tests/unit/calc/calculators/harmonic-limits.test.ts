import { describe, expect, it } from "vitest";
import type { LimitRow, StandardSource } from "~/lib/calc/types";
import { expectClose } from "../../../support/tolerance";
import { refuse, run, valueOf } from "./run-helpers";

const VERDICT = "Engineering estimate — compliance is established by accredited testing and the utility's interconnection rules.";

/** Ideal square-wave spectrum in % of the fundamental: 100/n for odd n (Mohan, 3rd ed., ch. 8 — published). */
function squareWaveSpectrum(highest: number) {
  const lines = [];
  for (let n = 1; n <= highest; n += 2) lines.push({ n, value: 100 / n });
  return lines;
}

const limitOf = (rows: LimitRow[], n: number) => rows.find((r) => r.n === n)?.limit;

describe("harmonic-limits: IEEE Std 519-2014 Table 1 (voltage) — published", () => {
  it.each([
    ["400 V", 5.0, 8.0],
    ["1 kV", 5.0, 8.0],
    ["13.8 kV", 3.0, 5.0],
    ["138 kV", 1.5, 2.5],
    ["230 kV", 1.0, 1.5],
  ])("bus %s: individual %s %%, THD %s %%", (busVoltage, individual, thd) => {
    const { results } = run("harmonic-limits", { standard: "ieee519-voltage", busVoltage, listedTo: 50, spectrum: [{ n: 3, value: 0.5 }, { n: 4, value: 0.1 }] });
    const rows = results.rows as LimitRow[];
    expect(limitOf(rows, 3)).toBe(individual);
    expect(limitOf(rows, 4)).toBe(individual);
    expect(valueOf(results, "thdLimit")).toBe(thd);
  });

  // Derived: √(Σ 1/n², odd n = 3 … 49) = 47.30 %; IEEE Std 519-2014 counts orders to 50 (published).
  it("computes THD to order 50 only: a square wave gives 47.30 % (derived)", () => {
    const { results, warnings } = run("harmonic-limits", { standard: "ieee519-voltage", busVoltage: "400 V", spectrum: squareWaveSpectrum(99) });
    expectClose(valueOf(results, "thd"), 47.30, { abs: 0.005 });
    expect(results.pass).toBe(false);
    expect(warnings).toContain("25 harmonic(s) above order 50 are outside the table and not checked.");
  });

  it("passes a clean spectrum and fails one harmonic over its limit, with the margin", () => {
    const clean = run("harmonic-limits", { standard: "ieee519-voltage", busVoltage: "400 V", listedTo: 50, spectrum: [{ n: 3, value: "4.9 %" }] }).results;
    expect(clean.pass).toBe(true);
    const over = run("harmonic-limits", { standard: "ieee519-voltage", busVoltage: "400 V", listedTo: 50, spectrum: [{ n: 3, value: "5.2 %" }] }).results;
    expect(over.pass).toBe(false);
    expectClose((over.rows as LimitRow[])[0]!.margin, -0.2, { abs: 1e-12 });
  });

  it("fails on THD even when every harmonic passes", () => {
    const spectrum = [3, 5, 7, 9].map((n) => ({ n, value: 4.5 }));
    const { results, warnings } = run("harmonic-limits", { standard: "ieee519-voltage", busVoltage: "400 V", spectrum, listedTo: 50 });
    expect((results.rows as LimitRow[]).every((r) => r.pass)).toBe(true);
    expect(results.pass).toBe(false);
    expect(warnings.join(" ")).toMatch(/THD 9.00 % exceeds the limit of 8.00 %/);
  });

  it("needs the bus voltage", () => {
    expect(refuse("harmonic-limits", { standard: "ieee519-voltage", spectrum: [{ n: 3, value: 1 }] })[0]!.field).toBe("busVoltage");
  });

  it("carries the verdict note and names the table", () => {
    const { results, warnings } = run("harmonic-limits", { standard: "ieee519-voltage", busVoltage: "400 V", listedTo: 50, spectrum: [{ n: 3, value: 1 }] });
    expect(warnings[0]).toBe(VERDICT);
    expect(results.source).toMatchObject({ standard: "IEEE Std 519", edition: "2014", table: "Table 1", status: "published" });
  });
});

describe("harmonic-limits: IEEE Std 519-2014 Table 2 (current), Isc/IL < 20 — published", () => {
  const rows = run("harmonic-limits", {
    standard: "ieee519-current",
    iscIl: "15",
    spectrum: [2, 3, 9, 10, 11, 12, 16, 17, 22, 23, 34, 35, 50].map((n) => ({ n, value: 0.01 })),
  }).results.rows as LimitRow[];

  it.each([
    [3, 4.0],
    [9, 4.0],
    [11, 2.0],
    [17, 1.5],
    [23, 0.6],
    [35, 0.3],
  ])("odd order %s: %s %%", (n, limit) => {
    expect(limitOf(rows, n)).toBe(limit);
  });

  it.each([
    [2, 1.0],
    [10, 1.0],
    [12, 0.5],
    [16, 0.5],
    [22, 0.375],
    [34, 0.15],
    [50, 0.075],
  ])("even order %s: 25 %% of the odd limit, %s %%", (n, limit) => {
    expectClose(limitOf(rows, n)!, limit, { rel: 1e-12 });
  });

  it("has a TDD limit of 5.0 % and says the demand-current approximation", () => {
    const { results, warnings } = run("harmonic-limits", { standard: "ieee519-current", iscIl: "10", listedTo: 50, spectrum: [{ n: 5, value: 1 }] });
    expect(valueOf(results, "thdLimit")).toBe(5);
    expect(warnings.join(" ")).toMatch(/maximum demand current IL \(TDD\)/);
  });

  it("refuses Isc/IL ≥ 20: only the < 20 row is tabulated", () => {
    expect(refuse("harmonic-limits", { standard: "ieee519-current", iscIl: "35", spectrum: [{ n: 5, value: 1 }] })).toEqual([
      { field: "iscIl", message: "only the Isc/IL < 20 row of IEEE Std 519-2014 Table 2 is tabulated here; for Isc/IL = 35 use the standard's own table" },
    ]);
  });

  it("refuses a bus outside 120 V–69 kV", () => {
    expect(refuse("harmonic-limits", { standard: "ieee519-current", iscIl: "10", busVoltage: "138 kV", spectrum: [{ n: 5, value: 1 }] })[0]!.field).toBe("busVoltage");
  });
});

describe("harmonic-limits: IEC 61000-3-2 Class A (Table 1; table number from memory) — published", () => {
  const orders = [2, 3, 4, 5, 6, 7, 8, 9, 11, 13, 15, 21, 39, 40];
  const { results } = run("harmonic-limits", { standard: "iec61000-3-2-a", spectrum: [{ n: 1, value: "10 A" }, ...orders.map((n) => ({ n, value: "0.01 A" }))] });
  const rows = results.rows as LimitRow[];

  it.each([
    [3, 2.3],
    [5, 1.14],
    [7, 0.77],
    [9, 0.4],
    [11, 0.33],
    [13, 0.21],
    [15, 0.15],
    [21, (0.15 * 15) / 21],
    [39, (0.15 * 15) / 39],
    [2, 1.08],
    [4, 0.43],
    [6, 0.3],
    [8, 0.23],
    [40, (0.23 * 8) / 40],
  ])("order %s: %s A", (n, limit) => {
    expectClose(limitOf(rows, n)!, limit, { rel: 1e-12 });
  });

  it("works in amperes, has no total limit, and gives THD from the fundamental", () => {
    expect(rows.every((r) => r.unit === "A")).toBe(true);
    expect("thdLimit" in results).toBe(false);
    expectClose(valueOf(results, "thd"), (Math.sqrt(orders.length * 0.01 ** 2) / 10) * 100, { rel: 1e-12 });
  });

  it("warns above the 16 A scope", () => {
    expect(run("harmonic-limits", { standard: "iec61000-3-2-a", listedTo: 40, spectrum: [{ n: 1, value: "20 A" }, { n: 3, value: "1 A" }] }).warnings.join(" ")).toMatch(/exceeds 16 A/);
  });
});

// IEEE Std 1547-2018, §7.3: Sinewright's table for it is from memory, unverified; this checks only that it says so.
describe("harmonic-limits: IEEE Std 1547-2018 (from memory — unverified)", () => {
  it("marks the source as memory and the verdict as unverified", () => {
    const { results, warnings } = run("harmonic-limits", { standard: "ieee1547", listedTo: 50, spectrum: [{ n: 3, value: 1 }, { n: 4, value: 1 }] });
    expect((results.source as StandardSource).status).toBe("memory");
    expect(warnings.join(" ")).toMatch(/Informative only, no verdict/);
    expect(results.pass).toBeUndefined();
    expect(warnings.join(" ")).toMatch(/Even harmonics are not checked/);
    expect((results.rows as LimitRow[]).map((r) => r.n)).toEqual([3]);
  });
});
