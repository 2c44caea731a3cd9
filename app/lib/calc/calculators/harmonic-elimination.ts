/**
 * Selective harmonic elimination: the switching angles of a quarter-wave-symmetric
 * wave that give a wanted fundamental while removing chosen harmonics.
 *
 * Waves (first quarter cycle, angles 0 < α_1 < … < α_k < 90°, mirrored about 90°
 * and negated for the second half cycle; odd harmonics only):
 * - stepped: a staircase of k equal steps of Vdc (cascaded cells, one per angle),
 *   V_n = (4Vdc/(nπ))·Σ cos nα_i;
 * - two-level: a bipolar wave ±Vdc that starts at +Vdc and reverses at each angle,
 *   V_n = (4Vdc/(nπ))·[1 + 2·Σ (−1)^i cos nα_i]  (Patel & Hoft, IEEE Trans. Industry
 *   Applications, 1973, part I; form from memory, unverified);
 * - three-level: a unipolar notched wave 0/+Vdc that starts at 0 and toggles at
 *   each angle, V_n = (4Vdc/(nπ))·Σ (−1)^{i+1} cos nα_i  (Patel & Hoft 1974, part II;
 *   from memory, unverified).
 * The wanted fundamental is m times the largest a square wave of the same levels
 * gives: V1 = m·k·4Vdc/π (stepped) or m·4Vdc/π (two- and three-level).
 *
 * Method: k = (number of harmonics removed) + 1 equations in k angles,
 * F_0 = Σ s_i cos α_i + c_0 − m·M,  F_j = Σ s_i cos n_jα_i + c_0, solved by
 * Newton–Raphson with backtracking (each step shortened until |F| falls, so it
 * still descends where no root exists) from a fixed set of well-spread starting
 * points (a Halton sequence over the ordered angles). Every
 * distinct, strictly ordered solution with |F| < 1e-10 is reported; if there is
 * none, the ordered point of smallest residual is shown with the harmonics it
 * leaves, so the engineer sees how close the wanted set came.
 *
 * Checks: the two-angle staircase removing the 3rd has a closed form through
 * cos 3α = 4cos³α − 3cos α (the resultant method of Chiasson, Tolbert, McKenzie &
 * Du, IEEE Trans. Power Electronics, 2004 — from memory; the algebra is derived);
 * the tests also synthesize each wave and take its FFT.
 */
import { fieldError } from "../errors";
import { scalar } from "../format";
import { harmonicTable, steppedCycle, steppedCycleMoments, steppedCyclePoints, thdFromRms, thdUpTo, type OrderPeak } from "../spectrum";
import type { Calculator, ChoiceInputSpec, OutputSpec, QuantityInputSpec, QuantityListInputSpec, Results } from "../types";
import {
  LETHAL_VOLTAGE_CAUTION,
  dcLinkVoltageInput,
  fundamentalFrequencyInput,
  highestOrderInput,
  readChoice,
  readQuantity,
  readQuantityList,
} from "./shared-inputs";

export type EliminationWave = "stepped" | "two-level" | "three-level";

/** Most angles solved for (harmonics removed + 1). */
export const MAX_ANGLES = 6;

const vdcInput = dcLinkVoltageInput("48 V", "Stepped: the voltage of one step (one cell). Two-level: the output swings ±Vdc. Three-level: the output steps 0 and ±Vdc.");

const waveInput: ChoiceInputSpec = {
  key: "wave",
  label: "Wave",
  description: "Stepped: a staircase, one step per angle. Two-level: a bipolar wave reversing at each angle. Three-level: a unipolar notched wave.",
  kind: "choice",
  options: [
    { value: "stepped", label: "Stepped (multilevel staircase)" },
    { value: "two-level", label: "Two-level (bipolar notches)" },
    { value: "three-level", label: "Three-level (unipolar notches)" },
  ],
  default: "stepped",
};

const mInput: QuantityInputSpec = {
  key: "m",
  label: "Modulation index m",
  description: "Wanted fundamental over the square wave's (k steps for a staircase): V1 = m·k·4Vdc/π stepped, m·4Vdc/π otherwise.",
  kind: "quantity",
  dimension: "dimensionless",
  displayUnit: "",
  min: 0,
  minExclusive: true,
  max: 1,
  default: "0.8",
};

const eliminateInput: QuantityListInputSpec = {
  key: "eliminate",
  label: "Harmonics to remove",
  description: "Odd orders above 1, e.g. 5, 7. One more angle than harmonics is solved for.",
  kind: "quantityList",
  dimension: "dimensionless",
  displayUnit: "",
  min: 3,
  max: 199,
  minItems: 1,
  maxItems: MAX_ANGLES - 1,
  default: "5, 7",
};

