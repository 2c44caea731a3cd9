/**
 * Three-phase carrier PWM of a two-level bridge: sine reference, third-harmonic
 * injection (1/6 and 1/4), space-vector modulation by min-max injection and
 * discontinuous PWM (DPWM1), naturally or regularly sampled.
 *
 * What it computes: the pole, line-to-line and phase (to a star load's floating
 * neutral) voltages over one cycle from their exact switching instants; the
 * fundamental, exact RMS, THD (all components, orders to 40 and 50) and weighted
 * THD of line and phase voltages; the line and phase spectra to hmax; the linear
 * range of the chosen reference and whether ma is beyond it.
 *
 * Conventions (per unit of Vdc/2, the pole voltage about the DC midpoint):
 * - Phase references ma·sin(θ − k·120°), k = 0, 1, 2, plus a common offset that
 *   depends on the scheme: sine 0; third-harmonic injection ma·sin 3θ/6 or /4;
 *   min-max injection −(max + min)/2 of the three sines (the carrier-based
 *   equivalent of space-vector modulation with equal zero-vector times); DPWM1
 *   ±1 − v_x, where x is the phase of largest magnitude, so that phase is clamped
 *   to its rail for the 60° about its peak.
 * - One triangle carrier (−1 … +1) for all three legs, synchronous, mf times the
 *   output frequency, with a valley at θ = 90°. A leg's upper switch is on while
 *   its reference is above the carrier.
 * - Natural sampling compares the references themselves. Symmetric regular
 *   sampling holds the reference sampled at each carrier valley for one carrier
 *   period; asymmetric regular sampling samples at every valley and peak and holds
 *   for half a period. The offset is applied before sampling.
 * - Line voltage v_ab = v_a0 − v_b0; phase voltage v_an = (2v_a0 − v_b0 − v_c0)/3.
 * - Ideal switches, no dead time, stiff DC link.
 *
 * Method: every crossing of a reference and the carrier is found on intervals
 * where the difference is monotone (the carrier's ramps split at every multiple
 * of 30°, where the offsets have their kinks and jumps; mf ≥ 9 and ma ≤ 2 make the
 * carrier steeper than any reference), by regula falsi (Illinois). The voltages
 * are then piecewise constant, so their Fourier coefficients, RMS and weighted THD
 * are exact sums over the switching instants (spectrum.ts); nothing is truncated.
 *
 * Closed forms this reproduces (checked in the tests): Holmes & Lipo, Pulse Width
 * Modulation for Power Converters, IEEE Press/Wiley, 2003 — naturally sampled
 * sine PWM of a three-phase leg pair, line-to-line lines
 * (8/(mπ))·J_n(mπM/2)·sin((m+n)π/2)·sin(nπ/3) of Vdc/2 (ch. 3; equation number
 * from memory, unverified), so sidebands with n a multiple of 3 cancel between
 * lines; the linear range of injected references to M = 2/√3 (ch. 5, from memory);
 * the overmodulation fundamental of a clipped sine (2/π)[M·asin(1/M) + √(1 − 1/M²)]
 * (derived; Hava, Kerkman & Lipo, IEEE Trans. Power Electronics, 1998, from
 * memory). The 1/4 injection's linear limit 6/(7·√(7/12)) ≈ 1.1223 follows from
 * the peak of sin θ + sin 3θ/4 (derived).
 */
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
import { carrier } from "./spwm";

export type ThreePhaseReference = "sine" | "thi6" | "thi4" | "svpwm" | "dpwm1";
export type Sampling = "natural" | "regular-symmetric" | "regular-asymmetric";

const vdcInput = dcLinkVoltageInput("540 V", "DC-link voltage across the bridge; each pole swings ±Vdc/2 about the midpoint.");

const maInput: QuantityInputSpec = {
  key: "ma",
  label: "Modulation index ma",
  description: "Peak of each phase's sine reference over the carrier peak (before any offset). Linear to 1 for sine, to 2/√3 ≈ 1.155 with injection or SVPWM.",
  kind: "quantity",
  dimension: "dimensionless",
  displayUnit: "",
  min: 0,
  minExclusive: true,
  max: 2,
  default: "0.9",
};

