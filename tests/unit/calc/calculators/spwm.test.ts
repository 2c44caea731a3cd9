import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { besselJ, besselJOrders } from "~/lib/calc/bessel";
import { CalculationError } from "~/lib/calc/errors";
import { steppedCycleFourier } from "~/lib/calc/spectrum";
import { besselOrderCut, calculator, closedFormSpectrum, switchedCycle, type PwmScheme } from "~/lib/calc/calculators/spwm";
import { expectClose } from "../../../support/tolerance";
import { cellAveragedSpectrum, comparatorCellFractions, sampledThdUpTo, sampledWeightedThd, triangle } from "../fft-reference";
import { expectAllFinite, harmonicsOf, levelAfter, peakAt, run, scalarOf, waveformOf } from "./run-calculator";

interface Case {
  vdc?: number;
  ma: number;
  mf: number;
  scheme?: PwmScheme;
  bridge?: "half" | "full";
  hmax?: number;
  f?: number;
}

const compute = ({ vdc = 400, ma, mf, scheme = "bipolar", bridge = "full", hmax = 100, f = 50 }: Case) =>
  run(calculator, { vdc, ma, mf, scheme, bridge, f, hmax });

describe("spwm: the Bessel closed form agrees with exact integration of the switched wave", () => {
  // Same carrier convention in both paths: synchronous, valley at 90°. The closed form is
  // Holmes & Lipo 2003 ch. 3 (equation numbers from memory); the other path finds every
  // reference–carrier crossing and integrates the flat segments exactly.
  const cases: [number, number, PwmScheme][] = [
    [0.8, 21, "bipolar"],
    [1, 3, "bipolar"],
    [0.35, 9, "bipolar"],
    [0.5, 4, "bipolar"],
    [0.97, 40, "bipolar"],
    [0.9, 9, "unipolar"],
    [0.3, 10, "unipolar"],
    [1, 25, "unipolar"],
  ];
  it.each(cases)("ma = %d, mf = %i, %s: every order to 300, sine and cosine parts", (ma, mf, scheme) => {
    const closed = closedFormSpectrum(ma, mf, scheme, 300);
    const { a, b } = steppedCycleFourier(switchedCycle(ma, mf, scheme), 300);
    for (let h = 1; h <= 300; h++) {
      // A·cos(h(θ − 90°)) = A·cos(h·90°)·cos hθ + A·sin(h·90°)·sin hθ
      expectClose(a[h]!, closed[h]! * Math.cos((h * Math.PI) / 2), { abs: 1e-10 }, `cosine part of order ${h}`);
      expectClose(b[h]!, closed[h]! * Math.sin((h * Math.PI) / 2), { abs: 1e-10 }, `sine part of order ${h}`);
    }
    expectClose(a[0]!, closed[0]!, { abs: 1e-10 }, "DC offset");
  });

  it("drops only Bessel orders that cannot matter: |J_n(x)| < 1e-16 beyond the cut", () => {
    for (const x of [0.1, 1, 3.14, 10, 60, 300, 1500]) {
      const cut = besselOrderCut(x);
      const orders = besselJOrders(x, cut + 40);
      for (let n = cut; n <= cut + 40; n++) expect(Math.abs(orders[n]!), `J_${n}(${x})`).toBeLessThan(1e-16);
    }
  });
});

