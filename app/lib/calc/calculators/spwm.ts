/**
 * Sinusoidal PWM (sine-triangle, naturally sampled) of a half or full bridge.
 *
 * What it computes: the fundamental, the harmonic spectrum up to hmax, the exact
 * RMS, THD (all components, and over orders to 40 and 50) and the weighted THD
 * of the output voltage, for a sine reference of amplitude ma (relative to the
 * carrier peak) and a triangle carrier mf times the output frequency.
 *
 * Conventions:
 * - Reference ma·sin θ. The carrier is synchronous and has a valley (−1) at
 *   θ = 90°, the reference's peak; with odd mf this makes the bipolar wave
 *   quarter-wave symmetric (odd sine harmonics only).
 * - Bipolar: one comparison drives the leg (or both legs, complementary) between
 *   +Vdc/2 and −Vdc/2 (pole) or +Vdc and −Vdc (full bridge). Unipolar (full bridge
 *   only): leg B compares the inverted reference with the same carrier, so the
 *   output steps between +Vdc, 0 and −Vdc.
 * - Ideal switches, no dead time, stiff DC link.
 *
 * Closed form (linear region, ma ≤ 1), double Fourier series of the pole voltage
 * relative to Vdc/2 (Holmes & Lipo, Pulse Width Modulation for Power Converters,
 * 2003, ch. 3; Black, Modulation Theory, 1953; equation numbers from memory):
 *   v/(Vdc/2) = ma·cos y + Σ_{m≥1} Σ_n (4/(mπ))·J_n(mπ·ma/2)·sin((m+n)π/2)·cos(m·x + n·y)
 * with carrier angle x and reference angle y. In the convention above every
 * line lands as A·cos(h·(θ − 90°)) with h = m·mf + n, so lines that fall on the
 * same order (several carrier groups, or negative orders folding to |h|) add as
 * signed numbers: the phasor sum, with the phases written out. Bessel orders
 * beyond n_cut(x) = x + 12·x^{1/3} + 25, where |J_n(x)| < 1e-16, are left out.
 * Unipolar: the two legs' lines with even n cancel, leaving m even, n odd, with
 * the same amplitudes relative to Vdc (first sidebands at 2mf ± 1; Mohan,
 * Undeland & Robbins, Power Electronics, 3rd ed., §8-3-2-2, from memory).
 *
 * Exact switching path (used for ma > 1, and for the RMS and weighted THD at any
 * ma with integer mf): the crossings of reference and carrier are found per
 * carrier ramp by safeguarded Newton iteration, on sub-intervals where the
 * difference is monotone; the output is then piecewise constant, and its Fourier
 * coefficients, RMS and weighted THD follow exactly from the switching angles.
 *
 * mf not an integer: the carrier is asynchronous. In the linear region the lines
 * are reported at their own orders h = m·mf + n (frequency ÷ fundamental, not
 * integers), lines below 1e-8 of the fundamental are left out, and the RMS is
 * the long-run value (bipolar Vdc/2 or Vdc exactly; unipolar Vdc·√(2ma/π)).
 * In overmodulation the spectrum is computed for the nearest integer mf, with a
 * warning.
 *
 * Checks: bipolar THD = √(2/ma² − 1) (from Vrms = Vdc/2, derived); Mohan 3rd ed.
 * Table 8-1 (generalized harmonics); overmodulation fundamental
 * (2/π)·[ma·asin(1/ma) + √(1 − 1/ma²)] (Hava, Kerkman & Lipo, IEEE Trans. Power
 * Electronics, 1998, from memory; derived).
 */
import { besselJOrders } from "../bessel";
import { fieldError } from "../errors";
import { scalar } from "../format";
import {
  harmonicTable,
  linesFromOrders,
  steppedCycle,
  steppedCycleFourier,
  steppedCycleMoments,
  steppedCyclePoints,
  steppedCycleWeightedThd,
  thdFromRms,
  thdUpTo,
  weightedThdFromLines,
  type OrderPeak,
  type SteppedCycle,
} from "../spectrum";
import type { Calculator, ChoiceInputSpec, QuantityInputSpec } from "../types";
import {
  LETHAL_VOLTAGE_CAUTION,
  dcLinkVoltageInput,
  fundamentalFrequencyInput,
  highestOrderInput,
  readChoice,
  readQuantity,
} from "./shared-inputs";

export type PwmScheme = "bipolar" | "unipolar";

const vdcInput = dcLinkVoltageInput("400 V", "DC-link voltage across the bridge (a half bridge's pole swings ±Vdc/2 about the midpoint).");

