import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  harmonicTable,
  linesFromOrders,
  sampleCycle,
  steppedCycle,
  steppedCycleFourier,
  steppedCycleMoments,
  steppedCyclePoints,
  steppedCycleWeightedThd,
  thdFromRms,
  thdUpTo,
  weightedThdFromLines,
} from "~/lib/calc/spectrum";
import { expectClose } from "../../support/tolerance";
import { sampledSpectrum } from "./fft-reference";

/** ±1 square wave: +1 on (0, π), −1 on (π, 2π). */
const square = steppedCycle([0, Math.PI], [1, -1]);

describe("harmonic table", () => {
  it("puts the fundamental first at 100 % and expresses the rest as % of the fundamental (THD_F, IEEE Std 519-2014 definitions)", () => {
    const table = harmonicTable(10, [
      { n: 3, peak: 2 },
      { n: 5, peak: 1 },
    ], 49, 50);
    expect(table.map((h) => h.n)).toEqual([1, 3, 5]);
    expectClose(table[0]!.percent, 100);
    expectClose(table[1]!.percent, 20);
    expectClose(table[1]!.rms, 2 / Math.SQRT2);
    expectClose(table[2]!.frequency!, 250);
  });

  it("stops at hmax and skips DC and the fundamental among the lines", () => {
    const table = harmonicTable(1, [
      { n: 0, peak: 0.3 },
      { n: 1, peak: 0.9 },
      { n: 3, peak: 0.1 },
      { n: 51, peak: 0.1 },
    ], 49);
    expect(table.map((h) => h.n)).toEqual([1, 3]);
    expect(table[0]!.frequency).toBeUndefined();
  });

  it("shows rounding noise (below 1e-12 of the fundamental) as exactly 0", () => {
    const table = harmonicTable(1, [{ n: 3, peak: 3e-17 }, { n: 5, peak: 1e-9 }], 49);
    expect(table[1]!.peak).toBe(0);
    expect(table[2]!.peak).toBe(1e-9);
  });

  it("keeps only the orders a symmetry allows", () => {
    const lines = linesFromOrders([0, 1, 0.5, 0.3, 0.25, 0.2], (n) => n % 2 === 1);
    expect(lines.map((l) => l.n)).toEqual([3, 5]);
  });
});

describe("THD arithmetic", () => {
  it("THD from the RMS identity equals THD from the lines when all lines are given", () => {
    // V1 = 1, V3 = 0.3, V5 = 0.4 (peaks): THD = √(0.3² + 0.4²)/1 = 50 % (derived from the definition).
    const lines = [{ n: 3, peak: 0.3 }, { n: 5, peak: 0.4 }];
    const totalRms = Math.sqrt((1 + 0.09 + 0.16) / 2);
    expectClose(thdFromRms(totalRms, 1 / Math.SQRT2), 50, { rel: 1e-12 });
    expectClose(thdUpTo(1, lines, 50), 50, { rel: 1e-12 });
    expectClose(thdUpTo(1, lines, 4), 30, { rel: 1e-12 });
  });

  it("gives 0 for a pure sine even when rounding makes Vrms a hair below V1rms", () => {
    expect(thdFromRms(0.7071067811865475, 0.7071067811865476)).toBe(0);
  });

  it("weights each line by 1/n for WTHD (Holmes & Lipo 2003, ch. 3 definition — section from memory)", () => {
    expectClose(weightedThdFromLines(1, [{ n: 3, peak: 0.3 }, { n: 5, peak: 0.5 }]), 100 * Math.sqrt(0.01 + 0.01), { rel: 1e-12 });
  });
});