const pickInput: QuantityInputSpec = {
  key: "pick",
  label: "Solution shown",
  description: "Solutions are numbered by THD, lowest first; the results show this one.",
  kind: "quantity",
  dimension: "dimensionless",
  displayUnit: "",
  min: 1,
  max: 50,
  integer: true,
  default: "1",
};

const hmaxInput = highestOrderInput("49");

/** A point counts as a solution when every equation is met to this (per unit of 4Vdc/π). */
const SOLVED_BELOW = 1e-10;
/** Two solutions are the same when every angle agrees to this (rad). */
const SAME_WITHIN = 1e-6;
/** Angles closer than this (rad) to each other or to 0° or 90° are not a usable switching pattern. */
const SEPARATION = 1e-5;
const STARTS = 60;

const QUARTER = Math.PI / 2;

interface Wave {
  /** Sign s_i of each angle's cosine term. */
  sign: (i: number) => number;
  /** Constant c_0 of every equation. */
  offset: number;
  /** Fundamental of the square wave of these levels, per unit of 4Vdc/π. */
  fullScale: number;
  /** Level (in Vdc) in the first quarter after `count` angles have passed. */
  level: (count: number) => number;
}

/**
 * The wave with k angles. A two-level wave with an odd number of angles starts at −Vdc so that it ends
 * at +Vdc at 90° (a positive fundamental), as in Patel & Hoft's two waveform types.
 */
function waveOf(wave: EliminationWave, k: number): Wave {
  if (wave === "stepped") return { sign: () => 1, offset: 0, fullScale: k, level: (count) => count };
  if (wave === "three-level") return { sign: (i) => (i % 2 === 0 ? 1 : -1), offset: 0, fullScale: 1, level: (count) => count % 2 };
  const first = k % 2 === 1 ? -1 : 1;
  return { sign: (i) => first * (i % 2 === 0 ? -2 : 2), offset: first, fullScale: 1, level: (count) => first * (count % 2 === 0 ? 1 : -1) };
}

/** Per unit of 4Vdc/π: n·V_n for angles α (so that the equations need no 1/n). */
function weightedHarmonic(wave: Wave, angles: ArrayLike<number>, n: number): number {
  let sum = wave.offset;
  for (let i = 0; i < angles.length; i++) sum += wave.sign(i) * Math.cos(n * angles[i]!);
  return sum;
}

/** Solves A·x = b in place (Gaussian elimination, partial pivoting); false when singular. */
function solveLinear(a: number[][], b: number[]): boolean {
  const size = b.length;
  for (let col = 0; col < size; col++) {
    let pivot = col;
    for (let row = col + 1; row < size; row++) if (Math.abs(a[row]![col]!) > Math.abs(a[pivot]![col]!)) pivot = row;
    if (Math.abs(a[pivot]![col]!) < 1e-300) return false;
    [a[col], a[pivot]] = [a[pivot]!, a[col]!];
    [b[col], b[pivot]] = [b[pivot]!, b[col]!];
    for (let row = col + 1; row < size; row++) {
      const factor = a[row]![col]! / a[col]![col]!;
      for (let c = col; c < size; c++) a[row]![c]! -= factor * a[col]![c]!;
      b[row]! -= factor * b[col]!;
    }
  }
  for (let row = size - 1; row >= 0; row--) {
    let sum = b[row]!;
    for (let c = row + 1; c < size; c++) sum -= a[row]![c]! * b[c]!;
    b[row] = sum / a[row]![row]!;
  }
  return true;
}

export interface EliminationProblem {
  wave: EliminationWave;
  m: number;
  eliminate: number[];
}

const norm = (values: ArrayLike<number>) => {
  let sum = 0;
  for (let i = 0; i < values.length; i++) sum += values[i]! * values[i]!;
  return Math.sqrt(sum);
};

/**
 * Newton's method from one start, each step shortened until the residual falls (backtracking), angles
 * kept in [0, 90°] and ascending. Ends at a root or where no shorter step helps (the nearest it came).
 * Works in preallocated arrays: it runs from every start on every keystroke.
 */
