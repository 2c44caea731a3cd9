/**
 * Independent numeric reference for the waveform calculators: sample one cycle of a
 * waveform written out in the test from its definition, take an FFT with fft.js,
 * and read off each harmonic's peak, the sampled RMS and THD figures.
 *
 * Samples sit at the centres of N equal cells, θ_j = 2π(j + ½)/N, so none falls
 * exactly on a switching edge. Sampling a wave with jumps aliases: each harmonic
 * read this way is off by O(jumps/N) of the jump size (about 1e-5 of Vdc per jump
 * for N = 2^16), which sets the tolerances the tests use.
 */
import FFT from "fft.js";

export interface SampledSpectrum {
  /** Peak of each order n = 0 … N/2 − 1 (index 0: |mean|). */
  peaks: Float64Array;
  /** RMS of the samples (all components). */
  rms: number;
  /** Mean of the samples. */
  mean: number;
}

const transforms = new Map<number, FFT>();

export function sampledSpectrum(valueAt: (theta: number) => number, points = 2 ** 16): SampledSpectrum {
  let fft = transforms.get(points);
  if (!fft) {
    fft = new FFT(points);
    transforms.set(points, fft);
  }
  const samples = new Float64Array(points);
  let sum = 0;
  let sumSquares = 0;
  for (let j = 0; j < points; j++) {
    const v = valueAt((2 * Math.PI * (j + 0.5)) / points);
    samples[j] = v;
    sum += v;
    sumSquares += v * v;
  }
  const out = fft.createComplexArray();
  fft.realTransform(out, samples);
  const half = points / 2;
  const peaks = new Float64Array(half);
  peaks[0] = Math.abs(out[0]!) / points;
  for (let n = 1; n < half; n++) peaks[n] = (2 * Math.hypot(out[2 * n]!, out[2 * n + 1]!)) / points;
  return { peaks, rms: Math.sqrt(sumSquares / points), mean: sum / points };
}

/** THD (%) of a sampled spectrum over orders 2 … hLimit. */
export function sampledThdUpTo(spectrum: SampledSpectrum, hLimit: number): number {
  let sumSquares = 0;
  for (let n = 2; n <= hLimit; n++) sumSquares += spectrum.peaks[n]! ** 2;
  return (100 * Math.sqrt(sumSquares)) / spectrum.peaks[1]!;
}

/** THD (%) over every component but the fundamental, from the sampled RMS. */
export function sampledThd(spectrum: SampledSpectrum): number {
  const fundamentalRms = spectrum.peaks[1]! / Math.SQRT2;
  return (100 * Math.sqrt(spectrum.rms ** 2 - fundamentalRms ** 2)) / fundamentalRms;
}

/** Weighted THD (%), √Σ(V_n/n)²/V1 over orders 2 … N/2 − 1. */
export function sampledWeightedThd(spectrum: SampledSpectrum): number {
  let sumSquares = 0;
  for (let n = 2; n < spectrum.peaks.length; n++) sumSquares += (spectrum.peaks[n]! / n) ** 2;
  return (100 * Math.sqrt(sumSquares)) / spectrum.peaks[1]!;
}

/** Triangle carrier −1 … +1 with a valley where its phase x is a multiple of 2π, written via asin∘cos. */
export function triangle(x: number): number {
  return (-2 / Math.PI) * Math.asin(Math.cos(x));
}

/**
 * For a two-state switch driven by the sign of g(θ) (a reference minus a carrier):
 * the fraction of each of N cells for which g > 0, from g at the cell edges with
 * the crossing placed by linear interpolation. Error per crossing is O(1/N²), far
 * below point sampling's O(1/N), so PWM spectra can be checked to ~1e-8.
 */
export function comparatorCellFractions(g: (theta: number) => number, points = 2 ** 16): Float64Array {
  const fractions = new Float64Array(points);
  let left = g(0);
  for (let j = 0; j < points; j++) {
    const right = g((2 * Math.PI * (j + 1)) / points);
    if (left > 0 && right > 0) fractions[j] = 1;
    else if (left > 0 || right > 0) fractions[j] = left > 0 ? left / (left - right) : right / (right - left);
    left = right;
  }
  return fractions;
}

/**
 * Spectrum of a wave given as cell averages (cell j covers 2πj/N … 2π(j+1)/N).
 * Averaging over a cell multiplies harmonic n by sinc(πn/N); that factor is divided out.
 * `rms` is that of the cell averages (lower than the wave's own RMS).
 */
export function cellAveragedSpectrum(cellAverages: Float64Array): SampledSpectrum {
  const points = cellAverages.length;
  let fft = transforms.get(points);
  if (!fft) {
    fft = new FFT(points);
    transforms.set(points, fft);
  }
  let sum = 0;
  let sumSquares = 0;
  for (const v of cellAverages) {
    sum += v;
    sumSquares += v * v;
  }
  const out = fft.createComplexArray();
  fft.realTransform(out, cellAverages);
  const half = points / 2;
  const peaks = new Float64Array(half);
  peaks[0] = Math.abs(out[0]!) / points;
  for (let n = 1; n < half; n++) {
    const x = (Math.PI * n) / points;
    peaks[n] = (2 * Math.hypot(out[2 * n]!, out[2 * n + 1]!)) / points / (Math.sin(x) / x);
  }
  return { peaks, rms: Math.sqrt(sumSquares / points), mean: sum / points };
}
