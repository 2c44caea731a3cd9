/**
 * Stepped (staircase) wave with quarter-wave symmetry, as made by a multilevel
 * inverter (cascaded bridges or a diode-clamped or flying-capacitor leg) switched
 * once per level per quarter cycle.
 *
 * Convention: the k switching angles α_1 ≤ … ≤ α_k lie in the first quarter
 * cycle (0 ≤ α < 90°). The level starts at 0 and rises by one step of Vdc at
 * each angle, reaching k·Vdc at 90°; the second quarter mirrors the first about
 * 90° and the negative half cycle mirrors the positive one. One angle is the
 * quasi-square wave; a single angle of 0 is the square wave.
 *
 * Formulas (odd n only):
 *   V_n = (4·Vdc/(nπ))·Σ_i cos(nα_i)                      peak of harmonic n
 *   Vrms² = (2/π)·Vdc²·Σ_j j²·(α_{j+1} − α_j),  α_{k+1} = π/2   exact RMS
 *   THD = √(Vrms² − V1rms²)/V1rms                           all harmonics, exact
 *
 * Sources: Rashid, Power Electronics: Circuits, Devices and Applications, 3rd ed.,
 * ch. 6 (multiple-pulse and stepped waveforms; section from memory) for the
 * series of a sum of symmetric pulses; the staircase RMS follows directly from
 * the level widths (derived). The default angles are the nearest-level staircase
 * at full modulation for three steps, α_i = asin((i − ½)/3) (derived).
 */
import { scalar } from "../format";
import {
  harmonicTable,
  steppedCycle,
  steppedCyclePoints,
  thdFromRms,
  thdUpTo,
  type OrderPeak,
} from "../spectrum";
import type { Calculator, QuantityListInputSpec } from "../types";
import {
  LETHAL_VOLTAGE_CAUTION,
  dcLinkVoltageInput,
  fundamentalFrequencyInput,
  highestOrderInput,
  readQuantity,
  readQuantityList,
} from "./shared-inputs";

const vdcInput = dcLinkVoltageInput("48 V", "Voltage of one step (one cell or one level); the peak output is (number of angles) × Vdc.");

const anglesInput: QuantityListInputSpec = {
  key: "angles",
  label: "Switching angles",
  description:
    "Angles in the first quarter cycle at which the level rises one step, ascending. One angle of 0 gives a square wave.",
  kind: "quantityList",
  dimension: "angle",
  displayUnit: "deg",
  min: 0,
  max: 90,
  maxExclusive: true,
  minItems: 1,
  maxItems: 50,
  default: "9.59 deg, 30 deg, 56.44 deg",
};

const hmaxInput = highestOrderInput("49");