const mfInput: QuantityInputSpec = {
  key: "mf",
  label: "Frequency ratio mf",
  description: "Carrier (switching) frequency over output frequency, a whole number; an odd multiple of 3 keeps the three phases alike.",
  kind: "quantity",
  dimension: "dimensionless",
  displayUnit: "",
  min: 9,
  max: 400,
  integer: true,
  default: "51",
};

const referenceInput: ChoiceInputSpec = {
  key: "reference",
  label: "Reference",
  description: "The modulating wave of each leg: a sine, or a sine plus a common offset that all three legs share.",
  kind: "choice",
  options: [
    { value: "sine", label: "Sine" },
    { value: "thi6", label: "Sine + 1/6 third harmonic" },
    { value: "thi4", label: "Sine + 1/4 third harmonic" },
    { value: "svpwm", label: "Space vector (min-max injection)" },
    { value: "dpwm1", label: "Discontinuous, 60° clamp at the peaks (DPWM1)" },
  ],
  default: "svpwm",
};

const samplingInput: ChoiceInputSpec = {
  key: "sampling",
  label: "Sampling",
  description: "Natural: analogue comparison. Regular: the reference is sampled and held, once (symmetric) or twice (asymmetric) per carrier period.",
  kind: "choice",
  options: [
    { value: "natural", label: "Natural" },
    { value: "regular-symmetric", label: "Regular, symmetric" },
    { value: "regular-asymmetric", label: "Regular, asymmetric" },
  ],
  default: "natural",
};

const hmaxInput = highestOrderInput("200");

/** Lines below this fraction of the fundamental are not listed (they are rounding noise or exactly cancelled). */
const LIST_BELOW = 1e-9;

const TWO_PI = 2 * Math.PI;
const THIRD = TWO_PI / 3;

/** The largest ma for which the reference stays within the carrier (no pulse dropping). */
export function linearLimit(reference: ThreePhaseReference): number {
  if (reference === "sine") return 1;
  if (reference === "thi4") return 6 / (7 * Math.sqrt(7 / 12));
  return 2 / Math.sqrt(3);
}

/** The three leg references at θ (per unit of Vdc/2), written into `out`. */
export function legReferences(reference: ThreePhaseReference, ma: number, theta: number, out: Float64Array): Float64Array {
  const a = ma * Math.sin(theta);
  const b = ma * Math.sin(theta - THIRD);
  const c = ma * Math.sin(theta + THIRD);
  let offset = 0;
  if (reference === "thi6") offset = (ma * Math.sin(3 * theta)) / 6;
  else if (reference === "thi4") offset = (ma * Math.sin(3 * theta)) / 4;
  else if (reference === "svpwm") offset = -(Math.max(a, b, c) + Math.min(a, b, c)) / 2;
  else if (reference === "dpwm1") {
    const largest = Math.abs(a) >= Math.abs(b) && Math.abs(a) >= Math.abs(c) ? a : Math.abs(b) >= Math.abs(c) ? b : c;
    offset = (largest >= 0 ? 1 : -1) - largest;
  }
  out[0] = a + offset;
  out[1] = b + offset;
  out[2] = c + offset;
  // The clamped leg sits exactly on its rail, not a rounding error away from it.
  if (reference === "dpwm1") for (let k = 0; k < 3; k++) if (Math.abs(Math.abs(out[k]!) - 1) < 1e-12) out[k] = Math.sign(out[k]!);
  return out;
}

/** Root of g on [lo, hi] where g changes sign once: regula falsi with the Illinois step. */
function bracketedRoot(g: (t: number) => number, lo: number, hi: number, gLo: number, gHi: number): number {
  let a = lo;
  let b = hi;
  let ga = gLo;
  let gb = gHi;
  let side = 0;
  for (let i = 0; i < 100; i++) {
    const t = (a * gb - b * ga) / (gb - ga);
    const gt = g(t);
    if (gt === 0 || b - a <= 1e-15 * Math.max(1, Math.abs(t))) return t;
    if (Math.sign(gt) === Math.sign(ga)) {
      a = t;
      ga = gt;
      if (side === -1) gb /= 2;
      side = -1;
    } else {
      b = t;
      gb = gt;
      if (side === 1) ga /= 2;
      side = 1;
    }
    if (Math.abs(gt) < 1e-15) return t;
  }
  return (a + b) / 2;
}