const maInput: QuantityInputSpec = {
  key: "ma",
  label: "Amplitude modulation index ma",
  description: "Peak of the sine reference over the peak of the triangle carrier. Above 1 is overmodulation.",
  kind: "quantity",
  dimension: "dimensionless",
  displayUnit: "",
  min: 0,
  minExclusive: true,
  max: 4,
  default: "0.8",
};

const mfInput: QuantityInputSpec = {
  key: "mf",
  label: "Frequency ratio mf",
  description: "Carrier (switching) frequency over output frequency. Use an odd integer for bipolar PWM.",
  kind: "quantity",
  dimension: "dimensionless",
  displayUnit: "",
  min: 3,
  max: 2000,
  default: "21",
};

export const schemeInput: ChoiceInputSpec = {
  key: "scheme",
  label: "Switching scheme",
  description: "Bipolar: the output swings between + and −. Unipolar (full bridge only): each leg has its own reference, the output steps +, 0, −.",
  kind: "choice",
  options: [
    { value: "bipolar", label: "Bipolar (two-level)" },
    { value: "unipolar", label: "Unipolar (three-level, full bridge)" },
  ],
  default: "bipolar",
};

export const bridgeInput: ChoiceInputSpec = {
  key: "bridge",
  label: "Bridge",
  description: "Half bridge: output from one leg to the DC midpoint. Full bridge: output between two legs.",
  kind: "choice",
  options: [
    { value: "half", label: "Half bridge (one leg)" },
    { value: "full", label: "Full bridge (two legs)" },
  ],
  default: "full",
};

const hmaxInput = highestOrderInput("100");

/** Carrier groups summed for the weighted THD when mf is not an integer; the 1/n weighting leaves ~2e-5 of it beyond. */
const WEIGHTED_GROUPS = 20;

/** Asynchronous lines below this fraction of the fundamental are not listed. */
const LIST_BELOW = 1e-8;

// Reused between calls so the sideband sums allocate nothing per carrier group.
let besselBuffer = new Float64Array(512);

function besselScratch(size: number): Float64Array {
  if (besselBuffer.length < size) besselBuffer = new Float64Array(Math.max(size, 2 * besselBuffer.length));
  return besselBuffer;
}

/** Highest Bessel order that matters at argument x: beyond it |J_n(x)| < 1e-16. */
export function besselOrderCut(x: number): number {
  return Math.ceil(x + 12 * Math.cbrt(x) + 25);
}

/**
 * Visits every line of the linear-region closed form with |order| ≤ highestOrder,
 * normalised (bipolar: pole voltage over Vdc/2; unipolar: bridge voltage over Vdc).
 * `visit(order, amplitude)` receives |h| and the signed amplitude A of the
 * component A·cos(|h|·(θ − π/2)); the baseband fundamental (ma at order 1) is included.
 */
export function visitSidebandLines(
  ma: number,
  mf: number,
  scheme: PwmScheme,
  highestOrder: number,
  visit: (order: number, amplitude: number) => void,
): void {
  visit(1, ma);
  // Unipolar: odd carrier groups cancel between the legs.
  const groupStep = scheme === "unipolar" ? 2 : 1;
  for (let m = groupStep; ; m += groupStep) {
    const x = (m * Math.PI * ma) / 2;
    const cut = besselOrderCut(x);
    const centre = m * mf;
    if (centre - cut > highestOrder) break;
    const nLow = Math.max(-cut, Math.ceil(-highestOrder - centre));
    const nHigh = Math.min(cut, Math.floor(highestOrder - centre));
    if (nLow > nHigh) continue;
    const bessel = besselJOrders(x, Math.max(Math.abs(nLow), Math.abs(nHigh)), besselScratch(cut + 1));
    const groupAmplitude = 4 / (m * Math.PI);
    for (let n = nLow; n <= nHigh; n++) {
      const k = m + n;
      if ((k & 1) === 0) continue; // sin((m+n)π/2) = 0
      const sine = (k & 3) === 1 ? 1 : -1; // sin(kπ/2) for odd k, also for negative k
      const order = n >= 0 ? n : -n;
      const jn = n >= 0 || (order & 1) === 0 ? bessel[order]! : -bessel[order]!;
      visit(Math.abs(centre + n), groupAmplitude * sine * jn);
    }
  }
}

/**
 * Linear-region spectrum for integer mf: signed amplitudes by order 0…highestOrder
 * (index 0 is the DC offset), normalised as in visitSidebandLines.
 */
