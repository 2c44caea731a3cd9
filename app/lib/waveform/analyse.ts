/**
 * Analyses each channel of a capture: RMS, DC offset, fundamental, harmonics and THD.
 *
 * 1. Sample rate from the time column: (samples − 1)/(last time − first time).
 * 2. Fundamental: the strongest line of an FFT of the whole record (block-averaged to
 *    at most 2^16 points when longer, zero-padded to a power of two), refined by maximising the Hann-windowed record's DTFT magnitude
 *    within ±1 bin (golden-section search), so the frequency is not limited to the
 *    bin grid and other lines do not pull it.
 * 3. An integer number of cycles M (as many as the record holds) is resampled
 *    (cubic interpolation) to N = 2^k points, so harmonic h falls exactly on bin h·M:
 *    no window and no leakage. fft.js transforms it.
 * 4. Vrms and DC from the original samples of those M cycles; THD over all components
 *    from the RMS identity √(Vrms² − DC² − V1rms²)/V1rms (as the engine's `thd`, so
 *    noise and switching ripple count), THD to orders 40 and 50 from the FFT lines
 *    (the ranges IEC practice and IEEE Std 519-2014 evaluate).
 * 5. One cycle for the plot: the M cycles averaged (noise falls as 1/√M), starting at
 *    the positive-going zero crossing of the fundamental, as the engine draws its waves.
 *
 * Percentages are of the fundamental (THD_F, as in IEEE Std 519-2014 and the engine).
 */
import FFT from "fft.js";
import type { Harmonic, WaveformPoint } from "../calc/types";
import { CaptureError, type Capture } from "./capture-csv";

/** Orders listed and plotted: the engine's and the standards' widest range. */
export const HIGHEST_ORDER = 50;
const PLOT_POINTS = 360;
/** Largest FFT: 2^21 points (32 MB of doubles), enough for 50 MB of CSV. */
const MAX_FFT_POINTS = 1 << 21;
const MIN_SAMPLES = 8;

export interface ChannelAnalysis {
  channel: string;
  /** SI unit of the values: "V" or "A" when the header said so, else "". */
  unit: string;
  fundamentalFrequency: number;
  /** Whole cycles analysed. */
  cycles: number;
  samplesPerCycle: number;
  rms: number;
  dc: number;
  fundamentalPeak: number;
  fundamentalRms: number;
  /** Percent of the fundamental: all components but DC and the fundamental. */
  thd: number;
  thd40: number;
  thd50: number;
  /** Fundamental first, then orders 2 … 50 (fewer when the sample rate is too low to read them). */
  harmonics: Harmonic[];
  /** One cycle, averaged over the analysed cycles; theta in degrees from the fundamental's rising zero crossing. */
  waveform: WaveformPoint[];
  /** What limits this analysis, in words (few cycles, few samples per cycle). */
  warnings: string[];
}

export interface CaptureAnalysis {
  sampleRate: number;
  sampleCount: number;
  /** Seconds from the first to the last sample. */
  duration: number;
  timeName: string;
  channels: ChannelAnalysis[];
  /** Channels that could not be analysed, with why (e.g. a DC-link channel with no alternating part). */
  skipped: { channel: string; reason: string }[];
}

/** Analyses every channel; throws CaptureError when none can be analysed. */
export function analyseCapture(capture: Capture): CaptureAnalysis {
  if (capture.sampleCount < MIN_SAMPLES) {
    throw new CaptureError(
      `The capture holds ${capture.sampleCount} sample${capture.sampleCount === 1 ? "" : "s"}; at least ${MIN_SAMPLES} are needed, and enough to span one full cycle of the output.`,
    );
  }
  const span = capture.lastTime - capture.firstTime;
  const sampleRate = (capture.sampleCount - 1) / span;
  const channels: ChannelAnalysis[] = [];
  const skipped: CaptureAnalysis["skipped"] = [];
  for (const channel of capture.channels) {
    try {
      channels.push(analyseChannel(channel.values, sampleRate, channel.name, channel.unit));
    } catch (error) {
      if (!(error instanceof CaptureError)) throw error;
      skipped.push({ channel: channel.name, reason: error.message });
    }
  }
  if (channels.length === 0) throw new CaptureError(skipped[0]!.reason);
  return { sampleRate, sampleCount: capture.sampleCount, duration: span, timeName: capture.timeName, channels, skipped };
}

