import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { CalculationError } from "~/lib/calc/errors";
import { calculator } from "~/lib/calc/calculators/six-step";
import { expectClose } from "../../../support/tolerance";
import { sampledSpectrum, sampledThd, sampledThdUpTo } from "../fft-reference";
import { expectAllFinite, harmonicsOf, levelAfter, peakAt, run, scalarOf, waveformOf } from "./run-calculator";

const compute = (vdc: number, hmax = 49, f = 50) => run(calculator, { vdc, f, hmax });

/** Pole voltage of a leg conducting 180°, to the DC midpoint, with phase shift `lag` (radians). */
const pole = (vdc: number, theta: number, lag: number) => {
  const phase = (((theta - lag) % (2 * Math.PI)) + 2 * Math.PI) % (2 * Math.PI);
  return phase < Math.PI ? vdc / 2 : -vdc / 2;
};

describe("six-step: published values (Mohan, Undeland & Robbins, 3rd ed., §8-6; Rashid, 3rd ed., §6.5 — published, section numbers from memory)", () => {
  const vdc = 600;
  const { results } = compute(vdc, 97);

  it("V_LL,rms = √(2/3)·Vdc and V_LL1,rms = (√6/π)·Vdc = 0.779697·Vdc", () => {
    expectClose(scalarOf(results, "vllRms"), Math.sqrt(2 / 3) * vdc, { rel: 1e-12 });
    expectClose(scalarOf(results, "vll1Rms") / vdc, 0.779697, { abs: 5e-7 });
  });

  it("V_LN,rms = (√2/3)·Vdc for a balanced Y load, and V_LN1 = V_LL1/√3", () => {
    expectClose(scalarOf(results, "vlnRms"), (Math.SQRT2 / 3) * vdc, { rel: 1e-12 });
    expectClose(scalarOf(results, "vln1Rms"), scalarOf(results, "vll1Rms") / Math.sqrt(3), { rel: 1e-12 });
  });

  it("has harmonics only at 6k ± 1 with V_n/V_1 = 1/n", () => {
    const table = harmonicsOf(results);
    expect(table.map((h) => h.n)).toEqual([1, 5, 7, 11, 13, 17, 19, 23, 25, 29, 31, 35, 37, 41, 43, 47, 49, 53, 55, 59, 61, 65, 67, 71, 73, 77, 79, 83, 85, 89, 91, 95, 97]);
    for (const h of table.slice(1)) expectClose(h.percent, 100 / h.n, { rel: 1e-12 }, `order ${h.n}`);
  });

  // Published (Mohan, Undeland & Robbins, 3rd ed., §8-6); also derived: Σ(1/n)² over 6k ± 1 = π²/9 − 1.
  it("has THD √(π²/9 − 1) = 31.084 % over all harmonics (published; derived)", () => {
    expectClose(scalarOf(results, "thd"), 31.084, { abs: 5e-4 });
    expectClose(scalarOf(results, "thd"), 100 * Math.sqrt(Math.PI ** 2 / 9 - 1), { rel: 1e-12 });
  });

  it("truncated THDs sum the 6k ± 1 lines (1/n)² up to 40 and 50 (derived)", () => {
    const upTo = (limit: number) => {
      let sum = 0;
      for (let n = 5; n <= limit; n++) if (n % 6 === 1 || n % 6 === 5) sum += 1 / n ** 2;
      return 100 * Math.sqrt(sum);
    };
    expectClose(scalarOf(results, "thd40"), upTo(40), { rel: 1e-12 });
    expectClose(scalarOf(results, "thd50"), upTo(50), { rel: 1e-12 });
    expect(scalarOf(results, "thd40")).toBeLessThan(scalarOf(results, "thd50"));
  });
});

