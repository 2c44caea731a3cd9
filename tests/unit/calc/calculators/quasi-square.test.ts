import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { CalculationError } from "~/lib/calc/errors";
import { calculator } from "~/lib/calc/calculators/quasi-square";
import { expectClose } from "../../../support/tolerance";
import { sampledSpectrum, sampledThd, sampledThdUpTo } from "../fft-reference";
import { expectAllFinite, harmonicsOf, levelAfter, peakAt, run, scalarOf, waveformOf } from "./run-calculator";

const compute = (vdc: number, alpha: number, hmax = 49, f = 50) => run(calculator, { vdc, alpha, f, hmax });

describe("quasi-square: square wave (α = 0)", () => {
  const { results } = compute(100, 0, 99);
  const table = harmonicsOf(results);

  it("has harmonic peaks 4·Vdc/(nπ) at odd n (Mohan, Undeland & Robbins, 3rd ed., ch. 8; Rashid, 3rd ed., ch. 6 — published)", () => {
    for (let n = 1; n <= 99; n += 2) expectClose(peakAt(table, n), (4 * 100) / (n * Math.PI), { rel: 1e-12 }, `order ${n}`);
    expect(table.some((h) => h.n % 2 === 0)).toBe(false);
  });

  it("has fundamental RMS 0.900316·Vdc (Mohan 3rd ed. ch. 8; Rashid 3rd ed. ch. 6 — published)", () => {
    expectClose(scalarOf(results, "v1Rms"), 90.0316, { abs: 5e-5 });
    expectClose(scalarOf(results, "vrms"), 100, { rel: 1e-12 });
  });

  // Derived: Vrms = Vdc and V1,rms = 2√2·Vdc/π, so THD = √(π²/8 − 1).
  it("has THD √(π²/8 − 1) = 48.3426 % over all harmonics (derived from the series)", () => {
    expectClose(scalarOf(results, "thd"), 48.3426, { abs: 5e-5 });
  });

  // Derived: √(Σ 1/n², odd n = 3 … 39 or 49); the orders counted are those of IEC 61000-3-2 (to 40) and IEEE Std 519-2014 (to 50) — published.
  it("has THD 47.03 % to order 40 and 47.30 % to order 50 (derived from the series)", () => {
    expectClose(scalarOf(results, "thd40"), 47.03, { abs: 5e-3 });
    expectClose(scalarOf(results, "thd50"), 47.3, { abs: 5e-3 });
  });
});

