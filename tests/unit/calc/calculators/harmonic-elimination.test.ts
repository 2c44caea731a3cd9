import { describe, expect, it } from "vitest";
import { calculator, type EliminationWave } from "~/lib/calc/calculators/harmonic-elimination";
import { calculator as steppedWave } from "~/lib/calc/calculators/stepped-wave";
import { expectClose } from "../../../support/tolerance";
import { sampledSpectrum } from "../fft-reference";
import { expectAllFinite, harmonicsOf, peakAt, run } from "./run-calculator";
import { refuse, run as evaluate, valueOf } from "./run-helpers";

const compute = (wave: EliminationWave, m: number, eliminate: number[], pick = 1, vdc = 48, hmax = 99) =>
  run(calculator, { vdc, wave, m, eliminate, pick, f: 50, hmax });
const anglesOf = (results: ReturnType<typeof compute>["results"]) =>
  [1, 2, 3, 4, 5, 6].map((i) => results[`alpha${i}`] as { value: number } | undefined).filter((r) => r !== undefined).map((r) => r.value);

/** The wave written from its definition: in the first quarter, the level after `count` angles; mirrored and negated. */
function synthesize(wave: EliminationWave, vdc: number, anglesDegrees: number[]) {
  const angles = anglesDegrees.map((a) => (a * Math.PI) / 180);
  const k = angles.length;
  return (theta: number) => {
    const inHalf = theta % Math.PI;
    const quarter = inHalf <= Math.PI / 2 ? inHalf : Math.PI - inHalf;
    const count = angles.filter((a) => a < quarter).length;
    let level: number;
    if (wave === "stepped") level = count;
    else if (wave === "three-level") level = count % 2;
    else level = (k % 2 === 1 ? -1 : 1) * (count % 2 === 0 ? 1 : -1);
    return (theta < Math.PI ? level : -level) * vdc;
  };
}

describe("harmonic elimination: the two-step staircase without its 3rd, in closed form", () => {
  // cos 3α = 4cos³α − 3cos α turns cos 3α₁ + cos 3α₂ = 0, cos α₁ + cos α₂ = 2m into: cos α₁, cos α₂ are the roots of
  // x² − s·x + (4s² − 3)/12 with s = 2m (the resultant method of Chiasson et al., IEEE Trans. Power Electronics 2004,
  // from memory; the algebra is derived). Real roots in [0, 1] need √3/2 ≤ s ≤ √3: 0.433 ≤ m ≤ 0.866.
  it.each([0.45, 0.5, 0.6, 0.7, 0.8, 0.86])("m = %s: the one solution, to 1e-9°", (m) => {
    const s = 2 * m;
    const p = (4 * s * s - 3) / 12;
    const root = Math.sqrt(s * s - 4 * p);
    const expected = [Math.acos((s + root) / 2), Math.acos((s - root) / 2)].map((a) => (a * 180) / Math.PI);
    const { results } = compute("stepped", m, [3]);
    expect(results.solved).toBe(true);
    expect(valueOf(results, "solutionCount")).toBe(1);
    anglesOf(results).forEach((alpha, i) => expectClose(alpha, expected[i]!, { abs: 1e-9 }, `α${i + 1}`));
  });

  it.each([0.3, 0.42, 0.9, 0.95])("m = %s is outside 0.433 … 0.866: says plainly there is none and how close it came", (m) => {
    const { results, warnings } = compute("stepped", m, [3]);
    expect(results.solved).toBe(false);
    expect(valueOf(results, "solutionCount")).toBe(0);
    expect(warnings.join(" ")).toMatch(/No set of 2 angles gives m = .* removes orders 3/);
    expect(valueOf(results, "residual")).toBeGreaterThan(0.01);
    expectAllFinite(results);
  });
});

