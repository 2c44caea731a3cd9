import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { besselj } from "bessel";
import { calculator, linearLimit, poleCycles, type Sampling, type ThreePhaseReference } from "~/lib/calc/calculators/three-phase-pwm";
import { steppedCycleFourier } from "~/lib/calc/spectrum";
import { expectClose } from "../../../support/tolerance";
import { cellAveragedSpectrum, comparatorCellFractions, sampledSpectrum, triangle } from "../fft-reference";
import { expectAllFinite, harmonicsOf, peakAt, run } from "./run-calculator";
import { refuse, run as evaluate, valueOf } from "./run-helpers";

const REFERENCES: ThreePhaseReference[] = ["sine", "thi6", "thi4", "svpwm", "dpwm1"];
const SAMPLINGS: Sampling[] = ["natural", "regular-symmetric", "regular-asymmetric"];

const compute = (ma: number, mf: number, reference: ThreePhaseReference, sampling: Sampling = "natural", hmax = 200, vdc = 540) =>
  run(calculator, { vdc, ma, mf, reference, sampling, f: 400, hmax });

/** The three references written out from their definitions (per unit of Vdc/2). */
function references(reference: ThreePhaseReference, ma: number, theta: number): number[] {
  const v = [0, 1, 2].map((k) => ma * Math.sin(theta - (2 * Math.PI * k) / 3));
  let offset = 0;
  if (reference === "thi6") offset = (ma / 6) * Math.sin(3 * theta);
  if (reference === "thi4") offset = (ma / 4) * Math.sin(3 * theta);
  if (reference === "svpwm") offset = -(Math.max(...v) + Math.min(...v)) / 2;
  if (reference === "dpwm1") {
    const largest = v.reduce((p, q) => (Math.abs(q) > Math.abs(p) ? q : p));
    offset = Math.sign(largest) - largest;
  }
  return v.map((x) => x + offset);
}

/** The angle whose reference value leg k uses at θ: itself (natural) or the last carrier valley (symmetric) or vertex (asymmetric). */
function sampledAt(sampling: Sampling, mf: number, theta: number): number {
  if (sampling === "natural") return theta;
  const hold = sampling === "regular-symmetric" ? (2 * Math.PI) / mf : Math.PI / mf;
  return Math.PI / 2 + hold * Math.floor((theta - Math.PI / 2) / hold);
}

/** Line-to-line voltage a−b as cell averages on N cells, from each leg's comparator (fft-reference.ts). */
function sampledLine(reference: ThreePhaseReference, ma: number, mf: number, sampling: Sampling, vdc: number, points = 2 ** 16) {
  const leg = (k: number) =>
    comparatorCellFractions((t) => references(reference, ma, sampledAt(sampling, mf, t))[k]! - triangle(mf * (t - Math.PI / 2)), points);
  const a = leg(0);
  const b = leg(1);
  const line = new Float64Array(points);
  for (let j = 0; j < points; j++) line[j] = vdc * (a[j]! - b[j]!);
  return cellAveragedSpectrum(line);
}

/**
 * Holmes & Lipo 2003, ch. 3 (three-phase naturally sampled sine PWM; equation number from memory, unverified):
 * pole line (4/(mπ))·J_n(mπM/2)·sin((m+n)π/2) of Vdc/2 at order m·mf + n, phase b's lines shifted by −n·120°.
 * Lines falling on one order are summed as phasors; J_n from the npm "bessel" package.
 */
function closedFormLine(ma: number, mf: number, vdc: number, highestOrder: number): Float64Array {
  const re = new Float64Array(highestOrder + 1);
  const im = new Float64Array(highestOrder + 1);
  const add = (h: number, amplitude: number, n: number) => {
    if (Math.abs(h) > highestOrder) return;
    const shift = (-Math.sign(h) * n * 2 * Math.PI) / 3;
    re[Math.abs(h)]! += amplitude * (1 - Math.cos(shift));
    im[Math.abs(h)]! += -amplitude * Math.sin(shift);
  };
  add(1, ma * (vdc / 2), 1);
  for (let m = 1; m * mf - 60 <= highestOrder; m++) {
    for (let n = -60; n <= 60; n++) {
      const amplitude = (4 / (m * Math.PI)) * besselj((m * Math.PI * ma) / 2, Math.abs(n)) * (n < 0 && n % 2 !== 0 ? -1 : 1) * Math.sin(((m + n) * Math.PI) / 2);
      add(m * mf + n, amplitude * (vdc / 2), n);
    }
  }
  return re.map((x, h) => Math.hypot(x, im[h]!));
}

