/**
 * Shared spectrum arithmetic for the waveform calculators.
 *
 * Conventions used by every waveform calculator:
 * - A spectrum line is a harmonic order n (a multiple of the fundamental
 *   frequency; an integer for periodic waveforms) and its peak amplitude in V.
 * - `harmonics` lists the fundamental first (n = 1, percent = 100) so a spectrum
 *   plot shows it, then the other orders up to hmax. rms = peak/√2;
 *   percent = 100·peak/fundamentalPeak (the THD_F convention of IEEE Std 519-2014,
 *   relative to the fundamental, not to the total RMS).
 * - THD comes in three flavours that answer different questions:
 *   `thd` counts every component other than the fundamental, exactly, from the
 *   RMS identity THD = √(Vrms² − V1rms²)/V1rms (valid when Vrms is known in
 *   closed form); `thd40` and `thd50` sum orders 2…40 and 2…50 only, the ranges
 *   harmonic standards evaluate (IEC practice up to 40, IEEE Std 519 up to 50).
 *   For switched waveforms the truncated values are lower, sometimes far lower
 *   (PWM puts its distortion near the carrier, above order 50).
 * - Weighted THD: WTHD = √(Σ_{n≥2} (V_n/n)²)/V1, the definition in Holmes & Lipo,
 *   Pulse Width Modulation for Power Converters, 2003, ch. 3 (section from
 *   memory). Dividing by n weights each harmonic by the current it drives
 *   through an inductive load, so WTHD tracks ripple current better than THD.
 */
import type { Harmonic, WaveformPoint } from "./types";

/** One line of a spectrum: order (multiple of the fundamental) and peak amplitude. */
export interface OrderPeak {
  n: number;
  peak: number;
}

/**
 * A periodic piecewise-constant waveform over one cycle 0 ≤ θ < 2π:
 * level[k] holds from edge[k] to edge[k+1] (the last to 2π). edge[0] is 0.
 */
export interface SteppedCycle {
  edges: Float64Array;
  levels: Float64Array;
}

/** Peaks below this fraction of the fundamental are rounding noise and shown as 0. */
const NOISE_FLOOR = 1e-12;

const SQRT1_2 = Math.SQRT1_2;

function cleanPeak(peak: number, fundamentalPeak: number): number {
  const magnitude = Math.abs(peak);
  return magnitude < NOISE_FLOOR * Math.abs(fundamentalPeak) ? 0 : magnitude;
}

/**
 * The `harmonics` result: the fundamental first (percent 100), then every line of
 * `lines` with 1 < n ≤ hmax (lines at n = 1 or n ≤ 0 are skipped: the fundamental
 * is passed separately and DC is not a harmonic). With `fundamentalFrequency`
 * each entry also carries its frequency n·f in Hz.
 */
export function harmonicTable(
  fundamentalPeak: number,
  lines: readonly OrderPeak[],
  hmax: number,
  fundamentalFrequency?: number,
): Harmonic[] {
  const v1 = Math.abs(fundamentalPeak);
  const entry = (n: number, peak: number, percent: number): Harmonic =>
    fundamentalFrequency === undefined
      ? { n, peak, rms: peak * SQRT1_2, percent }
      : { n, peak, rms: peak * SQRT1_2, percent, frequency: n * fundamentalFrequency };
  const table: Harmonic[] = [entry(1, v1, 100)];
  for (const line of lines) {
    if (line.n <= 0 || line.n === 1 || line.n > hmax) continue;
    const peak = cleanPeak(line.peak, v1);
    table.push(entry(line.n, peak, v1 > 0 ? (100 * peak) / v1 : 0));
  }
  return table;
}

/**
 * Lines from an array indexed by integer order (peaks[n], n = 0 … length−1),
 * keeping the orders `keep(n)` allows (e.g. odd only for half-wave symmetry).
 */
export function linesFromOrders(peaks: ArrayLike<number>, keep: (n: number) => boolean): OrderPeak[] {
  const lines: OrderPeak[] = [];
  for (let n = 2; n < peaks.length; n++) if (keep(n)) lines.push({ n, peak: Math.abs(peaks[n]!) });
  return lines;
}

