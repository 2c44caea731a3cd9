import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { CalculationError } from "~/lib/calc/errors";
import { calculator } from "~/lib/calc/calculators/stepped-wave";
import { calculator as quasiSquare } from "~/lib/calc/calculators/quasi-square";
import { expectClose } from "../../../support/tolerance";
import { sampledSpectrum, sampledThd, sampledThdUpTo } from "../fft-reference";
import { expectAllFinite, harmonicsOf, levelAfter, peakAt, run, scalarOf, waveformOf } from "./run-calculator";

const compute = (vdc: number, angles: number[], hmax = 49, f = 50) => run(calculator, { vdc, angles, f, hmax });

/** The staircase written from its definition: the level counts the angles below θ, folded into the first quarter. */
function staircase(vdc: number, anglesDegrees: number[]) {
  const angles = anglesDegrees.map((a) => (a * Math.PI) / 180);
  return (theta: number) => {
    const inHalf = theta % Math.PI;
    const quarter = inHalf <= Math.PI / 2 ? inHalf : Math.PI - inHalf;
    const level = angles.filter((a) => a < quarter).length * vdc;
    return theta < Math.PI ? level : -level;
  };
}

describe("stepped wave: reduces to the published single-pulse cases", () => {
  it("one angle of 0 is the square wave: fundamental RMS 0.900316·Vdc, THD 48.3426 % (Mohan 3rd ed. ch. 8; Rashid 3rd ed. ch. 6 — published; THD derived)", () => {
    const { results } = compute(100, [0]);
    expectClose(scalarOf(results, "v1Rms"), 90.0316, { abs: 5e-5 });
    expectClose(scalarOf(results, "thd"), 48.3426, { abs: 5e-5 });
    expectClose(scalarOf(results, "thd40"), 47.03, { abs: 5e-3 });
    expectClose(scalarOf(results, "thd50"), 47.3, { abs: 5e-3 });
  });

  it("one angle α matches the quasi-square wave with zero interval α (Rashid 3rd ed. §6.6 — section from memory)", () => {
    for (const alpha of [7, 19, 30, 64]) {
      const stepped = compute(48, [alpha], 99).results;
      const single = run(quasiSquare, { vdc: 48, alpha, f: 50, hmax: 99 }).results;
      for (const key of ["vrms", "v1Peak", "thd", "thd40", "thd50"]) {
        expectClose(scalarOf(stepped, key), scalarOf(single, key), { rel: 1e-12 }, `${key} at ${alpha}°`);
      }
      const singleTable = harmonicsOf(single);
      harmonicsOf(stepped).forEach((h, i) => expectClose(h.peak, singleTable[i]!.peak, { rel: 1e-12, abs: 1e-12 }, `order ${h.n}`));
    }
  });
});

describe("stepped wave: harmonic cancellation by the angles (derived from V_n ∝ Σ cos nα_i)", () => {
  it("two steps at α and 36° − α remove the 5th (derived: cos 5α₂ = −cos 5α₁ in V_n ∝ Σ cos nα_i, Rashid, 3rd ed., ch. 6 — published)", () => {
    for (const alpha of [4, 10, 15]) {
      const table = harmonicsOf(compute(48, [alpha, 36 - alpha]).results);
      expect(peakAt(table, 5), `α₁ = ${alpha}°`).toBe(0);
      expect(peakAt(table, 7)).toBeGreaterThan(0.01);
    }
  });

  it("three steps at 10°, 30°, 50° remove the 3rd, 9th and 15th (derived: cos 3α sums to zero)", () => {
    const table = harmonicsOf(compute(48, [10, 30, 50], 49).results);
    // cos 30° + cos 90° + cos 150° = 0, and likewise for 9th and 15th.
    for (const n of [3, 9, 15]) expect(peakAt(table, n), `order ${n}`).toBe(0);
  });
});