describe("stepped-cycle Fourier", () => {
  it("reproduces the square wave's series 4/(nπ) for odd n, zero for even n (Mohan, Undeland & Robbins, 3rd ed., ch. 8 — published)", () => {
    const { a, b } = steppedCycleFourier(square, 301);
    for (let n = 1; n <= 301; n++) {
      expectClose(a[n]!, 0, { abs: 1e-13 }, `a_${n}`);
      expectClose(b[n]!, n % 2 === 1 ? 4 / (n * Math.PI) : 0, { abs: 1e-13 }, `b_${n}`);
    }
  });

  it("matches an FFT (fft.js) of an arbitrary stepped wave at every order to 200", () => {
    const wave = steppedCycle([0, 0.4, 1.1, 2.9, 3.3, 5.0], [0.5, 2, -1, 0, 1.5, -0.25]);
    const levelAt = (theta: number) => {
      let level = wave.levels[0]!;
      for (let k = 0; k < wave.edges.length; k++) if (theta >= wave.edges[k]!) level = wave.levels[k]!;
      return level;
    };
    const sampled = sampledSpectrum(levelAt);
    const { a, b } = steppedCycleFourier(wave, 200);
    const { mean, rms } = steppedCycleMoments(wave);
    expectClose(mean, sampled.mean, { abs: 1e-4 });
    expectClose(rms, sampled.rms, { abs: 1e-4 });
    // Point sampling of a wave with jumps aliases by O(jumps/N): 2e-4 of the largest jump at N = 2^16.
    for (let n = 1; n <= 200; n++) expectClose(Math.hypot(a[n]!, b[n]!), sampled.peaks[n]!, { abs: 2e-4 }, `order ${n}`);
  });

  it("gives the square wave's weighted THD √(π⁴/96 − 1) with no truncation (derived from Σ odd 1/n⁴ = π⁴/96)", () => {
    expectClose(steppedCycleWeightedThd(square, 4 / Math.PI), 100 * Math.sqrt(Math.PI ** 4 / 96 - 1), { rel: 1e-10 });
  });

  it("weighted THD of a stepped cycle equals the weighted sum of its own Fourier lines (property)", () => {
    fc.assert(
      fc.property(
        fc.uniqueArray(fc.double({ min: 0.01, max: 6.2, noNaN: true }), { minLength: 1, maxLength: 6 }),
        fc.array(fc.double({ min: -2, max: 2, noNaN: true }), { minLength: 7, maxLength: 7 }),
        (cuts, levels) => {
          const starts = [0, ...cuts.sort((p, q) => p - q)];
          const wave = steppedCycle(starts, levels.slice(0, starts.length));
          const { a, b } = steppedCycleFourier(wave, 4000);
          const fundamental = Math.hypot(a[1]!, b[1]!);
          fc.pre(fundamental > 0.05);
          const lines = [];
          for (let n = 2; n <= 4000; n++) lines.push({ n, peak: Math.hypot(a[n]!, b[n]!) });
          // The series beyond order 4000 adds < 1e-5 relative (lines fall as 1/n, weighted 1/n²).
          expectClose(steppedCycleWeightedThd(wave, fundamental), weightedThdFromLines(fundamental, lines), { rel: 1e-4, abs: 1e-9 });
        },
      ),
      { numRuns: 40 },
    );
  });

  it("merges equal neighbours and drops zero-width segments", () => {
    const wave = steppedCycle([0, 0, 1, 2, 2], [5, 1, 1, 3, 0]);
    expect(Array.from(wave.edges)).toEqual([0, 2]);
    expect(Array.from(wave.levels)).toEqual([1, 0]);
  });
});

describe("plot points", () => {
  it("draws vertical switching edges: two points per edge, in degrees, scaled", () => {
    const points = steppedCyclePoints(square, 48);
    expect(points).toEqual([
      { theta: 0, v: 48 },
      { theta: 180, v: 48 },
      { theta: 180, v: -48 },
      { theta: 360, v: -48 },
    ]);
  });

  it("samples one cycle from 0° to 360° inclusive", () => {
    const points = sampleCycle(Math.sin, 5);
    expect(points.map((p) => p.theta)).toEqual([0, 90, 180, 270, 360]);
    expectClose(points[1]!.v, 1);
    expectClose(points[3]!.v, -1);
  });
});