/**
 * The three pole voltages (levels ±1 of Vdc/2) over one cycle, from their exact
 * switching instants.
 */
export function poleCycles(reference: ThreePhaseReference, ma: number, mf: number, sampling: Sampling): SteppedCycle[] {
  // With mf a multiple of 3 the carrier repeats every 120°, so legs b and c are leg a delayed by 120° and 240°.
  const legsToSolve = mf % 3 === 0 ? [0] : [0, 1, 2];
  // Interval boundaries: carrier vertices (the sampling instants too) and every multiple of 30°.
  const pieces: number[] = [0, TWO_PI];
  for (let j = Math.ceil(-mf / 2); j <= Math.floor(1.5 * mf); j++) {
    const theta = Math.PI / 2 + (j * Math.PI) / mf;
    if (theta > 0 && theta < TWO_PI) pieces.push(theta);
  }
  for (let k = 1; k < 12; k++) pieces.push((k * Math.PI) / 6);
  pieces.sort((p, q) => p - q);

  const refs = new Float64Array(3);
  // Regular sampling: the carrier vertex that starts the hold containing θ (valleys at even j).
  const hold = sampling === "regular-symmetric" ? TWO_PI / mf : Math.PI / mf;
  const sampleAngle = (theta: number) => Math.PI / 2 + hold * Math.floor((theta - Math.PI / 2) / hold);

  const solved = legsToSolve.map((leg) => {
    const starts: number[] = [];
    const levels: number[] = [];
    for (let p = 0; p + 1 < pieces.length; p++) {
      const lo = pieces[p]!;
      const hi = pieces[p + 1]!;
      if (hi <= lo) continue;
      // A held reference is constant over the whole interval (its ends are vertices): sample at the middle.
      const held = sampling === "natural" ? undefined : legReferences(reference, ma, sampleAngle((lo + hi) / 2), refs)[leg]!;
      const g = (t: number) => (held ?? legReferences(reference, ma, t, refs)[leg]!) - carrier(t, mf);
      // Evaluate just inside the interval: references may jump at its ends.
      const inset = 1e-10 * (hi - lo);
      const gLo = g(lo + inset);
      const gHi = g(hi - inset);
      starts.push(lo);
      levels.push(gLo > 0 ? 1 : -1);
      if (gLo > 0 !== gHi > 0) {
        starts.push(bracketedRoot(g, lo + inset, hi - inset, gLo, gHi));
        levels.push(gHi > 0 ? 1 : -1);
      }
    }
    return steppedCycle(starts, levels);
  });
  return solved.length === 3 ? solved : [solved[0]!, delayedCycle(solved[0]!, THIRD), delayedCycle(solved[0]!, 2 * THIRD)];
}

/** The cycle w(θ − delay). */
export function delayedCycle(wave: SteppedCycle, delay: number): SteppedCycle {
  const count = wave.levels.length;
  const segments: { start: number; level: number }[] = [];
  for (let k = 0; k < count; k++) {
    const start = wave.edges[k]! + delay;
    segments.push({ start: start >= TWO_PI ? start - TWO_PI : start, level: wave.levels[k]! });
  }
  segments.sort((p, q) => p.start - q.start);
  // The segment that wraps past 2π also covers 0 up to the first shifted start.
  const wrapped = segments[segments.length - 1]!.level;
  return steppedCycle([0, ...segments.map((s) => s.start)], [wrapped, ...segments.map((s) => s.level)]);
}

/** Σ weight_k · cycle_k as one stepped cycle (the union of their edges). */
export function combineCycles(cycles: readonly SteppedCycle[], weights: readonly number[]): SteppedCycle {
  const edges = [...new Set(cycles.flatMap((c) => [...c.edges]))].sort((p, q) => p - q);
  const cursor = cycles.map(() => 0);
  const levels = edges.map((edge) =>
    cycles.reduce((sum, cycle, k) => {
      while (cursor[k]! + 1 < cycle.edges.length && cycle.edges[cursor[k]! + 1]! <= edge) cursor[k]!++;
      return sum + weights[k]! * cycle.levels[cursor[k]!]!;
    }, 0),
  );
  return steppedCycle(edges, levels);
}