describe("quasi-square: zero interval α", () => {
  it("has Vrms = Vdc·√(1 − 2α/π) and peaks (4Vdc/nπ)·cos(nα) (Rashid, 3rd ed., §6.6 single-pulse modulation — published; α convention and section: memory)", () => {
    for (const alphaDeg of [5, 17.5, 30, 41, 60, 77]) {
      const alpha = (alphaDeg * Math.PI) / 180;
      const { results } = compute(48, alphaDeg, 49);
      expectClose(scalarOf(results, "vrms"), 48 * Math.sqrt(1 - (2 * alpha) / Math.PI), { rel: 1e-12 }, `Vrms at ${alphaDeg}°`);
      const table = harmonicsOf(results);
      for (let n = 1; n <= 49; n += 2) {
        expectClose(peakAt(table, n), Math.abs(((4 * 48) / (n * Math.PI)) * Math.cos(n * alpha)), { rel: 1e-12, abs: 1e-12 }, `order ${n} at ${alphaDeg}°`);
      }
    }
  });

  it("removes the 3rd and its odd multiples at α = 30° (derived from cos nα = 0)", () => {
    const table = harmonicsOf(compute(48, 30, 99).results);
    for (const n of [3, 9, 15, 21, 27, 33, 39, 45]) expect(peakAt(table, n), `order ${n}`).toBe(0);
    expect(peakAt(table, 5)).toBeGreaterThan(1);
  });

  it("at α = 30° from 48 V: V1 = 52.93 V peak, Vrms = 39.19 V, each order 6k ± 1 at 1/n, THD √(π²/9 − 1) = 31.084 % (derived)", () => {
    // Derived from the formulas above: cos 30° = √3/2, so V1 = 2√3·48/π; Vrms = 48·√(2/3); |cos(n·30°)| = √3/2 for n = 6k ± 1.
    const { results } = compute(48, 30, 49);
    expectClose(scalarOf(results, "v1Peak"), (2 * Math.sqrt(3) * 48) / Math.PI, { rel: 1e-12 });
    expectClose(scalarOf(results, "vrms"), 48 * Math.sqrt(2 / 3), { rel: 1e-12 });
    expectClose(scalarOf(results, "thd"), 100 * Math.sqrt(Math.PI ** 2 / 9 - 1), { rel: 1e-12 });
    const table = harmonicsOf(results);
    for (const n of [5, 7, 11, 13, 17, 19]) expectClose(table.find((h) => h.n === n)!.percent, 100 / n, { rel: 1e-9 }, `order ${n}`);
  });

  it("removes harmonic n at α = 90°/n (derived)", () => {
    for (const n of [5, 7, 11]) {
      const table = harmonicsOf(compute(48, 90 / n, 49).results);
      expect(peakAt(table, n), `order ${n}`).toBe(0);
      expect(peakAt(table, 3)).toBeGreaterThan(0.1);
    }
  });

  // Derived: THD² = (π − 2α)/(π·(8/π²)·cos²α) − 1 is least where (π − 2α)·tan α = 1, i.e. α = 23.218°, THD 28.964 %.
  // "About 22.5°" as the angle of least THD: common practice, no source.
  it("reports the least-THD angle 23.218° with THD 28.964 %, and 28.988 % at 22.5° (derived; 22.5°: common practice, no source)", () => {
    const { results } = compute(48, 22.5);
    expectClose(scalarOf(results, "alphaMinThd"), 23.218, { abs: 5e-4 });
    expectClose(scalarOf(results, "thdMin"), 28.964, { abs: 5e-4 });
    expectClose(scalarOf(results, "thd"), 28.988, { abs: 5e-4 });
  });

  it("the reported least-THD angle really gives less THD than its neighbours", () => {
    const best = scalarOf(compute(48, 0).results, "alphaMinThd");
    const thdAt = (a: number) => scalarOf(compute(48, a).results, "thd");
    expectClose(thdAt(best), scalarOf(compute(48, 0).results, "thdMin"), { rel: 1e-12 });
    expect(thdAt(best)).toBeLessThan(thdAt(best - 0.5));
    expect(thdAt(best)).toBeLessThan(thdAt(best + 0.5));
  });
});

describe("quasi-square against an FFT of the synthesized wave (fft.js, 2^16 points)", () => {
  it.each([0, 10, 20, 30, 60, 85])("α = %d°: every harmonic to 199, the RMS and the three THDs agree", (alphaDeg) => {
    const vdc = 48;
    const alpha = (alphaDeg * Math.PI) / 180;
    // Written from the definition: +Vdc for α < θ < π − α, −Vdc for π + α < θ < 2π − α.
    const wave = (theta: number) => {
      const inHalf = theta % Math.PI;
      const on = inHalf > alpha && inHalf < Math.PI - alpha ? vdc : 0;
      return theta < Math.PI ? on : -on;
    };
    const sampled = sampledSpectrum(wave);
    const { results } = compute(vdc, alphaDeg, 199);
    const table = harmonicsOf(results);
    // Sampling moves each edge by up to π/N, which shifts any harmonic by at most jump/N:
    // four jumps of Vdc give 4·Vdc/N ≈ 6e-5·Vdc at N = 2^16.
    const bound = (4 * vdc) / 2 ** 16;
    for (let n = 1; n <= 199; n++) expectClose(peakAt(table, n), sampled.peaks[n]!, { abs: bound }, `order ${n}`);
    // Each edge moves by ≤ π/N, so the mean square moves by ≤ 4·(π/N)·Vdc²/(2π) = 2·Vdc²/N.
    expectClose(scalarOf(results, "vrms") ** 2, sampled.rms ** 2, { abs: (2 * vdc ** 2) / 2 ** 16 });
    expectClose(scalarOf(results, "thd"), sampledThd(sampled), { rel: 1e-3 });
    expectClose(scalarOf(results, "thd40"), sampledThdUpTo(sampled, 40), { rel: 5e-4 });
    expectClose(scalarOf(results, "thd50"), sampledThdUpTo(sampled, 50), { rel: 5e-4 });
  });
});