describe("stepped wave against an FFT of the synthesized staircase (fft.js, 2^16 points)", () => {
  const angleSets: number[][] = [
    [0],
    [12, 44],
    [9.59, 30, 56.44],
    [5, 5, 40],
    [3, 17, 29, 41, 58, 77],
  ];
  it.each(angleSets)("angles %j: every harmonic to 199, the RMS and the three THDs agree", (...angles) => {
    const vdc = 30;
    const sampled = sampledSpectrum(staircase(vdc, angles));
    const { results } = compute(vdc, angles, 199);
    const table = harmonicsOf(results);
    // Each of the 4k unit jumps moves by ≤ π/N under sampling: harmonics shift by ≤ 4k·Vdc/N.
    const jumps = 4 * angles.length;
    for (let n = 1; n <= 199; n++) expectClose(peakAt(table, n), sampled.peaks[n]!, { abs: (jumps * vdc) / 2 ** 16 }, `order ${n}`);
    expect(table.some((h) => h.n % 2 === 0)).toBe(false);
    for (let n = 2; n <= 198; n += 2) expect(sampled.peaks[n]!).toBeLessThan((jumps * vdc) / 2 ** 16);
    const peakLevel = angles.length * vdc;
    expectClose(scalarOf(results, "vrms") ** 2, sampled.rms ** 2, { abs: (jumps * peakLevel * vdc) / 2 ** 16 });
    expectClose(scalarOf(results, "thd"), sampledThd(sampled), { rel: 2e-3 });
    expectClose(scalarOf(results, "thd40"), sampledThdUpTo(sampled, 40), { rel: 2e-3 });
    expectClose(scalarOf(results, "thd50"), sampledThdUpTo(sampled, 50), { rel: 2e-3 });
  });
});

describe("stepped wave behaviour", () => {
  it("plots the staircase: one step per angle up to k·Vdc, mirrored about 90° and in the negative half", () => {
    const points = waveformOf(compute(10, [10, 30, 50]).results);
    expect([5, 20, 40, 70, 100, 160, 175].map((t) => levelAfter(points, t))).toEqual([0, 10, 20, 30, 30, 10, 0]);
    expect([185, 200, 250, 355].map((t) => levelAfter(points, t))).toEqual([0, -10, -30, 0]);
  });

  it("sorts angles given out of order, and says so", () => {
    const sorted = compute(48, [10, 30, 50]);
    const shuffled = compute(48, [50, 10, 30]);
    expect(shuffled.warnings.join(" ")).toMatch(/ascending/);
    expect(sorted.warnings).toEqual([]);
    expectClose(scalarOf(shuffled.results, "thd"), scalarOf(sorted.results, "thd"), { rel: 1e-12 });
  });

  it("warns when angles coincide (a jump of more than one level)", () => {
    expect(compute(48, [5, 5, 40]).warnings.join(" ")).toMatch(/equal/);
  });

  it("refuses angles at or above 90°, an empty list and non-numbers", () => {
    expect(() => compute(48, [10, 90])).toThrow(CalculationError);
    expect(() => compute(48, [])).toThrow(/at least 1/);
    expect(() => run(calculator, { vdc: 48, angles: "10, 20", f: 50, hmax: 49 })).toThrow(CalculationError);
    expect(() => compute(48, [-1])).toThrow(CalculationError);
  });

  it("keeps Parseval and the THD ordering for any valid angle set, never NaN or ∞ (property)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e-3, max: 1e6, noNaN: true }),
        fc.array(fc.double({ min: 0, max: 89.99, noNaN: true }), { minLength: 1, maxLength: 12 }),
        fc.integer({ min: 1, max: 300 }),
        (vdc, angles, hmax) => {
          const { results } = compute(vdc, angles, hmax);
          expectAllFinite(results);
          const vrms = scalarOf(results, "vrms");
          const listed = harmonicsOf(results).reduce((sum, h) => sum + h.rms ** 2, 0);
          expect(listed).toBeLessThanOrEqual(vrms ** 2 * (1 + 1e-12));
          expect(scalarOf(results, "thd")).toBeGreaterThanOrEqual(scalarOf(results, "thd50") * (1 - 1e-12));
          expect(scalarOf(results, "thd50")).toBeGreaterThanOrEqual(scalarOf(results, "thd40"));
        },
      ),
      { numRuns: 200 },
    );
  });

  it("declares its public input and output keys, sources and cautions", () => {
    expect(calculator.id).toBe("stepped-wave");
    expect(calculator.inputs.map((i) => i.key)).toEqual(["vdc", "angles", "f", "hmax"]);
    expect(calculator.outputs.map((o) => o.key)).toEqual(["vrms", "v1Peak", "v1Rms", "thd", "thd40", "thd50", "harmonics", "waveform"]);
    expect(calculator.cautions.join(" ")).toMatch(/kill|lethal/i);
  });
});