/** Peaks by order 0 … highestOrder of a stepped cycle, scaled. */
function peaksOf(wave: SteppedCycle, scale: number, highestOrder: number, halfWave: boolean): Float64Array {
  const { a, b } = steppedCycleFourier(wave, highestOrder, halfWave);
  const peaks = new Float64Array(highestOrder + 1);
  for (let h = 1; h <= highestOrder; h += halfWave ? 2 : 1) peaks[h] = Math.hypot(a[h]!, b[h]!) * scale;
  return peaks;
}

/**
 * Line and phase peaks by order. When legs b and c are leg a delayed by 120° and 240°,
 * order h of v_a0 − v_b0 is |1 − e^{−j2πh/3}| = √3 times leg a's (0 for triplens), and
 * of the phase voltage (2 − 2cos(2πh/3))/3 = 1 times (0 for triplens): one transform serves both.
 */
function lineAndPhasePeaks(
  poles: SteppedCycle[],
  line: SteppedCycle,
  phase: SteppedCycle,
  delayed: boolean,
  halfWave: boolean,
  halfLink: number,
  highestOrder: number,
): { line: Float64Array; phase: Float64Array } {
  if (!delayed) return { line: peaksOf(line, halfLink, highestOrder, halfWave), phase: peaksOf(phase, halfLink / 3, highestOrder, halfWave) };
  const leg = peaksOf(poles[0]!, halfLink, highestOrder, halfWave);
  const linePeaks = new Float64Array(highestOrder + 1);
  const phasePeaks = new Float64Array(highestOrder + 1);
  for (let h = 1; h <= highestOrder; h++) {
    if (h % 3 === 0) continue;
    linePeaks[h] = Math.sqrt(3) * leg[h]!;
    phasePeaks[h] = leg[h]!;
  }
  return { line: linePeaks, phase: phasePeaks };
}

/** The orders above 1 whose line is not negligible. */
function listedLines(peaks: Float64Array): OrderPeak[] {
  return linesFromOrders(peaks, (n) => peaks[n]! >= LIST_BELOW * peaks[1]!);
}