describe("quasi-square behaviour", () => {
  it("scales voltages with Vdc and leaves percentages unchanged", () => {
    const low = compute(48, 30).results;
    const high = compute(480, 30).results;
    expectClose(scalarOf(high, "v1Peak"), 10 * scalarOf(low, "v1Peak"), { rel: 1e-12 });
    expectClose(scalarOf(high, "thd"), scalarOf(low, "thd"), { rel: 1e-12 });
    const lowTable = harmonicsOf(low);
    harmonicsOf(high).forEach((h, i) => expectClose(h.percent, lowTable[i]!.percent, { rel: 1e-12, abs: 1e-12 }, `order ${h.n}`));
  });

  it("lists the fundamental first at 100 %, then odd orders to hmax, each with its frequency n·f", () => {
    const table = harmonicsOf(compute(48, 30, 15, 60).results);
    expect(table.map((h) => h.n)).toEqual([1, 3, 5, 7, 9, 11, 13, 15]);
    expect(table[0]!.percent).toBe(100);
    expectClose(table[3]!.frequency!, 420);
  });

  it("plots one cycle: zero, then +Vdc from α to 180° − α, then −Vdc from 180° + α to 360° − α", () => {
    const points = waveformOf(compute(48, 30).results);
    expect(points[0]!.theta).toBe(0);
    expect(points[points.length - 1]!.theta).toBe(360);
    expect(levelAfter(points, 25)).toBe(0);
    expect(levelAfter(points, 35)).toBe(48);
    expect(levelAfter(points, 90)).toBe(48);
    expect(levelAfter(points, 170)).toBe(0);
    expect(levelAfter(points, 270)).toBe(-48);
    expect(levelAfter(points, 350)).toBe(0);
  });

  it("warns when α leaves almost no fundamental", () => {
    expect(compute(48, 30).warnings).toEqual([]);
    expect(compute(48, 85).warnings.join(" ")).toMatch(/fundamental/);
  });

  it("refuses inputs outside the declared ranges with a field error", () => {
    expect(() => compute(48, 90)).toThrow(CalculationError);
    expect(() => compute(48, -1)).toThrow(/alpha|α/);
    expect(() => compute(0, 30)).toThrow(CalculationError);
    expect(() => compute(48, 30, 10.5)).toThrow(/whole number/);
    expect(() => run(calculator, { vdc: 48, alpha: Number.NaN, f: 50, hmax: 49 })).toThrow(CalculationError);
  });

  it("keeps Parseval and the THD ordering for any valid input, and never returns NaN or ∞ (property)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e-3, max: 1e6, noNaN: true }),
        fc.double({ min: 0, max: 89.999, noNaN: true }),
        fc.integer({ min: 1, max: 400 }),
        (vdc, alpha, hmax) => {
          const { results } = compute(vdc, alpha, hmax);
          expectAllFinite(results);
          const vrms = scalarOf(results, "vrms");
          const listed = harmonicsOf(results).reduce((sum, h) => sum + h.rms ** 2, 0);
          expect(listed).toBeLessThanOrEqual(vrms ** 2 * (1 + 1e-12));
          const thd = scalarOf(results, "thd");
          const thd50 = scalarOf(results, "thd50");
          const thd40 = scalarOf(results, "thd40");
          expect(thd).toBeGreaterThanOrEqual(thd50 * (1 - 1e-12));
          expect(thd50).toBeGreaterThanOrEqual(thd40);
        },
      ),
      { numRuns: 200 },
    );
  });

  it("declares its public input and output keys, formulas, sources and cautions", () => {
    expect(calculator.id).toBe("quasi-square");
    expect(calculator.inputs.map((i) => i.key)).toEqual(["vdc", "alpha", "f", "hmax"]);
    expect(calculator.outputs.map((o) => o.key)).toEqual([
      "vrms", "v1Peak", "v1Rms", "thd", "thd40", "thd50", "harmonics", "alphaMinThd", "thdMin", "waveform",
    ]);
    expect(calculator.sources.join(" ")).toMatch(/Rashid/);
    expect(calculator.cautions.join(" ")).toMatch(/kill|lethal/i);
  });
});