/** THD over all components, in percent, from the RMS identity √(Vrms² − V1rms²)/V1rms. */
export function thdFromRms(totalRms: number, fundamentalRms: number): number {
  // Rounding can push Vrms² − V1rms² a hair below zero for a pure sine.
  const distortionSquared = Math.max(0, totalRms * totalRms - fundamentalRms * fundamentalRms);
  return (100 * Math.sqrt(distortionSquared)) / fundamentalRms;
}

/** THD in percent from the lines with 1 < n ≤ hLimit (and any lines below the fundamental, n < 1, n > 0). */
export function thdUpTo(fundamentalPeak: number, lines: readonly OrderPeak[], hLimit: number): number {
  let sumSquares = 0;
  for (const line of lines) {
    if (line.n <= 0 || line.n === 1 || line.n > hLimit) continue;
    sumSquares += line.peak * line.peak;
  }
  return (100 * Math.sqrt(sumSquares)) / Math.abs(fundamentalPeak);
}

/** Weighted THD in percent, √(Σ (V_n/n)²)/V1 over the lines with n ≠ 1 and 0 < n ≤ hLimit. */
export function weightedThdFromLines(fundamentalPeak: number, lines: readonly OrderPeak[], hLimit = Infinity): number {
  let sumSquares = 0;
  for (const line of lines) {
    if (line.n <= 0 || line.n === 1 || line.n > hLimit) continue;
    const weighted = line.peak / line.n;
    sumSquares += weighted * weighted;
  }
  return (100 * Math.sqrt(sumSquares)) / Math.abs(fundamentalPeak);
}

/** Mean and RMS of a stepped cycle, exactly (Σ level·width). */
export function steppedCycleMoments(wave: SteppedCycle): { mean: number; rms: number } {
  const { edges, levels } = wave;
  let sum = 0;
  let sumSquares = 0;
  for (let k = 0; k < levels.length; k++) {
    const width = (k + 1 < edges.length ? edges[k + 1]! : 2 * Math.PI) - edges[k]!;
    sum += levels[k]! * width;
    sumSquares += levels[k]! * levels[k]! * width;
  }
  return { mean: sum / (2 * Math.PI), rms: Math.sqrt(sumSquares / (2 * Math.PI)) };
}

/**
 * Fourier coefficients of a stepped cycle, exactly, v(θ) = a0 + Σ a_h·cos hθ + b_h·sin hθ,
 * for h = 1 … hMax (index h of the returned arrays; index 0 of `a` holds the mean).
 *
 * Integrating each flat segment gives a sum over the jumps Δ_j at θ_j:
 * a_h = −(1/πh)·Σ Δ_j·sin hθ_j,  b_h = (1/πh)·Σ Δ_j·cos hθ_j.
 * cos hθ_j and sin hθ_j are advanced by rotation (no trigonometric call per order);
 * the rounding error grows like h·ε, below 1e-12 for h ≤ 5000.
 * `oddOnly` is for a half-wave-symmetric wave (v(θ + π) = −v(θ)), whose even
 * orders are zero: they are left at 0 and skipped, which halves the work.
 */
export function steppedCycleFourier(wave: SteppedCycle, hMax: number, oddOnly = false): { a: Float64Array; b: Float64Array } {
  const { edges, levels } = wave;
  const count = levels.length;
  const jumpAngle = new Float64Array(count);
  const jumpSize = new Float64Array(count);
  let jumps = 0;
  for (let k = 0; k < count; k++) {
    const before = levels[(k + count - 1) % count]!;
    const step = levels[k]! - before;
    if (step === 0) continue;
    jumpAngle[jumps] = edges[k]!;
    jumpSize[jumps] = step;
    jumps++;
  }
  const orderStep = oddOnly ? 2 : 1;
  const stepCos = new Float64Array(jumps);
  const stepSin = new Float64Array(jumps);
  const cosH = new Float64Array(jumps);
  const sinH = new Float64Array(jumps);
  for (let j = 0; j < jumps; j++) {
    stepCos[j] = Math.cos(orderStep * jumpAngle[j]!);
    stepSin[j] = Math.sin(orderStep * jumpAngle[j]!);
    // Order 0 (odd orders start at 1 by an exact re-anchor, below).
    cosH[j] = 1;
    sinH[j] = 0;
  }
  const a = new Float64Array(hMax + 1);
  const b = new Float64Array(hMax + 1);
  a[0] = steppedCycleMoments(wave).mean;
  for (let h = 1; h <= hMax; h += orderStep) {
    let sumSin = 0;
    let sumCos = 0;
    // Re-anchor every 64 orders so the rotation's rounding cannot accumulate.
    const exact = h % 64 === (oddOnly ? 1 : 0);
    for (let j = 0; j < jumps; j++) {
      let c: number;
      let s: number;
      if (exact) {
        c = Math.cos(h * jumpAngle[j]!);
        s = Math.sin(h * jumpAngle[j]!);
      } else {
        const c0 = cosH[j]!;
        const s0 = sinH[j]!;
        c = c0 * stepCos[j]! - s0 * stepSin[j]!;
        s = s0 * stepCos[j]! + c0 * stepSin[j]!;
      }
      cosH[j] = c;
      sinH[j] = s;
      sumSin += jumpSize[j]! * s;
      sumCos += jumpSize[j]! * c;
    }
    a[h] = -sumSin / (Math.PI * h);
    b[h] = sumCos / (Math.PI * h);
  }
  return { a, b };
}