describe("three-phase PWM: naturally sampled sine against the published double Fourier series", () => {
  it.each([
    [0.5, 21],
    [0.9, 51],
    [1.0, 33],
  ])("ma %s, mf %s: every line-to-line line to order 300 (Holmes & Lipo 2003, ch. 3)", (ma, mf) => {
    const vdc = 540;
    const expected = closedFormLine(ma, mf, vdc, 300);
    const table = harmonicsOf(compute(ma, mf, "sine", "natural", 300, vdc).results);
    // The "bessel" package is good to about 2e-7 (tests/unit/calc/bessel.test.ts), which sets the tolerance.
    for (let n = 1; n <= 300; n++) expectClose(peakAt(table, n), expected[n]!, { abs: 2e-6 * vdc }, `order ${n}`);
  });

  it("fundamental √3·ma·Vdc/2 line to line across the linear range (Holmes & Lipo 2003, ch. 3)", () => {
    for (const ma of [0.1, 0.4, 0.7, 1.0]) {
      expectClose(valueOf(compute(ma, 51, "sine").results, "v1LinePeak"), Math.sqrt(3) * ma * 270, { rel: 1e-6 }, `ma ${ma}`);
    }
  });

  it("triplen sidebands and the carrier cancel in the line voltage; the pole keeps its carrier line (4/π)·J0(πM/2) (Holmes & Lipo 2003, ch. 3)", () => {
    const ma = 0.8;
    const { results } = compute(ma, 51, "sine", "natural", 400);
    for (const table of [harmonicsOf(results), harmonicsOf(results, "phaseHarmonics")]) {
      expect(table.filter((h) => h.n % 3 === 0).map((h) => h.n)).toEqual([]);
    }
    const pole = steppedCycleFourier(poleCycles("sine", ma, 51, "natural")[0]!, 51);
    expectClose(Math.hypot(pole.a[51]!, pole.b[51]!), (4 / Math.PI) * Math.abs(besselj((Math.PI * ma) / 2, 0)), { rel: 1e-6 });
  });
});

describe("three-phase PWM against an FFT of the synthesized bridge (fft.js, 2^16 cells)", () => {
  const cases = REFERENCES.flatMap((reference) => SAMPLINGS.map((sampling) => [reference, sampling] as const));
  it.each(cases)("%s, %s sampling: fundamental, lines to 150, THD to 50 and weighted THD within 0.5 % (ma 1.05: the sine is overmodulated, the others linear)", (reference, sampling) => {
    const ma = 1.05;
    const mf = 33;
    const vdc = 540;
    const sampled = sampledLine(reference, ma, mf, sampling, vdc);
    const { results } = compute(ma, mf, reference, sampling, 150, vdc);
    const table = harmonicsOf(results);
    const v1 = sampled.peaks[1]!;
    expectClose(valueOf(results, "v1LinePeak"), v1, { rel: 1e-4 }, "fundamental");
    // A held or jumping reference puts a jump in the comparator's input inside a cell, which the cell
    // interpolation misplaces by up to a cell: O(jumps/N) of V1 for those cases.
    const jumps = sampling !== "natural" || reference === "dpwm1";
    for (let n = 2; n <= 150; n++) expectClose(peakAt(table, n), sampled.peaks[n]!, { abs: (jumps ? 2e-4 : 5e-5) * v1 }, `order ${n}`);
    let sum50 = 0;
    let weighted = 0;
    for (let n = 2; n <= 50; n++) sum50 += sampled.peaks[n]! ** 2;
    for (let n = 2; n < sampled.peaks.length; n++) weighted += (sampled.peaks[n]! / n) ** 2;
    expectClose(valueOf(results, "thd50"), (100 * Math.sqrt(sum50)) / v1, { rel: 5e-3, abs: 1e-3 }, "thd50");
    expectClose(valueOf(results, "wthd"), (100 * Math.sqrt(weighted)) / v1, { rel: 5e-3 }, "wthd");
  });

  it("line RMS and THD against point samples of the line voltage (2^18 points)", () => {
    const ma = 0.9;
    const mf = 51;
    const points = 2 ** 18;
    const level = (reference: ThreePhaseReference, t: number, k: number) =>
      references(reference, ma, t)[k]! > triangle(mf * (t - Math.PI / 2)) ? 1 : -1;
    for (const reference of ["sine", "svpwm"] as const) {
      const sampled = sampledSpectrum((t) => 270 * (level(reference, t, 0) - level(reference, t, 1)), points);
      const { results } = compute(ma, mf, reference);
      expectClose(valueOf(results, "vLineRms"), sampled.rms, { rel: 5e-3 }, `${reference} RMS`);
      const thd = (100 * Math.sqrt(sampled.rms ** 2 - sampled.peaks[1]! ** 2 / 2)) / (sampled.peaks[1]! / Math.SQRT2);
      expectClose(valueOf(results, "thd"), thd, { rel: 5e-3 }, `${reference} THD`);
    }
  });
});