function descend(problem: EliminationProblem, start: number[]): { angles: number[]; residual: number } {
  const k = start.length;
  const wave = waveOf(problem.wave, k);
  const orders = Float64Array.from([1, ...problem.eliminate]);
  const signs = Float64Array.from({ length: k }, (_, i) => wave.sign(i));
  const target = problem.m * wave.fullScale;
  const residualInto = (angles: Float64Array, out: Float64Array) => {
    let sumSquares = 0;
    for (let j = 0; j < k; j++) {
      let sum = wave.offset - (j === 0 ? target : 0);
      for (let i = 0; i < k; i++) sum += signs[i]! * Math.cos(orders[j]! * angles[i]!);
      out[j] = sum;
      sumSquares += sum * sum;
    }
    return Math.sqrt(sumSquares);
  };
  let angles = Float64Array.from(start);
  let f = new Float64Array(k);
  let trial = new Float64Array(k);
  let trialF = new Float64Array(k);
  let cost = residualInto(angles, f);
  const jacobian = Array.from({ length: k }, () => new Array<number>(k).fill(0));
  const step = new Array<number>(k).fill(0);
  for (let iteration = 0; iteration < 30 && cost > SOLVED_BELOW * 1e-3; iteration++) {
    // J[j][i] = ∂F_j/∂α_i = −s_i·n_j·sin(n_j α_i)
    for (let j = 0; j < k; j++) {
      for (let i = 0; i < k; i++) jacobian[j]![i] = -signs[i]! * orders[j]! * Math.sin(orders[j]! * angles[i]!);
      step[j] = -f[j]!;
    }
    if (!solveLinear(jacobian, step)) break;
    let moved = false;
    for (let scale = 1; scale > 1e-3 && !moved; scale /= 2) {
      for (let i = 0; i < k; i++) trial[i] = Math.min(QUARTER, Math.max(0, angles[i]! + scale * step[i]!));
      trial.sort();
      const trialCost = residualInto(trial, trialF);
      if (trialCost < cost) {
        [angles, trial] = [trial, angles];
        [f, trialF] = [trialF, f];
        cost = trialCost;
        moved = true;
      }
    }
    if (!moved) break;
  }
  return { angles: Array.from(angles), residual: cost };
}

/** Starting points spread over the ordered simplex 0 < α_1 < … < α_k < 90° (a Halton sequence, sorted). */
function startingPoints(k: number): number[][] {
  const primes = [2, 3, 5, 7, 11, 13];
  const halton = (index: number, base: number) => {
    let result = 0;
    let fraction = 1 / base;
    for (let i = index; i > 0; i = Math.floor(i / base), fraction /= base) result += fraction * (i % base);
    return result;
  };
  return Array.from({ length: STARTS }, (_, s) =>
    Array.from({ length: k }, (_, i) => QUARTER * (0.02 + 0.96 * halton(s + 1, primes[i]!))).sort((p, q) => p - q),
  );
}

const usable = (angles: readonly number[]) =>
  angles.every((alpha, i) => alpha > SEPARATION && alpha < QUARTER - SEPARATION && (i === 0 || alpha - angles[i - 1]! > SEPARATION));

/** Every distinct solution found, and the usable point that came closest when there is none. */
export function solveElimination(problem: EliminationProblem): { solutions: number[][]; closest: { angles: number[]; residual: number } | undefined } {
  // Newton from every start; a root is kept when its angles are strictly ascending inside (0°, 90°).
  const k = problem.eliminate.length + 1;
  const solutions: number[][] = [];
  let closest: { angles: number[]; residual: number } | undefined;
  for (const start of startingPoints(k)) {
    const end = descend(problem, start);
    if (end.residual < SOLVED_BELOW && usable(end.angles)) {
      if (!solutions.some((known) => known.every((alpha, i) => Math.abs(alpha - end.angles[i]!) < SAME_WITHIN))) solutions.push(end.angles);
    } else if (!closest || end.residual < closest.residual) {
      // A root with coinciding angles or one at 0° or 90° is not a usable pattern; it still shows how close the search came.
      closest = end;
    }
  }
  return { solutions, closest };
}

/** One cycle of the wave for given angles, in units of Vdc. */
export function waveCycle(wave: EliminationWave, angles: readonly number[]) {
  const k = angles.length;
  const { level } = waveOf(wave, k);
  const starts = [0];
  const levels = [level(0)];
  angles.forEach((alpha, i) => {
    starts.push(alpha);
    levels.push(level(i + 1));
  });
  for (let i = k - 1; i >= 0; i--) {
    starts.push(Math.PI - angles[i]!);
    levels.push(level(i));
  }
  const positiveHalf = starts.length;
  for (let i = 0; i < positiveHalf; i++) {
    starts.push(Math.PI + starts[i]!);
    levels.push(-levels[i]!);
  }
  return steppedCycle(starts, levels);
}