describe("harmonic elimination against an FFT of the synthesized wave (fft.js, 2^16 points)", () => {
  const cases: [EliminationWave, number, number[]][] = [
    ["stepped", 0.8, [5, 7]],
    ["stepped", 0.7, [5, 7, 11, 13]],
    ["two-level", 0.8, [5, 7]],
    ["two-level", 0.6, [3, 5, 7]],
    ["three-level", 0.8, [5, 7, 11]],
  ];
  it.each(cases)("%s, m = %s, removing %j: every solution gives the wanted fundamental and removes the orders", (wave, m, eliminate) => {
    const vdc = 48;
    const first = compute(wave, m, eliminate);
    expect(first.results.solved).toBe(true);
    const count = valueOf(first.results, "solutionCount");
    expect(count).toBeGreaterThanOrEqual(1);
    const square = (4 * vdc) / Math.PI;
    const wanted = m * square * (wave === "stepped" ? eliminate.length + 1 : 1);
    let previousThd = 0;
    for (let pick = 1; pick <= count; pick++) {
      const { results } = compute(wave, m, eliminate, pick, vdc, 199);
      const angles = anglesOf(results);
      expect(angles).toHaveLength(eliminate.length + 1);
      const sampled = sampledSpectrum(synthesize(wave, vdc, angles));
      // Each of the 4k jumps (of up to 2·Vdc) moves by ≤ π/N under point sampling.
      const tolerance = (4 * angles.length * 2 * vdc) / 2 ** 16;
      expectClose(sampled.peaks[1]!, wanted, { abs: tolerance }, "fundamental");
      for (const n of eliminate) expect(sampled.peaks[n]!, `order ${n}`).toBeLessThan(tolerance);
      const table = harmonicsOf(results);
      for (let n = 1; n <= 199; n += 2) expectClose(peakAt(table, n), sampled.peaks[n]!, { abs: tolerance }, `order ${n}`);
      expectClose(valueOf(results, "vrms"), sampled.rms, { rel: 5e-3 }, "RMS");
      const thd = valueOf(results, "thd");
      expect(thd, "numbered by THD").toBeGreaterThanOrEqual(previousThd - 1e-9);
      previousThd = thd;
    }
  });

  it("a solution fed to the stepped-wave calculator shows the removed orders at 0 (Rashid 3rd ed. ch. 6 series)", () => {
    const { results } = compute("stepped", 0.8, [5, 7, 11]);
    const table = harmonicsOf(run(steppedWave, { vdc: 48, angles: anglesOf(results), f: 50, hmax: 49 }).results);
    for (const n of [5, 7, 11]) expect(peakAt(table, n) / peakAt(table, 1), `order ${n}`).toBeLessThan(1e-9);
  });

  it("a two-level wave's RMS is Vdc, so its THD is √((Vdc/V1,rms)² − 1) whatever the angles (derived)", () => {
    const { results } = compute("two-level", 0.8, [5, 7], 1, 100);
    expectClose(valueOf(results, "vrms"), 100, { rel: 1e-12 });
    expectClose(valueOf(results, "thd"), 100 * Math.sqrt((100 / valueOf(results, "v1Rms")) ** 2 - 1), { rel: 1e-9 });
  });
});

describe("harmonic elimination: inputs as typed and field errors", () => {
  it("reads inputs as typed on a sheet", () => {
    const { results } = evaluate("harmonic-elimination", { vdc: "48 V", wave: "stepped", m: "0.8", eliminate: "5, 7", pick: "1", f: "50 Hz", hmax: "49" });
    expectClose(valueOf(results, "v1Peak"), (0.8 * 3 * 4 * 48) / Math.PI, { rel: 1e-9 });
  });

  it("refuses even or repeated orders, too many orders, m beyond 1 and a solution number beyond those found", () => {
    const base = { vdc: "48 V", wave: "stepped", m: "0.8", eliminate: "5, 7", pick: "1", f: "50 Hz", hmax: "49" };
    expect(refuse("harmonic-elimination", { ...base, eliminate: "4, 7" })[0]!.field).toBe("eliminate");
    expect(refuse("harmonic-elimination", { ...base, eliminate: "5, 5" })[0]!.field).toBe("eliminate");
    expect(refuse("harmonic-elimination", { ...base, eliminate: "5, 7, 11, 13, 17, 19" })[0]!.field).toBe("eliminate");
    expect(refuse("harmonic-elimination", { ...base, m: "1.2" })[0]!.field).toBe("m");
    const errors = refuse("harmonic-elimination", { ...base, pick: "9" });
    expect(errors[0]!.field).toBe("pick");
    expect(errors[0]!.message).toMatch(/Only 1 solution/);
  });
});
