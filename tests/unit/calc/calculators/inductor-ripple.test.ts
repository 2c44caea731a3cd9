import { describe, expect, it } from "vitest";
import FFT from "fft.js";
import { calculator } from "~/lib/calc/calculators/inductor-ripple";
import { expectClose } from "../../../support/tolerance";
import { comparatorCellFractions, triangle } from "../fft-reference";
import { expectAllFinite, run } from "./run-calculator";
import { refuse, run as evaluate, valueOf } from "./run-helpers";

type Scheme = "bipolar" | "unipolar";
const compute = (inputs: { vdc: number; l: number; fsw: number; ma: number; scheme: Scheme; bridge?: string; f?: number; rLoad?: number }) =>
  run(calculator, { bridge: "full", f: 50, ...inputs });

/**
 * The bridge voltage as cell averages over one cycle, written from the comparator definition (carrier valley at 90°):
 * bipolar ±1, unipolar (leg A on ma·sin θ, leg B on −ma·sin θ) +1/0/−1.
 */
function bridgeCells(scheme: Scheme, ma: number, mf: number, points: number): Float64Array {
  const carrier = (t: number) => triangle(mf * (t - Math.PI / 2));
  const legA = comparatorCellFractions((t) => ma * Math.sin(t) - carrier(t), points);
  if (scheme === "bipolar") return legA.map((x) => 2 * x - 1);
  const legB = comparatorCellFractions((t) => -ma * Math.sin(t) - carrier(t), points);
  return legA.map((x, j) => x - legB[j]!);
}

/**
 * Inductor current from L·di/dt = v_bridge − v_o, with v_o = ma·V·sin θ, integrated cell by cell (exact for the cell
 * averages); the peak-to-peak within each carrier period, largest over the cycle and at the period around 90°.
 */
function integratedRipple(scheme: Scheme, ma: number, mf: number, vdc: number, l: number, f: number) {
  const points = 2 ** 20;
  const cells = bridgeCells(scheme, ma, mf, points);
  const dt = 1 / (f * points);
  const perPeriod = points / mf;
  let current = 0;
  let largest = 0;
  let largestAt = 0;
  let atPeak = 0;
  let low = 0;
  let high = 0;
  for (let j = 0; j < points; j++) {
    const theta = (2 * Math.PI * (j + 0.5)) / points;
    current += ((vdc * cells[j]! - ma * vdc * Math.sin(theta)) * dt) / l;
    low = Math.min(low, current);
    high = Math.max(high, current);
    if ((j + 1) % perPeriod === 0) {
      // Carrier periods run vertex to vertex: with mf a power of 2 the vertices fall on cell edges.
      const swing = high - low;
      if (swing > largest) {
        largest = swing;
        largestAt = ((theta * 180) / Math.PI) % 180;
      }
      if (Math.abs(theta - Math.PI / 2) <= Math.PI / mf) atPeak = Math.max(atPeak, swing);
      low = current;
      high = current;
    }
  }
  return { largest, largestAt: largestAt > 90 ? 180 - largestAt : largestAt, atPeak };
}

describe("inductor ripple against the integrated switched voltage (2^20 cells per cycle)", () => {
  it.each([
    ["bipolar", 0.8],
    ["bipolar", 0.5],
    ["unipolar", 0.8],
    ["unipolar", 0.4],
  ] as const)("%s, ma %s, mf 512: the largest ripple, where it occurs, and the ripple at 90° within 0.5 %", (scheme, ma) => {
    const vdc = 400;
    const l = 1.5e-3;
    const f = 50;
    const mf = 512;
    const { results } = compute({ vdc, l, fsw: mf * f, ma, scheme, f });
    const reference = integratedRipple(scheme, ma, mf, vdc, l, f);
    expectClose(valueOf(results, "ripplePpMax"), reference.largest, { rel: 5e-3 }, "largest");
    expectClose(valueOf(results, "ripplePpAtPeak"), reference.atPeak, { rel: 5e-3 }, "at 90°");
    // The unipolar maximum is flat near asin(1/(2ma)): the located angle agrees to a few carrier periods.
    expectClose(valueOf(results, "ripplePpMaxAngle"), reference.largestAt, { abs: scheme === "bipolar" ? 1 : 6 }, "angle");
  });

  it("bipolar ripple is largest at the zero crossing, V/(2L·fsw); unipolar at ma·sin θ = ½, Vdc/(8L·fsw) (derived from v = L di/dt)", () => {
    const bipolar = compute({ vdc: 400, l: 1e-3, fsw: 20e3, ma: 0.9, scheme: "bipolar" }).results;
    expectClose(valueOf(bipolar, "ripplePpMax"), 400 / (2 * 1e-3 * 20e3), { rel: 1e-12 });
    expect(valueOf(bipolar, "ripplePpMaxAngle")).toBe(0);
    const unipolar = compute({ vdc: 400, l: 1e-3, fsw: 20e3, ma: 0.9, scheme: "unipolar" }).results;
    expectClose(valueOf(unipolar, "ripplePpMax"), 400 / (8 * 1e-3 * 20e3), { rel: 1e-12 });
    expectClose(valueOf(unipolar, "ripplePpMaxAngle"), (Math.asin(1 / 1.8) * 180) / Math.PI, { rel: 1e-12 });
    const half = compute({ vdc: 400, l: 1e-3, fsw: 20e3, ma: 0.9, scheme: "bipolar", bridge: "half" }).results;
    expectClose(valueOf(half, "ripplePpMax"), valueOf(bipolar, "ripplePpMax") / 2, { rel: 1e-12 });
  });
});