export function closedFormSpectrum(ma: number, mf: number, scheme: PwmScheme, highestOrder: number): Float64Array {
  if (!Number.isInteger(mf)) throw new RangeError(`closedFormSpectrum needs an integer mf, got ${mf}`);
  const amplitudes = new Float64Array(highestOrder + 1);
  visitSidebandLines(ma, mf, scheme, highestOrder, (order, amplitude) => {
    amplitudes[order]! += amplitude;
  });
  return amplitudes;
}

/** The triangle carrier, −1 … +1, with a valley at θ = 90°. */
export function carrier(theta: number, mf: number): number {
  const x = mf * (theta - Math.PI / 2);
  const wrapped = x - 2 * Math.PI * Math.round(x / (2 * Math.PI));
  return (2 * Math.abs(wrapped)) / Math.PI - 1;
}

/**
 * Angles in (0, 2π) where σ·ma·sin θ crosses the carrier, plus the carrier's
 * vertices and the sine's inflection at π (harmless extra boundaries; they make
 * every interval between consecutive angles one where the comparison is fixed).
 */
function legBoundaries(sigma: number, ma: number, mf: number, out: number[]): void {
  const pieces: number[] = [0, Math.PI, 2 * Math.PI];
  const firstVertex = Math.ceil(-mf / 2);
  const lastVertex = Math.floor(1.5 * mf);
  for (let j = firstVertex; j <= lastVertex; j++) {
    const theta = Math.PI / 2 + (j * Math.PI) / mf;
    if (theta > 0 && theta < 2 * Math.PI) pieces.push(theta);
  }
  pieces.sort((a, b) => a - b);
  const amplitude = sigma * ma;
  for (let p = 0; p + 1 < pieces.length; p++) {
    const a = pieces[p]!;
    const b = pieces[p + 1]!;
    if (b <= a) continue;
    out.push(a);
    const mid = (a + b) / 2;
    const x = mf * (mid - Math.PI / 2);
    const wrapped = x - 2 * Math.PI * Math.round(x / (2 * Math.PI));
    const slope = ((2 * mf) / Math.PI) * Math.sign(wrapped);
    const carrierMid = carrier(mid, mf);
    const g = (t: number) => amplitude * Math.sin(t) - (carrierMid + slope * (t - mid));
    const dg = (t: number) => amplitude * Math.cos(t) - slope;
    // Where the reference is as steep as the ramp, g turns: split there so each part is monotone.
    const splits = [a];
    const ratio = slope / amplitude;
    if (Math.abs(ratio) <= 1) {
      const turn = Math.acos(ratio);
      for (const t of [turn, 2 * Math.PI - turn]) if (t > a && t < b) splits.push(t);
    }
    splits.sort((p, q) => p - q);
    splits.push(b);
    for (let s = 0; s + 1 < splits.length; s++) {
      const lo = splits[s]!;
      const hi = splits[s + 1]!;
      if (s > 0) out.push(lo);
      const gLo = g(lo);
      const gHi = g(hi);
      if (gLo * gHi < 0) out.push(monotoneRoot(g, dg, lo, hi, gLo));
    }
  }
}

/** Root of a monotone g on [lo, hi] with a sign change: Newton, kept inside the bracket by bisection. */
function monotoneRoot(g: (t: number) => number, dg: (t: number) => number, lo: number, hi: number, gLo: number): number {
  let low = lo;
  let high = hi;
  const lowSign = Math.sign(gLo);
  let t = (lo + hi) / 2;
  for (let i = 0; i < 100; i++) {
    const value = g(t);
    if (value === 0) return t;
    if (Math.sign(value) === lowSign) low = t;
    else high = t;
    let next = t - value / dg(t);
    if (!(next > low && next < high)) next = (low + high) / 2;
    if (Math.abs(next - t) <= 4e-16 * Math.max(1, Math.abs(t)) || high - low <= 4e-16 * Math.max(1, high)) return next;
    t = next;
  }
  return (low + high) / 2;
}

/**
 * The switched output over one reference cycle, exactly: bipolar levels ±1
 * (relative to Vdc/2 for a pole, Vdc for a full bridge); unipolar levels
 * +1, 0, −1 (relative to Vdc). For non-integer mf the cycle is a snapshot
 * (the carrier does not repeat every cycle).
 */