export const calculator: Calculator = {
  id: "three-phase-pwm",
  title: "Three-phase carrier PWM",
  summary: "Line and phase spectra, THD and weighted THD of a two-level three-phase bridge: sine, third-harmonic, space-vector or discontinuous PWM.",
  description:
    "For a two-level three-phase bridge driven by one triangle carrier, gives the fundamental of the line-to-line and " +
    "phase voltages, their harmonics up to the chosen order, the exact RMS, the THD over all components and over orders " +
    "to 40 and 50, and the weighted THD, for a sine reference, third-harmonic injection (1/6 or 1/4), space-vector " +
    "modulation (min-max injection) or 60° discontinuous PWM, naturally or regularly sampled. It states the reference's " +
    "linear range (to 2/√3 with injection) and computes overmodulation from the exact switching instants.",
  inputs: [vdcInput, maInput, mfInput, referenceInput, samplingInput, fundamentalFrequencyInput, hmaxInput],
  outputs: [
    { key: "v1LinePeak", label: "Line-to-line fundamental peak", kind: "scalar", unit: "V" },
    { key: "v1LineRms", label: "Line-to-line fundamental RMS", kind: "scalar", unit: "V" },
    { key: "v1PhaseRms", label: "Phase fundamental RMS (star load)", kind: "scalar", unit: "V" },
    { key: "vLineRms", label: "Line-to-line RMS (all components)", kind: "scalar", unit: "V" },
    { key: "vPhaseRms", label: "Phase RMS (all components)", kind: "scalar", unit: "V" },
    { key: "thd", label: "Line-to-line THD, all components", kind: "scalar", unit: "%" },
    { key: "thd40", label: "Line-to-line THD, orders 2–40", kind: "scalar", unit: "%" },
    { key: "thd50", label: "Line-to-line THD, orders 2–50", kind: "scalar", unit: "%" },
    { key: "wthd", label: "Line-to-line weighted THD", kind: "scalar", unit: "%" },
    { key: "thdPhase", label: "Phase THD, all components", kind: "scalar", unit: "%" },
    { key: "wthdPhase", label: "Phase weighted THD", kind: "scalar", unit: "%" },
    { key: "maLinear", label: "End of the linear range (ma)", kind: "scalar", unit: "" },
    { key: "sixStepFraction", label: "Fundamental as a share of six-step", kind: "scalar", unit: "%", description: "V1 over the six-step fundamental (2/π)·Vdc per pole: how much of the bridge's voltage is used." },
    { key: "overmodulated", label: "Overmodulated", kind: "boolean", description: "True when ma is beyond the reference's linear range." },
    { key: "harmonics", label: "Line-to-line harmonics", kind: "harmonics", description: "Fundamental first, then every order with a line, up to hmax; cancelled orders (triplens) are not listed." },
    { key: "phaseHarmonics", label: "Phase harmonics", kind: "harmonics" },
    { key: "waveform", label: "Line-to-line voltage, one cycle", kind: "waveform" },
    { key: "phaseWaveform", label: "Phase voltage, one cycle", kind: "waveform" },
  ],
  formulas: [
    {
      label: "Line-to-line line at order m·mf + n, natural sine PWM (of Vdc/2)",
      latex: String.raw`\frac{V_{ab,\,m m_f+n}}{V_{dc}/2} = \frac{8}{m\pi}\,J_n\!\left(m\frac{\pi}{2}m_a\right)\sin\!\left((m+n)\frac{\pi}{2}\right)\sin\!\left(n\frac{\pi}{3}\right)`,
    },
    { label: "Fundamental, linear range", latex: String.raw`V_{ab,1} = \sqrt{3}\,m_a\frac{V_{dc}}{2},\qquad m_a \le 1\ \text{(sine)},\ \tfrac{2}{\sqrt{3}}\ \text{(injection, SVPWM, DPWM1)}` },
    { label: "Min-max (space-vector) offset", latex: String.raw`v_0 = -\tfrac{1}{2}\left(\max(v_a,v_b,v_c) + \min(v_a,v_b,v_c)\right)` },
    { label: "DPWM1 offset (x: phase of largest |v|)", latex: String.raw`v_0 = \operatorname{sgn}(v_x) - v_x` },
    { label: "Phase voltage of a star load", latex: String.raw`v_{an} = \tfrac{1}{3}\left(2v_{a0} - v_{b0} - v_{c0}\right)` },
    { label: "Weighted THD", latex: String.raw`\mathrm{WTHD} = \frac{\sqrt{\sum_{n\ge 2} (V_n/n)^2}}{V_1}` },
  ],
  conventions: [
    "ma is the peak of each phase's sine reference over the carrier peak, before the common offset; pole voltages are ±Vdc/2 about the DC midpoint.",
    "One synchronous triangle carrier for all legs, valley at 90°. Regular sampling samples the reference (offset included) at each valley (symmetric) or at each valley and peak (asymmetric).",
    "Phase voltage is to the floating neutral of a balanced star load; common-mode (triplen) components appear in neither line nor phase voltage.",
    "Harmonic percentages are of the fundamental (THD_F, as in IEEE Std 519). thd counts every component exactly (from the RMS); thd40 and thd50 count orders to 40 and 50; none depends on hmax.",
    "Weighted THD divides each line by its order (Holmes & Lipo's definition), a proxy for the ripple current of an inductive load; exact, no truncation.",
    "DPWM1's offset jumps where the clamped phase changes; with natural sampling those jumps fall inside carrier periods and add low-order lines (a few percent at mf = 51). Regular sampling puts them on sampling instants.",
    "Ideal switches, no dead time, stiff DC link. mf must be a whole number of at least 9, and ma at most 2, so the carrier ramps are steeper than any reference.",
  ],
  sources: [
    "Holmes & Lipo, Pulse Width Modulation for Power Converters, IEEE Press/Wiley, 2003, ch. 3: double Fourier series of naturally sampled PWM, three-phase line-to-line lines and triplen cancellation (equation numbers from memory, unverified) — published.",
    "Holmes & Lipo 2003, ch. 4 (regular sampling) and ch. 5 (third-harmonic and space-vector offsets, discontinuous PWM, linear range to 2/√3) — published; section numbers from memory.",
    "Hava, Kerkman & Lipo, IEEE Trans. Power Electronics, 1998: carrier-based PWM overmodulation and discontinuous schemes — memory.",
    "Linear limit of the 1/4 injection, 6/(7√(7/12)), from the peak of sin θ + sin 3θ/4 — derived.",
  ],
  cautions: [
    LETHAL_VOLTAGE_CAUTION,
    "Dead time, device drops and a DC link with ripple add low-order harmonics that this ideal model does not show; confirm compliance-relevant harmonics by measurement.",
  ],
  compute(inputs) {
    const vdc = readQuantity(inputs, vdcInput);
    const ma = readQuantity(inputs, maInput);
    const mf = readQuantity(inputs, mfInput);
    const reference = readChoice(inputs, referenceInput) as ThreePhaseReference;
    const sampling = readChoice(inputs, samplingInput) as Sampling;
    const f = readQuantity(inputs, fundamentalFrequencyInput);
    const hmax = readQuantity(inputs, hmaxInput);

    const warnings: string[] = [];
    const limit = linearLimit(reference);
    const overmodulated = ma > limit + 1e-12;
    if (overmodulated) {
      warnings.push(
        `ma = ${ma} is beyond this reference's linear range (${limit.toFixed(4)}): pulses drop, low-order harmonics (5th, 7th, 11th …) appear and the fundamental no longer rises in proportion to ma.`,
      );
    }
    if (mf % 3 !== 0) {
      warnings.push(`mf = ${mf} is not a multiple of 3: the three legs see the carrier at different phases, and the line voltages differ slightly from one another.`);
    }
    if (reference === "dpwm1") {
      warnings.push("DPWM1 leaves each leg unswitched for a third of the cycle: switching losses fall, but the device carrying the peak current stays on longer.");
    }
    if (mf % 2 === 0) warnings.push(`mf = ${mf} is even: the wave loses half-wave symmetry, so even harmonics appear.`);

    const halfLink = vdc / 2;
    const poles = poleCycles(reference, ma, mf, sampling);
    const line = combineCycles([poles[0]!, poles[1]!], [1, -1]);
    // Integer weights keep equal levels bit-equal; the phase wave is in units of Vdc/6.
    const phase = combineCycles(poles, [2, -1, -1]);
    const phaseUnit = halfLink / 3;
    const highestOrder = Math.max(hmax, 50);

    // Odd mf with natural or asymmetric sampling: v(θ + π) = −v(θ) (the carrier and every offset are odd about π), so no even orders.
    const halfWave = mf % 2 === 1 && sampling !== "regular-symmetric";
    const peaks = lineAndPhasePeaks(poles, line, phase, mf % 3 === 0, halfWave, halfLink, highestOrder);
    const lineLines = listedLines(peaks.line);
    const phaseLines = listedLines(peaks.phase);
    const v1Line = peaks.line[1]!;
    const v1Phase = peaks.phase[1]!;
    const vLineRms = steppedCycleMoments(line).rms * halfLink;
    const vPhaseRms = steppedCycleMoments(phase).rms * phaseUnit;
    if (!(v1Line > 0)) throw fieldError("ma", "The output has no fundamental at these inputs; raise ma.");

    return {
      results: {
        v1LinePeak: scalar(v1Line, "V"),
        v1LineRms: scalar(v1Line / Math.SQRT2, "V"),
        v1PhaseRms: scalar(v1Phase / Math.SQRT2, "V"),
        vLineRms: scalar(vLineRms, "V"),
        vPhaseRms: scalar(vPhaseRms, "V"),
        thd: scalar(thdFromRms(vLineRms, v1Line / Math.SQRT2), "%"),
        thd40: scalar(thdUpTo(v1Line, lineLines, 40), "%"),
        thd50: scalar(thdUpTo(v1Line, lineLines, 50), "%"),
        wthd: scalar(steppedCycleWeightedThd(line, v1Line / halfLink), "%"),
        thdPhase: scalar(thdFromRms(vPhaseRms, v1Phase / Math.SQRT2), "%"),
        wthdPhase: scalar(steppedCycleWeightedThd(phase, v1Phase / phaseUnit), "%"),
        maLinear: scalar(limit, ""),
        sixStepFraction: scalar((100 * v1Phase) / ((2 / Math.PI) * vdc), "%"),
        overmodulated,
        harmonics: harmonicTable(v1Line, lineLines, hmax, f),
        phaseHarmonics: harmonicTable(v1Phase, phaseLines, hmax, f),
        waveform: steppedCyclePoints(line, halfLink),
        phaseWaveform: steppedCyclePoints(phase, phaseUnit),
      },
      warnings,
    };
  },
};