/**
 * Weighted THD (percent) of a stepped cycle, exactly, with no truncation:
 * Σ_{n≥1} (V_n/n)²/2 is the variance of the running integral G(θ) = ∫(v − mean)dθ
 * (Parseval applied to G), and G is piecewise linear, so its variance has a closed
 * form per segment. The fundamental's own term (V1²/2) is then removed.
 */
export function steppedCycleWeightedThd(wave: SteppedCycle, fundamentalPeak: number): number {
  const { edges, levels } = wave;
  const { mean } = steppedCycleMoments(wave);
  let g = 0; // G at the segment start
  let integralG = 0;
  let integralG2 = 0;
  for (let k = 0; k < levels.length; k++) {
    const width = (k + 1 < edges.length ? edges[k + 1]! : 2 * Math.PI) - edges[k]!;
    const slope = levels[k]! - mean;
    integralG += g * width + (slope * width * width) / 2;
    integralG2 += g * g * width + g * slope * width * width + (slope * slope * width * width * width) / 3;
    g += slope * width;
  }
  const period = 2 * Math.PI;
  const varianceG = integralG2 / period - (integralG / period) ** 2;
  const v1 = Math.abs(fundamentalPeak);
  const weightedSquares = Math.max(0, 2 * varianceG - v1 * v1);
  return (100 * Math.sqrt(weightedSquares)) / v1;
}

/**
 * Plot points for a stepped cycle scaled by `scale`: two points at each edge
 * (the level before and after), so the plot shows vertical switching edges.
 */
export function steppedCyclePoints(wave: SteppedCycle, scale: number): WaveformPoint[] {
  const { edges, levels } = wave;
  const toDegrees = 180 / Math.PI;
  const points: WaveformPoint[] = [];
  for (let k = 0; k < levels.length; k++) {
    const start = edges[k]! * toDegrees;
    const end = (k + 1 < edges.length ? edges[k + 1]! : 2 * Math.PI) * toDegrees;
    const v = levels[k]! * scale;
    points.push({ theta: start, v: v === 0 ? 0 : v }, { theta: end, v: v === 0 ? 0 : v });
  }
  return points;
}

/**
 * Builds a stepped cycle from segment starts and levels, merging neighbours with
 * equal levels and dropping zero-width segments. `starts` must be ascending in [0, 2π).
 */
export function steppedCycle(starts: readonly number[], levels: readonly number[]): SteppedCycle {
  const edges: number[] = [];
  const kept: number[] = [];
  for (let k = 0; k < starts.length; k++) {
    const end = k + 1 < starts.length ? starts[k + 1]! : 2 * Math.PI;
    if (end <= starts[k]!) continue;
    if (kept.length > 0 && kept[kept.length - 1] === levels[k]) continue;
    edges.push(kept.length === 0 ? 0 : starts[k]!);
    kept.push(levels[k]!);
  }
  return { edges: Float64Array.from(edges), levels: Float64Array.from(kept) };
}

/**
 * Samples one cycle of a waveform for plotting: `points` evenly spaced samples
 * from 0° to 360° inclusive. `valueAt` takes the angle in radians.
 */
export function sampleCycle(valueAt: (thetaRadians: number) => number, points = 361): WaveformPoint[] {
  const samples: WaveformPoint[] = [];
  for (let i = 0; i < points; i++) {
    const theta = (360 * i) / (points - 1);
    samples.push({ theta, v: valueAt((theta * Math.PI) / 180) });
  }
  return samples;
}