describe("spwm: Mohan, Undeland & Robbins, 3rd ed., Table 8-1 (bipolar pole voltage over Vdc/2, mf large)", () => {
  const mf = 99;
  const columns = [0.2, 0.4, 0.6, 0.8, 1.0];
  const spectra = columns.map((ma) => harmonicsOf(compute({ vdc: 2, ma, mf, bridge: "half", hmax: 4 * mf + 8 }).results));
  /**
   * Checks a row (at each listed order) against the table's printed entries at each ma.
   * The allowance is half a unit in the last printed digit, widened to `floor` for rows recalled from memory.
   */
  const checkRow = (orders: number[], printed: (string | null)[], floor = 0) => {
    printed.forEach((text, column) => {
      if (text === null) return;
      const decimals = text.split(".")[1]?.length ?? 0;
      const allowance = Math.max(0.5 * 10 ** -decimals + 1e-6, floor);
      for (const n of orders) expectClose(peakAt(spectra[column]!, n), Number(text), { abs: allowance }, `order ${n} at ma = ${columns[column]}`);
    });
  };
  // Rows 1, mf, 2mf±1, 3mf, 4mf±1: published, checked against Mohan, Undeland & Robbins, 3rd ed., Table 8-1.
  it("matches the confirmed rows 1, mf, 2mf ± 1, 3mf and 4mf ± 1", () => {
    checkRow([1], ["0.2", "0.4", "0.6", "0.8", "1.0"]);
    checkRow([mf], ["1.242", "1.15", "1.006", "0.818", "0.601"]);
    checkRow([2 * mf - 1, 2 * mf + 1], ["0.190", "0.326", "0.370", "0.314", "0.181"]);
    checkRow([3 * mf], ["0.335", "0.123", "0.083", "0.171", "0.113"]);
    checkRow([4 * mf - 1, 4 * mf + 1], ["0.163", "0.157", "0.008", "0.105", "0.068"]);
  });
  // The other rows of Table 8-1 are from memory, unverified, so they get a looser check.
  it("matches the remaining rows as recalled (memory; looser check)", () => {
    const loose = 2e-3;
    checkRow([mf - 2, mf + 2], ["0.016", "0.061", "0.131", "0.220", "0.318"], loose);
    checkRow([mf - 4, mf + 4], [null, null, null, null, "0.018"], loose);
    checkRow([2 * mf - 3, 2 * mf + 3], [null, "0.024", "0.071", "0.139", "0.212"], loose);
    checkRow([2 * mf - 5, 2 * mf + 5], [null, null, null, null, "0.033"], loose);
    checkRow([3 * mf - 2, 3 * mf + 2], ["0.044", "0.139", "0.203", "0.176", "0.062"], loose);
    checkRow([3 * mf - 4, 3 * mf + 4], [null, "0.012", "0.047", "0.104", "0.157"], loose);
    checkRow([3 * mf - 6, 3 * mf + 6], [null, null, null, "0.016", "0.044"], loose);
    checkRow([4 * mf - 3, 4 * mf + 3], ["0.012", "0.070", "0.132", "0.115", "0.009"], loose);
    checkRow([4 * mf - 5, 4 * mf + 5], [null, "0.006", "0.034", "0.084", "0.119"], loose);
    checkRow([4 * mf - 7, 4 * mf + 7], [null, null, null, "0.017", "0.050"], loose);
  });
  it("puts the line at order m·mf + n at (4/(mπ))·|J_n(mπ·ma/2)| where m + n is odd (Holmes & Lipo 2003 ch. 3; Black 1953)", () => {
    const table = spectra[3]!; // ma = 0.8
    for (const [m, n] of [[1, 0], [1, 2], [1, 6], [2, 1], [2, 5], [3, 0], [3, 4], [4, 3]] as const) {
      expectClose(peakAt(table, m * mf + n), (4 / (m * Math.PI)) * Math.abs(besselJ(n, (m * Math.PI * 0.8) / 2)), { abs: 1e-12 }, `m = ${m}, n = ${n}`);
    }
    // m + n even: no line (sin((m+n)π/2) = 0).
    expect(peakAt(table, mf + 1)).toBe(0);
    expect(peakAt(table, 2 * mf)).toBe(0);
  });
});