export const calculator: Calculator = {
  id: "stepped-wave",
  title: "Stepped (multilevel) wave",
  summary: "Harmonics, RMS and THD of a quarter-wave-symmetric staircase from its switching angles.",
  description:
    "For a staircase output that rises one step of Vdc at each switching angle in the first quarter cycle, gives the " +
    "fundamental, every odd harmonic up to the chosen order, the exact RMS and THD, and the THD over orders to 40 and 50. " +
    "Use it to check a set of angles chosen to remove particular harmonics.",
  inputs: [vdcInput, anglesInput, fundamentalFrequencyInput, hmaxInput],
  outputs: [
    { key: "vrms", label: "Output RMS (all components)", kind: "scalar", unit: "V" },
    { key: "v1Peak", label: "Fundamental peak", kind: "scalar", unit: "V" },
    { key: "v1Rms", label: "Fundamental RMS", kind: "scalar", unit: "V" },
    { key: "thd", label: "THD, all harmonics", kind: "scalar", unit: "%" },
    { key: "thd40", label: "THD, orders 2–40", kind: "scalar", unit: "%" },
    { key: "thd50", label: "THD, orders 2–50", kind: "scalar", unit: "%" },
    { key: "harmonics", label: "Harmonics", kind: "harmonics", description: "Fundamental first, then odd orders up to hmax." },
    { key: "waveform", label: "Output voltage, one cycle", kind: "waveform" },
  ],
  formulas: [
    { label: "Harmonic peak (odd n)", latex: String.raw`V_n = \frac{4V_{dc}}{n\pi}\sum_{i=1}^{k}\cos(n\alpha_i)` },
    {
      label: "Output RMS",
      latex: String.raw`V_{rms} = V_{dc}\sqrt{\frac{2}{\pi}\sum_{j=1}^{k} j^2\,(\alpha_{j+1}-\alpha_j)},\quad \alpha_{k+1} = \frac{\pi}{2}`,
    },
    { label: "THD, all harmonics", latex: String.raw`\mathrm{THD} = \frac{\sqrt{V_{rms}^2 - V_{1,rms}^2}}{V_{1,rms}}` },
    { label: "THD over orders to H", latex: String.raw`\mathrm{THD}_H = \frac{\sqrt{\sum_{n=2}^{H} V_n^2}}{V_1}` },
  ],
  conventions: [
    "Angles are in the first quarter cycle, measured from the positive-going zero crossing; the level rises one step of Vdc at each and mirrors about 90°.",
    "Equal angles mean several steps switch at once (a jump of more than one level).",
    "Harmonic percentages are of the fundamental (THD_F, as in IEEE Std 519), not of the total RMS.",
    "thd counts every harmonic (exact, from the RMS); thd40 and thd50 count orders up to 40 and 50 only, as harmonic standards do. None depends on hmax.",
    "Quarter-wave symmetry: even harmonics are zero and are not listed; odd orders the angles cancel are listed as 0.",
    "Ideal switches and equal step voltages.",
  ],
  sources: [
    "Rashid, Power Electronics: Circuits, Devices and Applications, 3rd ed., ch. 6, Fourier series of symmetric pulse trains (section from memory) — published.",
    "Staircase RMS from the level widths; THD from the RMS identity — derived.",
    "IEEE Std 519-2014: THD relative to the fundamental, evaluated to order 50 — published.",
  ],
  cautions: [
    LETHAL_VOLTAGE_CAUTION,
    "Multilevel outputs hold several cell voltages in series: every cell is live even when the output shows zero.",
  ],
  compute(inputs) {
    const vdc = readQuantity(inputs, vdcInput);
    const given = readQuantityList(inputs, anglesInput);
    const f = readQuantity(inputs, fundamentalFrequencyInput);
    const hmax = readQuantity(inputs, hmaxInput);

    const warnings: string[] = [];
    const ascending = given.every((a, i) => i === 0 || a >= given[i - 1]!);
    const anglesDegrees = ascending ? given : [...given].sort((a, b) => a - b);
    if (!ascending) warnings.push("The switching angles were not in ascending order; they were sorted before use.");
    if (new Set(anglesDegrees).size < anglesDegrees.length) {
      warnings.push("Some switching angles are equal: several steps switch at once, a jump of more than one level.");
    }
    const angles = anglesDegrees.map((a) => (a * Math.PI) / 180);
    const steps = angles.length;

    const peakOf = (n: number) => {
      let sum = 0;
      for (const alpha of angles) sum += Math.cos(n * alpha);
      return ((4 * vdc) / (n * Math.PI)) * sum;
    };
    const v1Peak = Math.abs(peakOf(1));
    const v1Rms = v1Peak / Math.SQRT2;

    // Level j holds from α_j to α_{j+1} in the first quarter.
    let meanSquare = 0;
    for (let j = 1; j <= steps; j++) {
      const end = j < steps ? angles[j]! : Math.PI / 2;
      meanSquare += j * j * (end - angles[j - 1]!);
    }
    const vrms = vdc * Math.sqrt((2 / Math.PI) * meanSquare);

    const highestOrder = Math.max(hmax, 50);
    const lines: OrderPeak[] = [];
    for (let n = 3; n <= highestOrder; n += 2) lines.push({ n, peak: Math.abs(peakOf(n)) });

    // One cycle: rise through the angles, fall back mirrored, then the negative half.
    const starts = [0];
    const levels = [0];
    angles.forEach((alpha, i) => {
      starts.push(alpha);
      levels.push(i + 1);
    });
    for (let i = steps - 1; i >= 0; i--) {
      starts.push(Math.PI - angles[i]!);
      levels.push(i);
    }
    for (let i = 0; i < steps; i++) {
      starts.push(Math.PI + angles[i]!);
      levels.push(-(i + 1));
    }
    for (let i = steps - 1; i >= 0; i--) {
      starts.push(2 * Math.PI - angles[i]!);
      levels.push(-i);
    }
    const wave = steppedCycle(starts, levels);

    return {
      results: {
        vrms: scalar(vrms, "V"),
        v1Peak: scalar(v1Peak, "V"),
        v1Rms: scalar(v1Rms, "V"),
        thd: scalar(thdFromRms(vrms, v1Rms), "%"),
        thd40: scalar(thdUpTo(v1Peak, lines, 40), "%"),
        thd50: scalar(thdUpTo(v1Peak, lines, 50), "%"),
        harmonics: harmonicTable(v1Peak, lines, hmax, f),
        waveform: steppedCyclePoints(wave, vdc),
      },
      warnings,
    };
  },
};