const transforms = new Map<number, FFT>();
function fftOf(size: number): FFT {
  let fft = transforms.get(size);
  if (!fft) {
    fft = new FFT(size);
    transforms.set(size, fft);
  }
  return fft;
}

function nextPowerOfTwo(n: number): number {
  let size = 2;
  while (size < n) size *= 2;
  return size;
}

export function analyseChannel(values: Float64Array, sampleRate: number, channel: string, unit: string): ChannelAnalysis {
  const count = values.length;
  const recordSeconds = count / sampleRate;
  let mean = 0;
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < count; i++) {
    const v = values[i]!;
    mean += v;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  mean /= count;
  if (max - min <= 1e-12 * Math.max(1, Math.abs(max))) {
    throw new CaptureError(`Channel "${channel}" is flat (every sample is ${min}${unit ? ` ${unit}` : ""}): there is no waveform to analyse.`);
  }

  const search = decimated(values, mean);
  const searchRate = sampleRate / search.factor;
  const coarse = coarseFundamental(search.samples, searchRate);
  const frequency = refineFundamental(search.samples, searchRate, coarse.frequency, coarse.binWidth);
  // A record of exactly M cycles must count as M, whatever the last digit of f says.
  const cycles = Math.floor(recordSeconds * frequency + 1e-4);
  if (cycles < 1 || coarse.bin < 1) {
    const cycleMs = 1000 / frequency;
    throw new CaptureError(
      `Channel "${channel}" is too short to hold one cycle: the capture lasts ${formatMs(recordSeconds * 1000)}, ` +
        `and one cycle of its strongest component${Number.isFinite(cycleMs) && coarse.bin >= 1 ? ` (${formatHz(frequency)})` : ""} needs ` +
        `${Number.isFinite(cycleMs) && coarse.bin >= 1 ? formatMs(cycleMs) : "longer than the capture"}. Capture at least one full cycle, better five or more.`,
    );
  }

  const windowSamples = (cycles * sampleRate) / frequency;
  const points = Math.min(MAX_FFT_POINTS, nextPowerOfTwo(Math.ceil(windowSamples)));
  const resampled = resample(values, windowSamples, points);
  const fft = fftOf(points);
  const spectrum = fft.createComplexArray() as number[];
  fft.realTransform(spectrum, resampled);

  const peakAt = (order: number) => {
    const bin = order * cycles;
    return (2 * Math.hypot(spectrum[2 * bin]!, spectrum[2 * bin + 1]!)) / points;
  };
  const readableOrders = Math.min(HIGHEST_ORDER, Math.floor((points / 2 - 1) / cycles));
  const fundamentalPeak = peakAt(1);

  // RMS and DC over the whole samples of the analysed cycles.
  const whole = Math.max(1, Math.min(count, Math.round(windowSamples)));
  let sum = 0;
  let sumSquares = 0;
  for (let i = 0; i < whole; i++) {
    const v = values[i]!;
    sum += v;
    sumSquares += v * v;
  }
  const dc = sum / whole;
  const rms = Math.sqrt(sumSquares / whole);
  const fundamentalRms = fundamentalPeak / Math.SQRT2;
  const distortionSquared = Math.max(0, rms * rms - dc * dc - fundamentalRms * fundamentalRms);
  const thd = (100 * Math.sqrt(distortionSquared)) / fundamentalRms;

  const harmonics: Harmonic[] = [];
  let squares40 = 0;
  let squares50 = 0;
  for (let order = 1; order <= readableOrders; order++) {
    const peak = peakAt(order);
    harmonics.push({ n: order, peak, rms: peak / Math.SQRT2, percent: (100 * peak) / fundamentalPeak, frequency: order * frequency });
    if (order >= 2 && order <= 40) squares40 += peak * peak;
    if (order >= 2 && order <= 50) squares50 += peak * peak;
  }

  const warnings: string[] = [];
  const samplesPerCycle = sampleRate / frequency;
  if (cycles < 3) warnings.push(`Only ${cycles} whole cycle${cycles === 1 ? "" : "s"} in the capture: the frequency and the spectrum are less certain. Capture five or more.`);
  if (readableOrders < HIGHEST_ORDER) {
    warnings.push(`${Math.round(samplesPerCycle)} samples per cycle read harmonics only to order ${readableOrders}; THD to 50 counts those. Sample faster for the full range.`);
  } else if (samplesPerCycle < 4 * HIGHEST_ORDER) {
    warnings.push(`${Math.round(samplesPerCycle)} samples per cycle: the highest orders read slightly low; sample faster for exact high orders.`);
  }

  return {
    channel,
    unit,
    fundamentalFrequency: frequency,
    cycles,
    samplesPerCycle,
    rms,
    dc,
    fundamentalPeak,
    fundamentalRms,
    thd,
    thd40: (100 * Math.sqrt(squares40)) / fundamentalPeak,
    thd50: (100 * Math.sqrt(squares50)) / fundamentalPeak,
    harmonics,
    waveform: averagedCycle(resampled, cycles, Math.atan2(spectrum[2 * cycles + 1]!, spectrum[2 * cycles]!)),
    warnings,
  };
}