describe("spwm: linear region", () => {
  it("gives fundamental ma·Vdc/2 for a half bridge and ma·Vdc for a full bridge, bipolar or unipolar (Mohan 3rd ed. §8-3 — published)", () => {
    for (const ma of [0.1, 0.5, 0.9, 1]) {
      expectClose(scalarOf(compute({ vdc: 400, ma, mf: 99, bridge: "half" }).results, "v1Peak"), ma * 200, { rel: 1e-12 });
      expectClose(scalarOf(compute({ vdc: 400, ma, mf: 99, bridge: "full" }).results, "v1Peak"), ma * 400, { rel: 1e-12 });
      expectClose(scalarOf(compute({ vdc: 400, ma, mf: 98, scheme: "unipolar" }).results, "v1Peak"), ma * 400, { rel: 1e-12 });
    }
  });

  // Derived: the bipolar pole's RMS is Vdc/2 whatever ma and its fundamental RMS is ma·Vdc/(2√2) (Mohan, Undeland &
  // Robbins, 3rd ed., §8-3 — published), so THD = √((Vdc/2)² / (ma·Vdc/(2√2))² − 1) = √(2/ma² − 1).
  it("has bipolar THD √(2/ma² − 1) over all components, from Vrms = Vdc/2 (derived)", () => {
    for (const ma of [0.2, 0.5, 0.8, 1]) {
      for (const bridge of ["half", "full"] as const) {
        const { results } = compute({ ma, mf: 99, bridge });
        expectClose(scalarOf(results, "vrms"), bridge === "half" ? 200 : 400, { rel: 1e-12 });
        expectClose(scalarOf(results, "thd"), 100 * Math.sqrt(2 / ma ** 2 - 1), { rel: 1e-9 }, `ma = ${ma}, ${bridge}`);
      }
    }
  });

  it("unipolar: odd carrier groups cancel and the first sidebands sit at 2mf ± 1 (Mohan 3rd ed. §8-3-2-2 — memory)", () => {
    const mf = 30;
    const table = harmonicsOf(compute({ ma: 0.8, mf, scheme: "unipolar", hmax: 200 }).results);
    for (let n = mf - 12; n <= mf + 12; n++) expect(peakAt(table, n), `order ${n}`).toBeLessThan(1e-9);
    // The surviving lines are the bipolar pole's even-group lines, now relative to Vdc (derived).
    expectClose(peakAt(table, 2 * mf + 1), 400 * (2 / Math.PI) * Math.abs(besselJ(1, 0.8 * Math.PI)), { rel: 1e-9 });
    expectClose(peakAt(table, 2 * mf - 1), 400 * (2 / Math.PI) * Math.abs(besselJ(-1, 0.8 * Math.PI)), { rel: 1e-9 });
  });

  it("lists only odd orders for odd mf (half-wave symmetry) and adds even orders for even mf, with a warning", () => {
    const odd = compute({ ma: 0.8, mf: 21 });
    expect(harmonicsOf(odd.results).every((h) => h.n % 2 === 1)).toBe(true);
    expect(odd.warnings).toEqual([]);
    const even = compute({ ma: 0.8, mf: 20 });
    expect(harmonicsOf(even.results).some((h) => h.n % 2 === 0 && h.peak > 1)).toBe(true);
    expect(even.warnings.join(" ")).toMatch(/odd integer for bipolar/);
  });

  it("warns when a small mf folds sidebands onto the fundamental", () => {
    const small = compute({ ma: 1, mf: 3 });
    expect(small.warnings.join(" ")).toMatch(/small/);
    expect(Math.abs(scalarOf(small.results, "v1Peak") - 400)).toBeGreaterThan(4);
  });
});