describe("R-L load current against the circuit integrated through the switched voltage", () => {
  /** Periodic steady state of L·di/dt + R·i = v, exact per cell (exponential), then fft.js on the samples. */
  function integratedCurrent(scheme: Scheme, ma: number, mf: number, vdc: number, l: number, r: number, f: number) {
    const points = 2 ** 18;
    const cells = bridgeCells(scheme, ma, mf, points);
    const decay = Math.exp((-r * (1 / (f * points))) / l);
    const step = (i: number, j: number) => (vdc * cells[j]!) / r + (i - (vdc * cells[j]!) / r) * decay;
    // i_N = a·i_0 + b is affine in i_0: one pass from 0 gives b, a = decay^N; the periodic start is b/(1 − a).
    let i = 0;
    for (let j = 0; j < points; j++) i = step(i, j);
    i = i / (1 - decay ** points);
    const samples = new Float64Array(points);
    for (let j = 0; j < points; j++) {
      i = step(i, j);
      samples[j] = i;
    }
    const fft = new FFT(points);
    const out = fft.createComplexArray();
    fft.realTransform(out, samples);
    const i1 = (2 * Math.hypot(out[2]!, out[3]!)) / points;
    let meanSquare = 0;
    for (const x of samples) meanSquare += x * x;
    meanSquare /= points;
    return { i1Rms: i1 / Math.SQRT2, irms: Math.sqrt(meanSquare), thd: (100 * Math.sqrt(meanSquare - (i1 * i1) / 2)) / (i1 / Math.SQRT2) };
  }

  it.each([
    ["bipolar", 0.8, 41],
    ["unipolar", 0.8, 41],
    ["bipolar", 0.6, 21],
  ] as const)("%s, ma %s, mf %s: fundamental, RMS and THD of the current within 0.5 %", (scheme, ma, mf) => {
    const vdc = 400;
    const l = 5e-3;
    const r = 10;
    const f = 50;
    const { results } = compute({ vdc, l, fsw: mf * f, ma, scheme, f, rLoad: r });
    const reference = integratedCurrent(scheme, ma, mf, vdc, l, r, f);
    expectClose(valueOf(results, "i1Rms"), reference.i1Rms, { rel: 5e-3 }, "fundamental");
    expectClose(valueOf(results, "irms"), reference.irms, { rel: 5e-3 }, "RMS");
    expectClose(valueOf(results, "thdCurrent"), reference.thd, { rel: 5e-3 }, "THD");
  });
});

describe("inductor ripple: inputs as typed and field errors", () => {
  it("reads inputs as typed on a sheet, and leaves the load figures out without a load resistance", () => {
    const { results } = evaluate("inductor-ripple", { vdc: "400 V", l: "1.5 mH", fsw: "20 kHz", ma: "0.8", scheme: "unipolar", bridge: "full", f: "50 Hz" });
    expectClose(valueOf(results, "ripplePpMax"), 400 / (8 * 1.5e-3 * 20e3), { rel: 1e-12 });
    expect(results.thdCurrent).toBeUndefined();
  });

  it("refuses unipolar on a half bridge, a carrier below 3 × f and ma beyond 1, naming the field", () => {
    const base = { vdc: "400 V", l: "1.5 mH", fsw: "20 kHz", ma: "0.8", scheme: "bipolar", bridge: "full", f: "50 Hz" };
    expect(refuse("inductor-ripple", { ...base, scheme: "unipolar", bridge: "half" })[0]!.field).toBe("scheme");
    expect(refuse("inductor-ripple", { ...base, fsw: "100 Hz" })[0]!.field).toBe("fsw");
    expect(refuse("inductor-ripple", { ...base, ma: "1.3" })[0]!.field).toBe("ma");
    expect(refuse("inductor-ripple", { ...base, l: "0 H" })[0]!.field).toBe("l");
  });

  it("gives finite results with a non-integer carrier ratio", () => {
    expectAllFinite(compute({ vdc: 400, l: 1e-3, fsw: 16.7e3, ma: 0.7, scheme: "bipolar", rLoad: 5 }).results);
  });
});
