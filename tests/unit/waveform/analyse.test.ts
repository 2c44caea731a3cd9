// Captures synthesized from the closed-form waveforms, read and analysed as an upload
// would be, and compared with the engine's calculators and with the published values
// the engine's own tests check (docs/sources.md, "Derivations the tests rely on").
import { describe, expect, it } from "vitest";
import { calculator as quasiSquareCalculator } from "~/lib/calc/calculators/quasi-square";
import { calculator as sixStepCalculator } from "~/lib/calc/calculators/six-step";
import { analyseCapture, type ChannelAnalysis } from "~/lib/waveform/analyse";
import { CaptureError, readCapture } from "~/lib/waveform/capture-csv";
import { captureCsv, quasiSquare, sixStepLineVoltage } from "../../support/capture-synth";
import { expectClose } from "../../support/tolerance";
import { harmonicsOf, run, scalarOf } from "../calc/calculators/run-calculator";

const deg = Math.PI / 180;

function analyse(csv: string): ChannelAnalysis[] {
  return analyseCapture(readCapture(csv)).channels;
}

const percentOf = (channel: ChannelAnalysis, n: number) => channel.harmonics.find((h) => h.n === n)!.percent;

describe("measured quasi-square capture (α = 30°, with noise)", () => {
  // 48 V bridge, 50 Hz, 100 kS/s, 10.37 cycles (not a whole number), an arbitrary start phase,
  // and Gaussian noise of 0.25 V RMS, as a probe and a scope's front end add.
  const csv = captureCsv({
    sampleRate: 100_000,
    samples: 20_740,
    seed: 23,
    preamble: ["Invented bench export", "Record length,20740"],
    channels: [{ name: "Vout", unit: "V", valueAt: quasiSquare(48, 30 * deg, 50, 1.234), noise: 0.25 }],
  });
  const [measured] = analyse(csv);
  const engine = run(quasiSquareCalculator, { vdc: 48, alpha: 30, f: 50, hmax: 49 }).results;

  it("has THD within 0.5 % of the engine's (Rashid, 3rd ed., §6.6: Vrms = Vdc·√(1 − 2α/π), b_n = (4Vdc/nπ)·cos nα — published; α convention from memory)", () => {
    const engineThd = scalarOf(engine, "thd");
    // Derived: at α = 30°, Vrms² = ⅔·Vdc² and V1,rms² = 6·Vdc²/π², so THD = √(π²/9 − 1) = 31.084 %.
    expectClose(engineThd, 100 * Math.sqrt(Math.PI ** 2 / 9 - 1), { abs: 1e-9 }, "engine THD at 30° (derived)");
    expectClose(measured!.thd, engineThd, { rel: 0.005 }, "measured THD, all components");
    expectClose(measured!.thd40, scalarOf(engine, "thd40"), { rel: 0.005 }, "measured THD to 40");
    expectClose(measured!.thd50, scalarOf(engine, "thd50"), { rel: 0.005 }, "measured THD to 50");
  });

  it("reads the fundamental's RMS and frequency and the odd harmonics the engine lists", () => {
    expectClose(measured!.fundamentalFrequency, 50, { rel: 1e-4 }, "fundamental frequency");
    expectClose(measured!.fundamentalRms, scalarOf(engine, "v1Rms"), { rel: 0.002 }, "fundamental RMS");
    expectClose(measured!.rms, scalarOf(engine, "vrms"), { rel: 0.002 }, "Vrms");
    for (const line of harmonicsOf(engine).filter((h) => h.n > 1 && h.n <= 25)) {
      expectClose(percentOf(measured!, line.n), line.percent, { abs: 0.1 }, `harmonic ${line.n} (% of fundamental)`);
    }
    // Half-wave symmetry leaves no even orders (Mohan, Undeland & Robbins, 3rd ed., ch. 8).
    for (const n of [2, 4, 6, 8]) expect(percentOf(measured!, n)).toBeLessThan(0.1);
    expect(Math.abs(measured!.dc)).toBeLessThan(0.05);
    expect(measured!.cycles).toBe(10);
  });

  it("plots one cycle from the fundamental's rising zero crossing, as the engine draws it", () => {
    const at = (theta: number) => measured!.waveform.find((p) => Math.abs(p.theta - theta) < 0.5)!.v;
    expect(Math.abs(at(10))).toBeLessThan(1); // inside the zero interval 0° … 30°
    expectClose(at(90), 48, { abs: 0.5 }, "mid-pulse");
    expectClose(at(270), -48, { abs: 0.5 }, "mid negative pulse");
  });
});