export function switchedCycle(ma: number, mf: number, scheme: PwmScheme): SteppedCycle {
  const boundaries: number[] = [];
  legBoundaries(1, ma, mf, boundaries);
  if (scheme === "unipolar") legBoundaries(-1, ma, mf, boundaries);
  boundaries.sort((a, b) => a - b);
  const starts: number[] = [];
  const levels: number[] = [];
  const legState = (sigma: number, t: number) => (sigma * ma * Math.sin(t) > carrier(t, mf) ? 1 : -1);
  for (let i = 0; i < boundaries.length; i++) {
    const start = boundaries[i]!;
    const end = i + 1 < boundaries.length ? boundaries[i + 1]! : 2 * Math.PI;
    if (end <= start) continue;
    const mid = (start + end) / 2;
    const level = scheme === "unipolar" ? (legState(1, mid) - legState(-1, mid)) / 2 : legState(1, mid);
    starts.push(start);
    levels.push(level);
  }
  return steppedCycle(starts, levels);
}

export const calculator: Calculator = {
  id: "spwm",
  title: "Sine-triangle PWM",
  summary: "Fundamental, harmonics, THD and weighted THD of naturally sampled sinusoidal PWM.",
  description:
    "For a half or full bridge driven by sine-triangle PWM (bipolar or unipolar), gives the fundamental, the harmonics " +
    "up to the chosen order (carrier sidebands included, from the Bessel-function closed form), the exact output RMS, " +
    "the THD over all components and over orders to 40 and 50, and the weighted THD. Overmodulation (ma > 1) is " +
    "computed from the exact switching instants.",
  inputs: [vdcInput, maInput, mfInput, schemeInput, bridgeInput, fundamentalFrequencyInput, hmaxInput],
  outputs: [
    { key: "v1Peak", label: "Fundamental peak", kind: "scalar", unit: "V" },
    { key: "v1Rms", label: "Fundamental RMS", kind: "scalar", unit: "V" },
    { key: "vrms", label: "Output RMS (all components)", kind: "scalar", unit: "V" },
    { key: "thd", label: "THD, all harmonics", kind: "scalar", unit: "%", description: "Every harmonic of order 2 and above; DC excluded (shown on its own)." },
    { key: "dc", label: "DC offset", kind: "scalar", unit: "V", description: "Mean of the output; non-zero only without half-wave symmetry (e.g. bipolar with even mf)." },
    { key: "thd40", label: "THD, orders 2–40", kind: "scalar", unit: "%" },
    { key: "thd50", label: "THD, orders 2–50", kind: "scalar", unit: "%" },
    { key: "wthd", label: "Weighted THD", kind: "scalar", unit: "%" },
    { key: "harmonics", label: "Harmonics", kind: "harmonics", description: "Fundamental first, then the orders the wave has, up to hmax." },
    { key: "waveform", label: "Output voltage, one cycle", kind: "waveform" },
  ],
  formulas: [
    {
      label: "Line at order m·mf + n (pole, relative to Vdc/2)",
      latex: String.raw`\frac{V_{m m_f + n}}{V_{dc}/2} = \frac{4}{m\pi}\,J_n\!\left(m\frac{\pi}{2}m_a\right)\sin\!\left((m+n)\frac{\pi}{2}\right)`,
    },
    { label: "Fundamental, linear region", latex: String.raw`V_1 = m_a\,\frac{V_{dc}}{2}\ \text{(pole)},\quad m_a V_{dc}\ \text{(full bridge)}` },
    { label: "Bipolar THD, all components", latex: String.raw`\mathrm{THD} = \sqrt{\frac{2}{m_a^2} - 1}` },
    { label: "Unipolar RMS (long-run)", latex: String.raw`V_{rms} = V_{dc}\sqrt{\frac{2 m_a}{\pi}}` },
    {
      label: "Overmodulation fundamental (large mf)",
      latex: String.raw`\frac{V_1}{V_{dc}/2} = \frac{2}{\pi}\left[m_a\sin^{-1}\frac{1}{m_a} + \sqrt{1 - \frac{1}{m_a^2}}\right]`,
    },
    { label: "Weighted THD", latex: String.raw`\mathrm{WTHD} = \frac{\sqrt{\sum_{n\ge 2} (V_n/n)^2}}{V_1}` },
  ],
  conventions: [
    "Naturally sampled (analogue comparison) sine-triangle PWM; synchronous carrier with a valley at the reference's peak (90°). Regular sampling and dead time are not modelled.",
    "Half bridge: output from the leg to the DC midpoint, ±Vdc/2. Full bridge bipolar: ±Vdc. Full bridge unipolar: +Vdc, 0, −Vdc.",
    "Harmonic percentages are of the fundamental (THD_F, as in IEEE Std 519).",
    "thd counts every harmonic of order 2 and above (exact, from the RMS with the fundamental and DC removed): IEEE Std 519-2014 and IEC 61000-3-2 define THD over harmonic orders, so a DC offset (which only a non-odd mf gives) is shown on its own as dc. thd40 and thd50 count orders up to 40 and 50, as harmonic standards do: with mf above about 50 the switching harmonics are all above that range, so these come out far lower than thd. None depends on hmax.",
    "Weighted THD divides each harmonic by its order (Holmes & Lipo's definition), a proxy for the ripple current an inductive load draws; for integer mf it is exact (no truncation).",
    "mf not an integer: lines are listed at non-integer orders (frequency ÷ output frequency), including any that fall below the fundamental.",
  ],
  sources: [
    "Holmes & Lipo, Pulse Width Modulation for Power Converters, IEEE Press/Wiley, 2003, ch. 3: double Fourier series of naturally sampled PWM; weighted THD (equation and section numbers from memory) — published.",
    "Black, Modulation Theory, Van Nostrand, 1953: double Fourier series of a two-variable switching function — published (chapter from memory).",
    "Mohan, Undeland & Robbins, Power Electronics: Converters, Applications, and Design, 3rd ed., §8-3 and Table 8-1 (generalized harmonics of a bipolar pole voltage) — published; unipolar switching §8-3-2-2 — memory.",
    "Hava, Kerkman & Lipo, IEEE Trans. Power Electronics, 1998: overmodulation fundamental — memory; the formula is derived here from the clipped reference.",
    "Bipolar THD √(2/ma² − 1) from Vrms = Vdc/2 — derived.",
  ],
  cautions: [
    LETHAL_VOLTAGE_CAUTION,
    "Real inverters add dead time, device drops and regular sampling; check the harmonics that matter for compliance by measurement.",
  ],
  compute(inputs) {
    const vdc = readQuantity(inputs, vdcInput);
    const ma = readQuantity(inputs, maInput);
    const mf = readQuantity(inputs, mfInput);
    const scheme = readChoice(inputs, schemeInput) as PwmScheme;
    const bridge = readChoice(inputs, bridgeInput);
    const f = readQuantity(inputs, fundamentalFrequencyInput);
    const hmax = readQuantity(inputs, hmaxInput);
    if (scheme === "unipolar" && bridge === "half") {
      throw fieldError("scheme", "Unipolar PWM needs two legs: choose a full bridge, or bipolar PWM for a half bridge.");
    }

    const warnings: string[] = [];
    const scale = bridge === "half" ? vdc / 2 : vdc;
    const overmodulated = ma > 1;
    const integerMf = Math.abs(mf - Math.round(mf)) < 1e-9;
    const highestOrder = Math.max(hmax, 50);

    if (overmodulated) {
      warnings.push(
        `ma = ${ma} > 1: overmodulation — low-order harmonics appear (3rd, 5th, 7th …) and the fundamental no longer rises in proportion to ma.`,
      );
    }

    let fundamentalPeak: number;
    let dc = 0;
    let vrms: number;
    let wthd: number;
    let lines: OrderPeak[];
    let wave: SteppedCycle;

    if (integerMf || overmodulated) {
      const ratio = integerMf ? Math.round(mf) : Math.max(3, Math.round(mf));
      if (!integerMf) {
        warnings.push(
          `mf = ${mf} is not an integer; in overmodulation the spectrum is computed for the nearest synchronous ratio, mf = ${ratio}. ` +
            (scheme === "bipolar" ? "mf should be an odd integer for bipolar PWM." : "Use an integer mf for an exact spectrum."),
        );
      } else if (scheme === "bipolar" && ratio % 2 === 0) {
        warnings.push(
          `mf should be an odd integer for bipolar PWM: with mf = ${ratio} the wave loses half-wave symmetry, so even harmonics (and a small DC offset) appear.`,
        );
      }
      wave = switchedCycle(ma, ratio, scheme);
      const normalizedPeaks = new Float64Array(highestOrder + 1);
      if (overmodulated) {
        const { a, b } = steppedCycleFourier(wave, highestOrder);
        for (let h = 1; h <= highestOrder; h++) normalizedPeaks[h] = Math.hypot(a[h]!, b[h]!);
      } else {
        const amplitudes = closedFormSpectrum(ma, ratio, scheme, highestOrder);
        for (let h = 1; h <= highestOrder; h++) normalizedPeaks[h] = Math.abs(amplitudes[h]!);
        if (Math.abs(normalizedPeaks[1]! - ma) > 1e-3 * ma) {
          warnings.push(
            `mf = ${ratio} is small: carrier sidebands fold onto the fundamental, which is ${(100 * (normalizedPeaks[1]! / ma - 1)).toFixed(2)} % away from the ideal ma value.`,
          );
        }
      }
      fundamentalPeak = normalizedPeaks[1]! * scale;
      const moments = steppedCycleMoments(wave);
      vrms = moments.rms * scale;
      dc = moments.mean * scale;
      wthd = steppedCycleWeightedThd(wave, normalizedPeaks[1]!);
      const evenOrders = scheme === "bipolar" && ratio % 2 === 0;
      for (let h = 1; h <= highestOrder; h++) normalizedPeaks[h]! *= scale;
      lines = linesFromOrders(normalizedPeaks, (n) => evenOrders || n % 2 === 1);
    } else {
      warnings.push(
        `mf = ${mf} is not an integer: the carrier is asynchronous, so lines fall between harmonic orders and are listed at their own (non-integer) orders. ` +
          (scheme === "bipolar" ? "mf should be an odd integer for bipolar PWM." : "An integer mf keeps every line on a harmonic order."),
      );
      const groups = scheme === "unipolar" ? 2 * WEIGHTED_GROUPS : WEIGHTED_GROUPS;
      const byOrder = new Map<number, { n: number; amplitude: number }>();
      visitSidebandLines(ma, mf, scheme, Math.max(highestOrder, Math.ceil(groups * mf)), (order, amplitude) => {
        // Lines of different groups meet only when m·mf is an integer; round away the arithmetic noise.
        const key = Math.round(order * 1e9);
        const line = byOrder.get(key);
        if (line) line.amplitude += amplitude;
        else byOrder.set(key, { n: order, amplitude });
      });
      const fundamental = byOrder.get(1e9)?.amplitude ?? ma;
      // Lines meet order 0 only when m·mf is a whole number: a DC term, reported on its own.
      dc = (byOrder.get(0)?.amplitude ?? 0) * scale;
      fundamentalPeak = Math.abs(fundamental) * scale;
      const all = [...byOrder.values()]
        .filter((line) => line.n !== 1 && line.n > 0)
        .map((line) => ({ n: line.n, peak: Math.abs(line.amplitude) * scale }))
        .sort((p, q) => p.n - q.n);
      wthd = weightedThdFromLines(fundamentalPeak, all);
      lines = all.filter((line) => line.peak >= LIST_BELOW * fundamentalPeak);
      vrms = scheme === "bipolar" ? scale : vdc * Math.sqrt((2 * ma) / Math.PI);
      wave = switchedCycle(ma, mf, scheme);
    }

    const firstGroup = scheme === "unipolar" ? 2 * mf : mf;
    if (hmax < firstGroup - 2) {
      warnings.push(
        `The harmonics table stops at order ${hmax}, below the switching harmonics around order ${Math.round(firstGroup)}; raise hmax to list them (thd already counts them).`,
      );
    }

    const fundamentalRms = fundamentalPeak / Math.SQRT2;
    // THD over harmonic orders ≥ 2: the RMS without the fundamental and without DC.
    const harmonicRms = Math.sqrt(Math.max(0, vrms * vrms - dc * dc));
    if (Math.abs(dc) > 1e-9 * fundamentalPeak) {
      warnings.push(`The output has a DC offset of ${scalar(dc, "V").display} (${scalar((100 * Math.abs(dc)) / fundamentalRms, "%").display} of the fundamental RMS); it is shown as dc and not counted in THD, which covers harmonic orders 2 and above.`);
    }
    return {
      results: {
        v1Peak: scalar(fundamentalPeak, "V"),
        v1Rms: scalar(fundamentalRms, "V"),
        vrms: scalar(vrms, "V"),
        thd: scalar(thdFromRms(harmonicRms, fundamentalRms), "%"),
        dc: scalar(dc, "V"),
        thd40: scalar(thdUpTo(fundamentalPeak, lines, 40), "%"),
        thd50: scalar(thdUpTo(fundamentalPeak, lines, 50), "%"),
        wthd: scalar(wthd, "%"),
        harmonics: harmonicTable(fundamentalPeak, lines, hmax, f),
        waveform: steppedCyclePoints(wave, scale),
      },
      warnings,
    };
  },
};