describe("three-phase PWM: linear range and overmodulation", () => {
  it("linear range ends at ma = 1 for a sine and 2/√3 with 1/6 injection, SVPWM and DPWM1 (Holmes & Lipo 2003, ch. 5, from memory); 1/4 injection at the peak of sin θ + sin 3θ/4 (derived)", () => {
    expect(linearLimit("sine")).toBe(1);
    for (const reference of ["thi6", "svpwm", "dpwm1"] as const) expectClose(linearLimit(reference), 2 / Math.sqrt(3), { rel: 1e-15 });
    let peak = 0;
    for (let i = 0; i <= 200000; i++) {
      const t = (Math.PI / 2) * (i / 200000);
      peak = Math.max(peak, Math.sin(t) + Math.sin(3 * t) / 4);
    }
    expectClose(linearLimit("thi4"), 1 / peak, { rel: 1e-9 });
  });

  it("up to 2/√3 the offsets keep the line voltage's baseband clean: no line of orders 2–25 above 0.5 % (SVPWM, 1/6 injection), while the sine reference has overmodulated", () => {
    const ma = 1.15;
    for (const reference of ["svpwm", "thi6"] as const) {
      const { results } = compute(ma, 51, reference);
      expect(results.overmodulated).toBe(false);
      expectClose(valueOf(results, "v1LinePeak"), Math.sqrt(3) * ma * 270, { rel: 5e-3 });
      for (const h of harmonicsOf(results)) if (h.n > 1 && h.n <= 25) expect(h.percent, `${reference} order ${h.n}`).toBeLessThan(0.5);
    }
    const sine = compute(ma, 51, "sine");
    expect(sine.results.overmodulated).toBe(true);
    expect(sine.warnings.join(" ")).toMatch(/linear range/);
    expect(peakAt(harmonicsOf(sine.results), 5) / valueOf(sine.results, "v1LinePeak")).toBeGreaterThan(0.005);
  });

  it("overmodulated sine follows the clipped-sine fundamental (2/π)[M·asin(1/M) + √(1 − 1/M²)] (derived; Hava, Kerkman & Lipo 1998, from memory)", () => {
    for (const ma of [1.2, 1.5, 2]) {
      const clipped = (2 / Math.PI) * (ma * Math.asin(1 / ma) + Math.sqrt(1 - 1 / ma ** 2));
      expectClose(valueOf(compute(ma, 201, "sine").results, "v1LinePeak"), Math.sqrt(3) * clipped * 270, { rel: 5e-3 }, `ma ${ma}`);
    }
  });

  it("DPWM1 leaves each leg unswitched for 120° of the cycle: two thirds of the continuous schemes' switchings (Holmes & Lipo 2003, ch. 5, from memory)", () => {
    const mf = 51;
    const pole = (reference: ThreePhaseReference) => poleCycles(reference, 0.9, mf, "natural")[0]!;
    expect(pole("svpwm").edges.length).toBe(2 * mf);
    // Time spent in segments longer than one carrier period: the clamps, 2 × 60°, give or take a period at each end.
    const { edges, levels } = pole("dpwm1");
    let clamped = 0;
    for (let k = 0; k < levels.length; k++) {
      const width = (k + 1 < edges.length ? edges[k + 1]! : 2 * Math.PI) - edges[k]!;
      if (width > (2 * Math.PI) / mf) clamped += width;
    }
    expectClose(clamped, (2 * Math.PI) / 3, { abs: (4 * Math.PI) / mf });
    expectClose(edges.length, (2 / 3) * 2 * mf, { abs: 4 });
  });

  it("at ma = 0.9 the space-vector offset gives a lower weighted THD than the sine (Holmes & Lipo 2003, ch. 6 comparison, from memory)", () => {
    expect(valueOf(compute(0.9, 51, "svpwm").results, "wthd")).toBeLessThan(valueOf(compute(0.9, 51, "sine").results, "wthd"));
  });
});

describe("three-phase PWM: inputs as typed, field errors and finite results", () => {
  it("reads values with units as typed on a sheet", () => {
    const { results } = evaluate("three-phase-pwm", { vdc: "540 V", ma: "0.9", mf: "51", reference: "svpwm", sampling: "natural", f: "400 Hz", hmax: "100" });
    expectClose(valueOf(results, "v1LineRms"), (Math.sqrt(3) * 0.9 * 270) / Math.SQRT2, { rel: 5e-3 });
  });

  it("refuses a non-integer or small mf, ma beyond 2 and an unknown reference, naming the field", () => {
    const base = { vdc: "540 V", ma: "0.9", mf: "51", reference: "svpwm", sampling: "natural", f: "400 Hz", hmax: "100" };
    expect(refuse("three-phase-pwm", { ...base, mf: "50.5" })[0]!.field).toBe("mf");
    expect(refuse("three-phase-pwm", { ...base, mf: "6" })[0]!.field).toBe("mf");
    expect(refuse("three-phase-pwm", { ...base, ma: "2.5" })[0]!.field).toBe("ma");
    expect(refuse("three-phase-pwm", { ...base, reference: "sinusoid" })[0]!.field).toBe("reference");
  });

  it("every result is finite across the documented range", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.01, max: 2, noNaN: true }),
        fc.integer({ min: 9, max: 120 }),
        fc.constantFrom(...REFERENCES),
        fc.constantFrom(...SAMPLINGS),
        (ma, mf, reference, sampling) => expectAllFinite(compute(ma, mf, reference, sampling, 60).results),
      ),
      { numRuns: 40 },
    );
  });
});