describe("spwm: overmodulation (ma > 1)", () => {
  const hava = (ma: number) => (2 / Math.PI) * (ma * Math.asin(1 / ma) + Math.sqrt(1 - 1 / ma ** 2));

  it("warns and shows low-order harmonics", () => {
    const { results, warnings } = compute({ ma: 1.5, mf: 21 });
    expect(warnings.join(" ")).toMatch(/ma = 1.5 > 1: overmodulation — low-order harmonics appear/);
    expect(harmonicsOf(results).find((h) => h.n === 3)!.percent).toBeGreaterThan(1);
    expect(compute({ ma: 0.9, mf: 21 }).warnings).toEqual([]);
  });

  it("fundamental follows (2/π)·[ma·asin(1/ma) + √(1 − 1/ma²)] for large mf (Hava, Kerkman & Lipo, IEEE Trans. PE, 1998 — memory; derived)", () => {
    for (const ma of [1.2, 1.5, 2, 3, 4]) {
      const peak = scalarOf(compute({ vdc: 2, ma, mf: 401, bridge: "half", hmax: 10 }).results, "v1Peak");
      // The formula is the large-mf limit; with mf = 401 the switched wave is within ~2e-5 of it.
      expectClose(peak, hava(ma), { abs: 1e-4 }, `ma = ${ma}`);
    }
  });

  // Derived: as ma grows the pole voltage tends to the square wave, whose fundamental is 4/π·Vdc/2 (Mohan, Undeland &
  // Robbins, 3rd ed., ch. 8 — published); a finite ma still leaves switching inside the half cycle.
  it("fundamental rises with ma towards the square wave's 4/π·Vdc/2 but never reaches it", () => {
    const peaks = [1, 1.5, 2, 3, 4].map((ma) => scalarOf(compute({ vdc: 2, ma, mf: 201, bridge: "half", hmax: 10 }).results, "v1Peak"));
    for (let i = 1; i < peaks.length; i++) expect(peaks[i]!).toBeGreaterThan(peaks[i - 1]!);
    expect(peaks[peaks.length - 1]!).toBeLessThan(4 / Math.PI);
    expect(peaks[peaks.length - 1]!).toBeGreaterThan(0.98 * (4 / Math.PI));
  });
});

describe("spwm against an FFT of the synthesized comparator (fft.js, 2^16 cells, naturally sampled)", () => {
  // Written from the definition: each leg is high while its reference exceeds the carrier
  // (a triangle with a valley at 90°, written via asin∘cos); the output is built from the leg states.
  const cases: Case[] = [
    { ma: 0.8, mf: 21, bridge: "half" },
    { ma: 0.8, mf: 21 },
    { ma: 0.5, mf: 9 },
    { ma: 0.6, mf: 8 },
    { ma: 0.9, mf: 15, scheme: "unipolar" },
    { ma: 0.6, mf: 20, scheme: "unipolar" },
    { ma: 1.3, mf: 15 },
    { ma: 2.5, mf: 9, scheme: "unipolar" },
  ];
  it.each(cases)("%j: every harmonic to 400, the RMS, the THDs and the weighted THD agree", (c) => {
    const vdc = 100;
    const scheme = c.scheme ?? "bipolar";
    const scale = c.bridge === "half" ? vdc / 2 : vdc;
    const carrier = (t: number) => triangle(c.mf * (t - Math.PI / 2));
    const legA = comparatorCellFractions((t) => c.ma * Math.sin(t) - carrier(t));
    const legB = comparatorCellFractions((t) => -c.ma * Math.sin(t) - carrier(t));
    const cells = new Float64Array(legA.length);
    let meanSquare = 0;
    for (let j = 0; j < cells.length; j++) {
      if (scheme === "bipolar") {
        cells[j] = scale * (2 * legA[j]! - 1);
        meanSquare += scale ** 2;
      } else {
        // Leg A is high whenever leg B is in the positive half cycle (and the reverse), so |v| = |A − B| within a cell.
        cells[j] = scale * (legA[j]! - legB[j]!);
        meanSquare += scale ** 2 * Math.abs(legA[j]! - legB[j]!);
      }
    }
    const sampled = cellAveragedSpectrum(cells);
    const sampledRms = Math.sqrt(meanSquare / cells.length);
    const { results } = compute({ ...c, vdc, hmax: 400 });
    const table = harmonicsOf(results);
    // Cell averaging leaves aliasing of order 1e-6 of the level at N = 2^16.
    for (let n = 1; n <= 400; n++) expectClose(peakAt(table, n), sampled.peaks[n]!, { abs: 1e-5 * scale }, `order ${n}`);
    expectClose(scalarOf(results, "vrms"), sampledRms, { rel: 1e-6 });
    const fundamentalRms = sampled.peaks[1]! / Math.SQRT2;
    expectClose(scalarOf(results, "thd"), (100 * Math.sqrt(sampledRms ** 2 - fundamentalRms ** 2)) / fundamentalRms, { rel: 1e-5 });
    expectClose(scalarOf(results, "thd40"), sampledThdUpTo(sampled, 40), { rel: 1e-4, abs: 1e-4 });
    expectClose(scalarOf(results, "thd50"), sampledThdUpTo(sampled, 50), { rel: 1e-4, abs: 1e-4 });
    expectClose(scalarOf(results, "wthd"), sampledWeightedThd(sampled), { rel: 1e-5 });
  });
});

