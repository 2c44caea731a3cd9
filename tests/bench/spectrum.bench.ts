/**
 * Speed of the waveform spectra. Prints figures; asserts nothing.
 * Run: npx tsx tests/bench/spectrum.bench.ts
 *
 * Target: a full sine-triangle PWM result with harmonics to order 500 in ≤ 1 ms (median),
 * so a sheet can re-evaluate on every keystroke.
 */
import { calculator as spwm, closedFormSpectrum } from "../../app/lib/calc/calculators/spwm";
import { calculator as quasiSquare } from "../../app/lib/calc/calculators/quasi-square";
import { calculator as threePhasePwm } from "../../app/lib/calc/calculators/three-phase-pwm";
import type { ParsedInputs } from "../../app/lib/calc/types";
import { cellAveragedSpectrum, comparatorCellFractions, sampledSpectrum, triangle } from "../unit/calc/fft-reference";

interface Figures {
  median: number;
  p95: number;
  runs: number;
}

function measure(task: () => unknown, runs: number, warmup = Math.min(200, runs)): Figures {
  for (let i = 0; i < warmup; i++) task();
  const times = new Float64Array(runs);
  for (let i = 0; i < runs; i++) {
    const start = performance.now();
    task();
    times[i] = performance.now() - start;
  }
  times.sort();
  return { median: times[Math.floor(runs / 2)]!, p95: times[Math.floor(runs * 0.95)]!, runs };
}

function report(label: string, figures: Figures, targetMs?: number): void {
  const verdict = targetMs === undefined ? "" : figures.median <= targetMs ? `  (target ≤ ${targetMs} ms: met)` : `  (target ≤ ${targetMs} ms: MISSED)`;
  console.log(`${label.padEnd(68)} median ${figures.median.toFixed(3).padStart(8)} ms   p95 ${figures.p95.toFixed(3).padStart(8)} ms   n=${figures.runs}${verdict}`);
}

const context = { blockResults: {} };
const spwmInputs = (overrides: Partial<Record<string, number | string>>): ParsedInputs => ({
  vdc: 400,
  ma: 0.8,
  mf: 21,
  scheme: "bipolar",
  bridge: "full",
  f: 50,
  hmax: 500,
  ...overrides,
});

console.log("Sinewright waveform spectra — timings on this machine\n");

report("spwm compute, h ≤ 500, ma 0.8, mf 21, bipolar (default)", measure(() => spwm.compute(spwmInputs({}), context), 3000), 1);
report("spwm compute, h ≤ 500, ma 0.9, mf 21, unipolar", measure(() => spwm.compute(spwmInputs({ ma: 0.9, scheme: "unipolar" }), context), 3000), 1);
report("spwm compute, h ≤ 500, ma 0.8, mf 99, bipolar", measure(() => spwm.compute(spwmInputs({ mf: 99 }), context), 2000), 1);
report("spwm compute, h ≤ 500, ma 0.8, mf 20.5 (asynchronous)", measure(() => spwm.compute(spwmInputs({ mf: 20.5 }), context), 2000));
report("spwm compute, h ≤ 500, ma 1.3, mf 21 (overmodulation)", measure(() => spwm.compute(spwmInputs({ ma: 1.3 }), context), 2000));
report("spwm compute, h ≤ 500, ma 1.0, mf 3 (worst-case folding)", measure(() => spwm.compute(spwmInputs({ ma: 1, mf: 3 }), context), 1000));
report("spwm Bessel sideband sums only, h ≤ 500, mf 21", measure(() => closedFormSpectrum(0.8, 21, "bipolar", 500), 3000));
report("quasi-square compute, h ≤ 500", measure(() => quasiSquare.compute({ vdc: 48, alpha: 30, f: 50, hmax: 500 }, context), 3000));


const threePhaseInputs = (overrides: Partial<Record<string, number | string>>): ParsedInputs => ({
  vdc: 540,
  ma: 0.9,
  mf: 51,
  reference: "svpwm",
  sampling: "natural",
  f: 400,
  hmax: 500,
  ...overrides,
});
report("three-phase-pwm, h ≤ 500, SVPWM, ma 0.9, mf 51, natural", measure(() => threePhasePwm.compute(threePhaseInputs({}), context), 1000), 2);
report("three-phase-pwm, h ≤ 500, sine, ma 0.9, mf 51, natural", measure(() => threePhasePwm.compute(threePhaseInputs({ reference: "sine" }), context), 1000), 2);
report("three-phase-pwm, h ≤ 500, DPWM1, ma 1.1, mf 51, regular symmetric", measure(() => threePhasePwm.compute(threePhaseInputs({ reference: "dpwm1", ma: 1.1, sampling: "regular-symmetric" }), context), 1000), 2);
report("three-phase-pwm, h ≤ 500, SVPWM, ma 0.9, mf 50 (all three legs solved)", measure(() => threePhasePwm.compute(threePhaseInputs({ mf: 50 }), context), 500), 2);
report("three-phase-pwm, h ≤ 500, SVPWM, ma 0.9, mf 201", measure(() => threePhasePwm.compute(threePhaseInputs({ mf: 201 }), context), 500), 2);

console.log("");
const points = 2 ** 16;
report(
  "FFT cross-check, SPWM, 2^16 cells (synthesis + FFT + lines)",
  measure(() => {
    const ma = 0.8;
    const mf = 21;
    const leg = comparatorCellFractions((t) => ma * Math.sin(t) - triangle(mf * (t - Math.PI / 2)), points);
    for (let j = 0; j < points; j++) leg[j] = 2 * leg[j]! - 1;
    return cellAveragedSpectrum(leg).peaks[500];
  }, 40, 5),
);
report(
  "FFT cross-check, quasi-square, 2^16 points (synthesis + FFT + lines)",
  measure(() => {
    const alpha = (30 * Math.PI) / 180;
    return sampledSpectrum((t) => {
      const inHalf = t % Math.PI;
      const on = inHalf > alpha && inHalf < Math.PI - alpha ? 1 : 0;
      return t < Math.PI ? on : -on;
    }, points).peaks[500];
  }, 40, 5),
);