const angleOutputs: OutputSpec[] = Array.from({ length: MAX_ANGLES }, (_, i) => ({
  key: `alpha${i + 1}`,
  label: `Angle α${i + 1}`,
  kind: "scalar",
  unit: "deg",
  description: i === 0 ? "Switching angles of the solution shown, ascending in the first quarter cycle; as many as harmonics removed + 1." : undefined,
}));

const formatAngles = (angles: readonly number[]) => angles.map((a) => `${((a * 180) / Math.PI).toFixed(2)}°`).join(", ");

export const calculator: Calculator = {
  id: "harmonic-elimination",
  title: "Selective harmonic elimination",
  summary: "Switching angles of a stepped, two-level or three-level wave that give a wanted fundamental and remove chosen harmonics.",
  description:
    "Solves for the angles in the first quarter cycle of a quarter-wave-symmetric wave — a multilevel staircase or a " +
    "two- or three-level notched wave — that set the fundamental to a chosen fraction of the square wave's and make the " +
    "chosen harmonics zero. Searches from many starting points and reports every distinct solution (numbered by THD), " +
    "or says plainly that none was found and shows the closest set with the harmonics it leaves.",
  inputs: [vdcInput, waveInput, mInput, eliminateInput, pickInput, fundamentalFrequencyInput, hmaxInput],
  outputs: [
    { key: "solved", label: "Solution found", kind: "boolean", description: "False when no set of angles meets the wanted fundamental and removes every chosen order." },
    { key: "solutionCount", label: "Distinct solutions found", kind: "scalar", unit: "" },
    ...angleOutputs,
    { key: "v1Peak", label: "Fundamental peak", kind: "scalar", unit: "V" },
    { key: "v1Rms", label: "Fundamental RMS", kind: "scalar", unit: "V" },
    { key: "vrms", label: "Output RMS (all components)", kind: "scalar", unit: "V" },
    { key: "thd", label: "THD, all harmonics", kind: "scalar", unit: "%" },
    { key: "thd40", label: "THD, orders 2–40", kind: "scalar", unit: "%" },
    { key: "thd50", label: "THD, orders 2–50", kind: "scalar", unit: "%" },
    { key: "residual", label: "Largest chosen harmonic left", kind: "scalar", unit: "%", description: "Of the fundamental; 0 for a solution, the shortfall for the closest set when there is none." },
    { key: "harmonics", label: "Harmonics", kind: "harmonics", description: "Fundamental first, then odd orders up to hmax." },
    { key: "waveform", label: "Output voltage, one cycle", kind: "waveform" },
  ],
  formulas: [
    { label: "Stepped wave, harmonic n", latex: String.raw`V_n = \frac{4V_{dc}}{n\pi}\sum_{i=1}^{k}\cos n\alpha_i` },
    { label: "Two-level wave, harmonic n", latex: String.raw`V_n = \frac{4V_{dc}}{n\pi}\Big[1 + 2\sum_{i=1}^{k}(-1)^i\cos n\alpha_i\Big]` },
    { label: "Three-level wave, harmonic n", latex: String.raw`V_n = \frac{4V_{dc}}{n\pi}\sum_{i=1}^{k}(-1)^{i+1}\cos n\alpha_i` },
    { label: "Equations solved", latex: String.raw`V_1 = m\,V_{1,\text{square}},\qquad V_{n_j} = 0,\ j = 1\ldots k-1` },
  ],
  conventions: [
    "Angles are in the first quarter cycle, ascending, measured from the zero crossing; the wave mirrors about 90° and the second half cycle is the negative of the first.",
    "m is the wanted fundamental over that of a square wave of the same levels (all k steps for a staircase).",
    "Solutions are numbered by THD (all harmonics), lowest first; the warnings list every one found with its angles.",
    "The search starts from 60 spread points; a solution none of them leads to can exist, so 'none found' means none near any start — the closest set is shown.",
    "Ideal switches and equal step voltages.",
  ],
  sources: [
    "Patel & Hoft, Generalized techniques of harmonic elimination and voltage control in thyristor inverters, IEEE Trans. Industry Applications, part I (1973, two-level) and part II (1974, three-level) — published; equation forms from memory, unverified.",
    "Chiasson, Tolbert, McKenzie & Du, A complete solution to the harmonic elimination problem, IEEE Trans. Power Electronics, 2004 (stepped multilevel waves; resultant method) — memory.",
    "Staircase and notched-wave series from the Fourier series of symmetric pulses (Rashid, Power Electronics, 3rd ed., ch. 6) — published; section from memory.",
  ],
  cautions: [
    LETHAL_VOLTAGE_CAUTION,
    "Harmonics not chosen are not controlled and can grow; check the whole spectrum against the applicable limits. Unequal cell voltages and switching delays move every angle's effect.",
  ],
  compute(inputs) {
    const vdc = readQuantity(inputs, vdcInput);
    const wave = readChoice(inputs, waveInput) as EliminationWave;
    const m = readQuantity(inputs, mInput);
    const eliminate = readQuantityList(inputs, eliminateInput);
    const pick = readQuantity(inputs, pickInput);
    const f = readQuantity(inputs, fundamentalFrequencyInput);
    const hmax = readQuantity(inputs, hmaxInput);
    if (eliminate.some((n) => !Number.isInteger(n) || n % 2 === 0)) {
      throw fieldError("eliminate", "Harmonics to remove must be odd whole orders (3, 5, 7 …): a quarter-wave-symmetric wave has no even ones.");
    }
    if (new Set(eliminate).size < eliminate.length) throw fieldError("eliminate", "Each order may be listed once.");

    const problem: EliminationProblem = { wave, m, eliminate: [...eliminate].sort((p, q) => p - q) };
    const { solutions, closest } = solveElimination(problem);
    const warnings: string[] = [];
    const orders = problem.eliminate.join(", ");
    const described = solutions.map((angles) => {
      const cycle = waveCycle(wave, angles);
      const v1 = Math.abs(weightedHarmonic(waveOf(wave, angles.length), angles, 1)) * (4 / Math.PI);
      return { angles, thd: thdFromRms(steppedCycleMoments(cycle).rms, v1 / Math.SQRT2) };
    });
    described.sort((p, q) => p.thd - q.thd);

    let shown: number[];
    if (described.length > 0) {
      if (pick > described.length) {
        throw fieldError("pick", `Only ${described.length} solution(s) were found; choose a number from 1 to ${described.length}.`);
      }
      shown = described[pick - 1]!.angles;
      warnings.push(
        `${described.length} solution(s) remove orders ${orders} at m = ${m}: ` +
          described.map((d, i) => `(${i + 1}) ${formatAngles(d.angles)}, THD ${d.thd.toFixed(2)} %`).join("; ") +
          `. Showing solution ${pick}.`,
      );
    } else if (closest) {
      shown = closest.angles;
      warnings.push(
        `No set of ${problem.eliminate.length + 1} angles gives m = ${m} and removes orders ${orders}: none was found from ${STARTS} starting points. ` +
          `The closest set, ${formatAngles(closest.angles)}, is shown with the harmonics it leaves.`,
      );
    } else {
      throw fieldError("m", `No usable set of angles comes near m = ${m} with orders ${orders} removed; choose a lower m or fewer harmonics.`);
    }

    const cycle = waveCycle(wave, shown);
    const shownWave = waveOf(wave, shown.length);
    const peakOf = (n: number) => (Math.abs(weightedHarmonic(shownWave, shown, n)) * 4 * vdc) / (n * Math.PI);
    const v1Peak = peakOf(1);
    if (!(v1Peak > 0)) throw fieldError("m", "These angles give no fundamental; choose another m or solution.");
    const vrms = steppedCycleMoments(cycle).rms * vdc;
    const lines: OrderPeak[] = [];
    for (let n = 3; n <= Math.max(hmax, 50); n += 2) lines.push({ n, peak: peakOf(n) });
    const residual = Math.max(...problem.eliminate.map((n) => peakOf(n)), Math.abs(v1Peak - (m * shownWave.fullScale * 4 * vdc) / Math.PI)) / v1Peak;

    const results: Results = {
      solved: described.length > 0,
      // A count: shown as a whole number, not to three significant figures.
      solutionCount: { value: described.length, unit: "", display: String(described.length) },
      v1Peak: scalar(v1Peak, "V"),
      v1Rms: scalar(v1Peak / Math.SQRT2, "V"),
      vrms: scalar(vrms, "V"),
      thd: scalar(thdFromRms(vrms, v1Peak / Math.SQRT2), "%"),
      thd40: scalar(thdUpTo(v1Peak, lines, 40), "%"),
      thd50: scalar(thdUpTo(v1Peak, lines, 50), "%"),
      residual: scalar(described.length > 0 ? 0 : 100 * residual, "%"),
      harmonics: harmonicTable(v1Peak, lines, hmax, f),
      waveform: steppedCyclePoints(cycle, vdc),
    };
    shown.forEach((alpha, i) => {
      results[`alpha${i + 1}`] = scalar((alpha * 180) / Math.PI, "deg");
    });
    return { results, warnings };
  },
};