describe("spwm: non-integer mf (asynchronous carrier)", () => {
  it("lists lines at their own orders m·mf + n with the closed-form amplitudes, and warns", () => {
    const { results, warnings } = compute({ vdc: 2, ma: 0.8, mf: 20.5, bridge: "half", hmax: 60 });
    expect(warnings.join(" ")).toMatch(/not an integer.*odd integer for bipolar/);
    const table = harmonicsOf(results);
    expectClose(peakAt(table, 20.5), (4 / Math.PI) * Math.abs(besselJ(0, 0.4 * Math.PI)), { rel: 1e-12 });
    expectClose(peakAt(table, 22.5), (4 / Math.PI) * Math.abs(besselJ(2, 0.4 * Math.PI)), { rel: 1e-12 });
    expectClose(peakAt(table, 40), (2 / Math.PI) * Math.abs(besselJ(1, 0.8 * Math.PI)), { rel: 1e-12 });
    expectClose(table.find((h) => h.n === 20.5)!.frequency!, 1025);
    expectClose(scalarOf(results, "vrms"), 1, { rel: 1e-12 });
  });

  it("unipolar: RMS is the long-run value Vdc·√(2ma/π) (derived), close to the synchronous value for large mf", () => {
    const asynchronous = compute({ ma: 0.7, mf: 200.5, scheme: "unipolar" });
    expectClose(scalarOf(asynchronous.results, "vrms"), 400 * Math.sqrt((2 * 0.7) / Math.PI), { rel: 1e-12 });
    expect(asynchronous.warnings.join(" ")).toMatch(/integer mf keeps/);
    expectClose(scalarOf(compute({ ma: 0.7, mf: 200, scheme: "unipolar" }).results, "vrms"), scalarOf(asynchronous.results, "vrms"), { rel: 1e-3 });
  });

  it("in overmodulation computes for the nearest integer mf and says so", () => {
    const rounded = compute({ ma: 1.4, mf: 21.3 });
    expect(rounded.warnings.join(" ")).toMatch(/nearest synchronous ratio, mf = 21/);
    expectClose(scalarOf(rounded.results, "thd"), scalarOf(compute({ ma: 1.4, mf: 21 }).results, "thd"), { rel: 1e-12 });
  });
});