/** Samples the fundamental search looks at: block means of a long record (a boxcar low-pass). */
const SEARCH_POINTS = 1 << 16;

/**
 * The record minus its mean, averaged in blocks of `factor` samples so that at most
 * about SEARCH_POINTS remain. Averaging scales a line at f by sinc(πfD/fs), flat
 * within 1e-6 near a fundamental far below the sample rate, so the peak stays put.
 */
function decimated(values: Float64Array, mean: number): { samples: Float64Array; factor: number } {
  const factor = Math.max(1, Math.floor(values.length / SEARCH_POINTS));
  if (factor === 1) return { samples: values.map((v) => v - mean), factor };
  const samples = new Float64Array(Math.floor(values.length / factor));
  for (let k = 0; k < samples.length; k++) {
    let sum = 0;
    for (let i = k * factor, end = i + factor; i < end; i++) sum += values[i]!;
    samples[k] = sum / factor - mean;
  }
  return { samples, factor };
}

/** The strongest line of the zero-padded search record's FFT, with its bin index (in cycles per record) and bin width in Hz. */
function coarseFundamental(search: Float64Array, sampleRate: number) {
  const count = search.length;
  const size = nextPowerOfTwo(count);
  const input = new Float64Array(size);
  input.set(search);
  const fft = fftOf(size);
  const out = fft.createComplexArray() as number[];
  fft.realTransform(out, input);
  let bestBin = 0;
  let best = -1;
  for (let k = 1; k < size / 2; k++) {
    const power = out[2 * k]! ** 2 + out[2 * k + 1]! ** 2;
    if (power > best) {
      best = power;
      bestBin = k;
    }
  }
  const binWidth = sampleRate / size;
  // The record fills `count` of `size` points: a bin below size/count is less than one cycle.
  return { frequency: bestBin * binWidth, binWidth, bin: (bestBin * count) / size };
}

/**
 * |DTFT| of the Hann-windowed record at `frequency`. The window keeps the other
 * lines' sidelobes (the negative-frequency image, harmonics, DC) from pulling the
 * peak, which matters when the record holds only a few cycles. Rotations replace
 * trigonometric calls per sample.
 */
function dftMagnitude(values: Float64Array, sampleRate: number, frequency: number): number {
  const count = values.length;
  const angle = (2 * Math.PI * frequency) / sampleRate;
  const windowAngle = (2 * Math.PI) / count;
  const stepCos = Math.cos(angle);
  const stepSin = Math.sin(angle);
  const windowStepCos = Math.cos(windowAngle);
  const windowStepSin = Math.sin(windowAngle);
  let c = 1;
  let s = 0;
  let wc = 1;
  let ws = 0;
  let re = 0;
  let im = 0;
  for (let i = 0; i < count; i++) {
    const v = values[i]! * (0.5 - 0.5 * wc);
    re += v * c;
    im -= v * s;
    const next = c * stepCos - s * stepSin;
    s = s * stepCos + c * stepSin;
    c = next;
    const nextWindow = wc * windowStepCos - ws * windowStepSin;
    ws = ws * windowStepCos + wc * windowStepSin;
    wc = nextWindow;
    // Re-anchor now and then so the rotations' rounding cannot accumulate.
    if ((i & 4095) === 4095) {
      c = Math.cos(angle * (i + 1));
      s = Math.sin(angle * (i + 1));
      wc = Math.cos(windowAngle * (i + 1));
      ws = Math.sin(windowAngle * (i + 1));
    }
  }
  return Math.hypot(re, im);
}