describe("six-step against an FFT of the synthesized three-phase bridge (fft.js, 2^16 points)", () => {
  const vdc = 540;
  const a = (t: number) => pole(vdc, t, 0);
  const b = (t: number) => pole(vdc, t, (2 * Math.PI) / 3);
  const c = (t: number) => pole(vdc, t, (4 * Math.PI) / 3);
  const { results } = compute(vdc, 199);

  it("line-to-line v_ab = v_a0 − v_b0: every harmonic to 199 and the three THDs agree", () => {
    const sampled = sampledSpectrum((t) => a(t) - b(t));
    const table = harmonicsOf(results);
    // Four jumps of Vdc in v_ab, each moved ≤ π/N by sampling: ≤ 4·Vdc/N per harmonic.
    const bound = (4 * vdc) / 2 ** 16;
    for (let n = 1; n <= 199; n++) expectClose(peakAt(table, n), sampled.peaks[n]!, { abs: bound }, `order ${n}`);
    expectClose(scalarOf(results, "vllRms") ** 2, sampled.rms ** 2, { abs: (2 * vdc ** 2) / 2 ** 16 });
    expectClose(scalarOf(results, "thd"), sampledThd(sampled), { rel: 1e-3 });
    expectClose(scalarOf(results, "thd40"), sampledThdUpTo(sampled, 40), { rel: 5e-4 });
    expectClose(scalarOf(results, "thd50"), sampledThdUpTo(sampled, 50), { rel: 5e-4 });
  });

  it("line-to-neutral v_an = (2v_a0 − v_b0 − v_c0)/3 of a balanced Y load: RMS and fundamental agree", () => {
    const sampled = sampledSpectrum((t) => (2 * a(t) - b(t) - c(t)) / 3);
    expectClose(scalarOf(results, "vlnRms") ** 2, sampled.rms ** 2, { abs: (2 * vdc ** 2) / 2 ** 16 });
    expectClose(scalarOf(results, "vln1Rms"), sampled.peaks[1]! / Math.SQRT2, { abs: (6 * vdc) / 2 ** 16 });
    expectClose(sampledThd(sampled), scalarOf(results, "thd"), { rel: 1e-3 });
  });
});

describe("six-step behaviour", () => {
  it("plots v_ab: +Vdc from 30° to 150°, −Vdc from 210° to 330°, zero between", () => {
    const points = waveformOf(compute(600).results);
    expect([15, 90, 165, 195, 270, 345].map((t) => levelAfter(points, t))).toEqual([0, 600, 0, 0, -600, 0]);
  });

  it("gives each harmonic its frequency n·f", () => {
    const table = harmonicsOf(compute(600, 49, 60).results);
    expectClose(table.find((h) => h.n === 5)!.frequency!, 300);
  });

  it("refuses a non-positive DC link and a fractional hmax", () => {
    expect(() => compute(0)).toThrow(CalculationError);
    expect(() => compute(600, 7.5)).toThrow(CalculationError);
  });

  it("keeps Parseval and the THD ordering for any valid input, never NaN or ∞ (property)", () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-3, max: 1e6, noNaN: true }), fc.integer({ min: 1, max: 5000 }), (vdc, hmax) => {
        const { results } = compute(vdc, hmax);
        expectAllFinite(results);
        const listed = harmonicsOf(results).reduce((sum, h) => sum + h.rms ** 2, 0);
        expect(listed).toBeLessThanOrEqual(scalarOf(results, "vllRms") ** 2 * (1 + 1e-12));
        expect(scalarOf(results, "thd")).toBeGreaterThanOrEqual(scalarOf(results, "thd50"));
        expect(scalarOf(results, "thd50")).toBeGreaterThanOrEqual(scalarOf(results, "thd40"));
      }),
      { numRuns: 100 },
    );
  });

  it("declares its public input and output keys and cautions", () => {
    expect(calculator.id).toBe("six-step");
    expect(calculator.inputs.map((i) => i.key)).toEqual(["vdc", "f", "hmax"]);
    expect(calculator.outputs.map((o) => o.key)).toEqual(["vllRms", "vll1Rms", "vlnRms", "vln1Rms", "thd", "thd40", "thd50", "harmonics", "waveform"]);
    expect(calculator.cautions.join(" ")).toMatch(/kill|lethal/i);
  });
});