describe("spwm behaviour", () => {
  it("refuses unipolar switching on a half bridge, naming the fix", () => {
    expect(() => compute({ ma: 0.8, mf: 21, scheme: "unipolar", bridge: "half" })).toThrow(CalculationError);
    expect(() => compute({ ma: 0.8, mf: 21, scheme: "unipolar", bridge: "half" })).toThrow(/full bridge/);
  });

  it("refuses out-of-range inputs", () => {
    expect(() => compute({ ma: 0, mf: 21 })).toThrow(CalculationError);
    expect(() => compute({ ma: 4.5, mf: 21 })).toThrow(CalculationError);
    expect(() => compute({ ma: 0.8, mf: 2 })).toThrow(CalculationError);
    expect(() => run(calculator, { vdc: 400, ma: 0.8, mf: 21, scheme: "tripolar", bridge: "full", f: 50, hmax: 100 })).toThrow(/scheme/i);
  });

  it("warns when hmax stops below the switching harmonics", () => {
    expect(compute({ ma: 0.8, mf: 99, hmax: 49 }).warnings.join(" ")).toMatch(/raise hmax/);
    expect(compute({ ma: 0.8, mf: 21, hmax: 49 }).warnings).toEqual([]);
  });

  it("thd40 and thd50 leave out switching harmonics above order 50, thd counts them", () => {
    const { results } = compute({ ma: 0.8, mf: 99 });
    expect(scalarOf(results, "thd")).toBeGreaterThan(100);
    expect(scalarOf(results, "thd50")).toBeLessThan(1e-6);
  });

  it("plots the full-bridge bipolar output switching between +Vdc and −Vdc, 2·mf edges per cycle", () => {
    const points = waveformOf(compute({ vdc: 400, ma: 0.8, mf: 21 }).results);
    expect(new Set(points.map((p) => p.v))).toEqual(new Set([400, -400]));
    expect(points.length / 2 - 1).toBe(2 * 21);
    // At the reference's peak the carrier is at its valley: the output is high.
    expect(levelAfter(points, 90)).toBe(400);
  });

  it("plots the unipolar output on three levels, never against the reference's sign", () => {
    const points = waveformOf(compute({ vdc: 400, ma: 0.8, mf: 20, scheme: "unipolar" }).results);
    expect(new Set(points.map((p) => p.v))).toEqual(new Set([400, 0, -400]));
    for (const p of points) if (p.theta > 1 && p.theta < 179) expect(p.v).toBeGreaterThanOrEqual(0);
  });

  it("keeps Parseval and the THD ordering for any valid input, never NaN or ∞ (property)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e-6, max: 4, noNaN: true }),
        fc.oneof(fc.integer({ min: 3, max: 200 }), fc.double({ min: 3, max: 200, noNaN: true })),
        fc.constantFrom<[PwmScheme, "half" | "full"]>(["bipolar", "half"], ["bipolar", "full"], ["unipolar", "full"]),
        fc.integer({ min: 1, max: 600 }),
        (ma, mf, [scheme, bridge], hmax) => {
          const { results } = compute({ vdc: 400, ma, mf, scheme, bridge, hmax });
          expectAllFinite(results);
          const vrms = scalarOf(results, "vrms");
          const listed = harmonicsOf(results).reduce((sum, h) => sum + h.rms ** 2, 0);
          expect(listed).toBeLessThanOrEqual(vrms ** 2 * (1 + 1e-9));
          const thd = scalarOf(results, "thd");
          const thd50 = scalarOf(results, "thd50");
          expect(thd).toBeGreaterThanOrEqual(thd50 * (1 - 1e-9));
          expect(thd50).toBeGreaterThanOrEqual(scalarOf(results, "thd40"));
        },
      ),
      { numRuns: 150 },
    );
  });

  it("declares its public input and output keys, sources and cautions", () => {
    expect(calculator.id).toBe("spwm");
    expect(calculator.inputs.map((i) => i.key)).toEqual(["vdc", "ma", "mf", "scheme", "bridge", "f", "hmax"]);
    expect(calculator.outputs.map((o) => o.key)).toEqual(["v1Peak", "v1Rms", "vrms", "thd", "dc", "thd40", "thd50", "wthd", "harmonics", "waveform"]);
    expect(calculator.sources.join(" ")).toMatch(/Holmes & Lipo/);
    expect(calculator.cautions.join(" ")).toMatch(/kill|lethal/i);
  });
});