function refineFundamental(values: Float64Array, sampleRate: number, coarse: number, binWidth: number): number {
  let low = Math.max(binWidth * 0.25, coarse - binWidth);
  let high = coarse + binWidth;
  const ratio = (Math.sqrt(5) - 1) / 2;
  let a = high - ratio * (high - low);
  let b = low + ratio * (high - low);
  let fa = dftMagnitude(values, sampleRate, a);
  let fb = dftMagnitude(values, sampleRate, b);
  for (let i = 0; i < 40 && high - low > 1e-9 * coarse; i++) {
    if (fa < fb) {
      low = a;
      a = b;
      fa = fb;
      b = low + ratio * (high - low);
      fb = dftMagnitude(values, sampleRate, b);
    } else {
      high = b;
      b = a;
      fb = fa;
      a = high - ratio * (high - low);
      fa = dftMagnitude(values, sampleRate, a);
    }
  }
  return (low + high) / 2;
}

/**
 * `points` samples evenly over the first `span` samples (a fractional count), by
 * four-point (cubic) Lagrange interpolation: its gain error at 50 samples per cycle
 * is about 1e-5, where linear interpolation loses 0.1 % of the fundamental.
 */
function resample(values: Float64Array, span: number, points: number): Float64Array {
  const out = new Float64Array(points);
  const last = values.length - 1;
  const step = span / points;
  for (let j = 0; j < points; j++) {
    const position = j * step;
    const i = Math.floor(position);
    const x = position - i;
    if (i < 1 || i + 2 > last) {
      // At the ends, fall back to linear interpolation.
      const next = Math.min(i + 1, last);
      out[j] = values[Math.min(i, last)]! + x * (values[next]! - values[Math.min(i, last)]!);
      continue;
    }
    const p0 = values[i - 1]!;
    const p1 = values[i]!;
    const p2 = values[i + 1]!;
    const p3 = values[i + 2]!;
    out[j] =
      (-x * (x - 1) * (x - 2) * p0) / 6 + ((x + 1) * (x - 1) * (x - 2) * p1) / 2 - ((x + 1) * x * (x - 2) * p2) / 2 + ((x + 1) * x * (x - 1) * p3) / 6;
  }
  return out;
}

/**
 * One cycle averaged over `cycles`, from the fundamental's rising zero crossing.
 * For x = A·sin(2πMj/N + ψ), the FFT line at M has phase ψ − π/2.
 */
function averagedCycle(resampled: Float64Array, cycles: number, fundamentalPhase: number): WaveformPoint[] {
  const points = resampled.length;
  const perCycle = points / cycles;
  const psi = fundamentalPhase + Math.PI / 2;
  const start = ((((-psi / (2 * Math.PI)) % 1) + 1) % 1) * perCycle;
  const at = (position: number) => {
    const wrapped = ((position % points) + points) % points;
    const i = Math.floor(wrapped);
    const fraction = wrapped - i;
    return resampled[i]! + fraction * (resampled[(i + 1) % points]! - resampled[i]!);
  };
  const cycle: WaveformPoint[] = [];
  for (let p = 0; p <= PLOT_POINTS; p++) {
    let sum = 0;
    for (let c = 0; c < cycles; c++) sum += at(start + (c + p / PLOT_POINTS) * perCycle);
    cycle.push({ theta: (360 * p) / PLOT_POINTS, v: sum / cycles });
  }
  return cycle;
}

function formatMs(ms: number): string {
  return `${Number(ms.toPrecision(3))} ms`;
}

function formatHz(hz: number): string {
  return `${Number(hz.toPrecision(4))} Hz`;
}