describe("measured six-step line-to-line capture", () => {
  // 600 V link, 60 Hz, 50 kS/s, 6 cycles: the difference of two square-wave poles 120° apart.
  const csv = captureCsv({
    sampleRate: 50_000,
    samples: 5_000,
    seed: 6,
    channels: [{ name: "Vab", unit: "V", valueAt: sixStepLineVoltage(600, 60, 0.4), noise: 1 }],
  });
  const [measured] = analyse(csv);
  const engine = run(sixStepCalculator, { vdc: 600, f: 60, hmax: 49 }).results;

  it("matches the engine: V_LL,rms = √(2/3)·Vdc, V_LL1,rms = (√6/π)·Vdc, THD = √(π²/9 − 1) = 31.08 % (Mohan, Undeland & Robbins, 3rd ed., §8-6; Rashid, 3rd ed., §6.5 — published, sections from memory)", () => {
    expectClose(scalarOf(engine, "vllRms"), Math.sqrt(2 / 3) * 600, { rel: 1e-12 });
    expectClose(measured!.rms, scalarOf(engine, "vllRms"), { rel: 0.002 }, "V_LL,rms");
    expectClose(measured!.fundamentalRms, scalarOf(engine, "vll1Rms"), { rel: 0.002 }, "V_LL1,rms");
    expectClose(measured!.thd, scalarOf(engine, "thd"), { rel: 0.005 }, "THD, all");
    expectClose(measured!.thd, 31.084, { rel: 0.005 }, "THD against the closed form");
    expectClose(measured!.thd50, scalarOf(engine, "thd50"), { rel: 0.005 }, "THD to 50");
  });

  it("has harmonics only at 6k ± 1 with V_n/V_1 = 1/n; triplen orders cancel between lines (Mohan 3rd ed. §8-6)", () => {
    for (const n of [5, 7, 11, 13, 17, 19]) expectClose(percentOf(measured!, n), 100 / n, { abs: 0.15 }, `order ${n}`);
    for (const n of [2, 3, 4, 6, 9, 15]) expect(percentOf(measured!, n), `order ${n}`).toBeLessThan(0.15);
    expectClose(measured!.fundamentalFrequency, 60, { rel: 1e-4 });
  });
});

describe("sine with a DC offset (definitions: RMS² = DC² + Σ V_n,rms²; THD_F relative to the fundamental, IEEE Std 519-2014 §3)", () => {
  const csv = captureCsv({
    sampleRate: 20_000,
    samples: 7_777,
    seed: 2,
    channels: [{ name: "Vout", unit: "V", valueAt: (t) => 1.5 + 325 * Math.sin(2 * Math.PI * 400 * t + 0.3) + 16.25 * Math.sin(3 * (2 * Math.PI * 400 * t + 0.3)) }],
  });
  const [measured] = analyse(csv);

  it("separates DC, the fundamental and a 5 % third harmonic (derived)", () => {
    expectClose(measured!.fundamentalFrequency, 400, { rel: 1e-6 });
    expectClose(measured!.dc, 1.5, { abs: 0.01 });
    expectClose(measured!.fundamentalRms, 325 / Math.SQRT2, { rel: 1e-4 });
    expectClose(percentOf(measured!, 3), 5, { abs: 0.01 });
    expectClose(measured!.thd, 5, { abs: 0.02 });
    expectClose(measured!.rms, Math.sqrt(1.5 ** 2 + (325 ** 2 + 16.25 ** 2) / 2), { rel: 1e-4 });
  });
});

describe("captures that cannot be analysed", () => {
  it("refuses a record shorter than one cycle, saying how long it is and what one cycle needs", () => {
    const csv = captureCsv({ sampleRate: 10_000, samples: 120, channels: [{ name: "V", unit: "V", valueAt: (t) => 100 * Math.sin(2 * Math.PI * 50 * t) }] });
    expect(() => analyse(csv)).toThrow(CaptureError);
    expect(() => analyse(csv)).toThrow(/too short to hold one cycle: the capture lasts 12 ms/);
  });

  it("analyses the alternating channel and reports a flat one as skipped", () => {
    const csv = captureCsv({
      sampleRate: 10_000,
      samples: 2_000,
      channels: [
        { name: "Vdc", unit: "V", valueAt: () => 400 },
        { name: "Vout", unit: "V", valueAt: (t) => 100 * Math.sin(2 * Math.PI * 50 * t) },
      ],
    });
    const analysis = analyseCapture(readCapture(csv));
    expect(analysis.channels.map((c) => c.channel)).toEqual(["Vout"]);
    expect(analysis.skipped).toEqual([{ channel: "Vdc", reason: expect.stringMatching(/flat \(every sample is 400 V\)/) }]);
  });

  it("refuses a capture whose every channel is flat", () => {
    const csv = "Time,V\n0,1\n1,1\n2,1\n3,1\n4,1\n5,1\n6,1\n7,1\n8,1\n";
    expect(() => analyse(csv)).toThrow(/flat/);
  });
});
