/**
 * Quasi-square wave (single-pulse modulation) of a full bridge on a DC link Vdc.
 *
 * Convention: α is the zero-voltage interval at each edge of each half cycle.
 * The output is +Vdc from α to 180° − α, −Vdc from 180° + α to 360° − α and
 * zero elsewhere; α = 0 is the square wave. (Texts that describe the pulse by
 * its width use δ = 180° − 2α.)
 *
 * Formulas (odd n only; the wave has half-wave and quarter-wave symmetry):
 *   V_n = (4·Vdc/(nπ))·cos(nα)            peak of harmonic n
 *   Vrms = Vdc·√(1 − 2α/π)                 exact RMS of the whole wave
 *   THD = √(Vrms² − V1rms²)/V1rms           all harmonics, exact
 * THD is lowest where (π − 2α)·tan α = 1, solved here by bisection
 * (α ≈ 23.218°, THD ≈ 28.964 %). α = 90°/n removes harmonic n and its odd multiples.
 *
 * Sources: Rashid, Power Electronics: Circuits, Devices and Applications, 3rd ed.,
 * §6.6 single-pulse modulation (section number from memory); Mohan, Undeland &
 * Robbins, Power Electronics: Converters, Applications, and Design, 3rd ed., ch. 8
 * (square-wave operation and voltage cancellation). The minimum-THD angle
 * follows from the formulas above (derived).
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
import type { Calculator, QuantityInputSpec } from "../types";
import {
  LETHAL_VOLTAGE_CAUTION,
  dcLinkVoltageInput,
  fundamentalFrequencyInput,
  highestOrderInput,
  readQuantity,
} from "./shared-inputs";

const vdcInput = dcLinkVoltageInput("48 V", "Full-bridge DC-link voltage; the output swings between +Vdc, 0 and −Vdc.");

const alphaInput: QuantityInputSpec = {
  key: "alpha",
  label: "Zero interval α",
  description: "Zero-voltage interval at each edge of each half cycle: the pulse runs from α to 180° − α. 0 gives a square wave.",
  kind: "quantity",
  dimension: "angle",
  displayUnit: "deg",
  min: 0,
  max: 90,
  maxExclusive: true,
  default: "30 deg",
};

const hmaxInput = highestOrderInput("49");

/** THD (percent, all harmonics) of a quasi-square wave with zero interval α (radians). */
export function quasiSquareThd(alpha: number): number {
  const totalRms = Math.sqrt(1 - (2 * alpha) / Math.PI);
  const fundamentalRms = ((4 / Math.PI) * Math.cos(alpha)) / Math.SQRT2;
  return thdFromRms(totalRms, fundamentalRms);
}

/**
 * The α (radians) of least THD: the root of (π − 2α)·tan α = 1 in (0, π/4),
 * where d/dα of (π − 2α)/cos²α vanishes. The left side rises monotonically there.
 */
export function quasiSquareMinimumThdAngle(): number {
  let low = 0;
  let high = Math.PI / 4;
  for (let i = 0; i < 200 && high - low > 1e-16; i++) {
    const mid = (low + high) / 2;
    if ((Math.PI - 2 * mid) * Math.tan(mid) < 1) low = mid;
    else high = mid;
  }
  return (low + high) / 2;
}

const MINIMUM_THD_ANGLE = quasiSquareMinimumThdAngle();
const MINIMUM_THD = quasiSquareThd(MINIMUM_THD_ANGLE);

export const calculator: Calculator = {
  id: "quasi-square",
  title: "Quasi-square wave",
  summary: "Harmonics, RMS and THD of a full-bridge quasi-square (single-pulse) output.",
  description:
    "For a full bridge switched once per half cycle with a zero-voltage interval α at each edge, gives the fundamental, " +
    "every odd harmonic up to the chosen order, the exact RMS and THD, the THD over the orders harmonic standards count " +
    "(to 40 and to 50), and the α that gives the least THD.",
  inputs: [vdcInput, alphaInput, fundamentalFrequencyInput, hmaxInput],
  outputs: [
    { key: "vrms", label: "Output RMS (all components)", kind: "scalar", unit: "V" },
    { key: "v1Peak", label: "Fundamental peak", kind: "scalar", unit: "V" },
    { key: "v1Rms", label: "Fundamental RMS", kind: "scalar", unit: "V" },
    { key: "thd", label: "THD, all harmonics", kind: "scalar", unit: "%" },
    { key: "thd40", label: "THD, orders 2–40", kind: "scalar", unit: "%" },
    { key: "thd50", label: "THD, orders 2–50", kind: "scalar", unit: "%" },
    { key: "harmonics", label: "Harmonics", kind: "harmonics", description: "Fundamental first, then odd orders up to hmax." },
    { key: "alphaMinThd", label: "α for least THD", kind: "scalar", unit: "deg" },
    { key: "thdMin", label: "Least THD (at that α)", kind: "scalar", unit: "%" },
    { key: "waveform", label: "Output voltage, one cycle", kind: "waveform" },
  ],
  formulas: [
    { label: "Harmonic peak (odd n)", latex: String.raw`V_n = \frac{4V_{dc}}{n\pi}\cos(n\alpha)` },
    { label: "Output RMS", latex: String.raw`V_{rms} = V_{dc}\sqrt{1 - \frac{2\alpha}{\pi}}` },
    { label: "THD, all harmonics", latex: String.raw`\mathrm{THD} = \frac{\sqrt{V_{rms}^2 - V_{1,rms}^2}}{V_{1,rms}}` },
    { label: "THD over orders to H", latex: String.raw`\mathrm{THD}_H = \frac{\sqrt{\sum_{n=2}^{H} V_n^2}}{V_1}` },
    { label: "Least THD", latex: String.raw`(\pi - 2\alpha)\tan\alpha = 1` },
  ],
  conventions: [
    "α is the zero-voltage interval at each edge of each half cycle: +Vdc from α to 180° − α. α = 0 is a square wave; a pulse width δ corresponds to α = (180° − δ)/2.",
    "Harmonic percentages are of the fundamental (THD_F, as in IEEE Std 519), not of the total RMS.",
    "thd counts every harmonic (exact, from the RMS); thd40 and thd50 count orders up to 40 and 50 only, as harmonic standards do, so they come out lower. None of the three depends on hmax, which only sets how far the table goes.",
    "The waveform has half-wave symmetry: even harmonics are zero and are not listed. Odd orders cancelled by α (cos nα = 0) are listed as 0.",
    "Ideal switches, no dead time, stiff DC link.",
  ],
  sources: [
    "Rashid, Power Electronics: Circuits, Devices and Applications, 3rd ed., §6.6, single-pulse modulation (section number from memory) — published.",
    "Mohan, Undeland & Robbins, Power Electronics: Converters, Applications, and Design, 3rd ed., ch. 8, square-wave operation and voltage cancellation — published.",
    "Least-THD angle: from the formulas above, (π − 2α)·tan α = 1 — derived.",
    "IEEE Std 519-2014: THD relative to the fundamental, evaluated to order 50 — published.",
  ],
  cautions: [LETHAL_VOLTAGE_CAUTION],
  compute(inputs) {
    const vdc = readQuantity(inputs, vdcInput);
    const alphaDegrees = readQuantity(inputs, alphaInput);
    const f = readQuantity(inputs, fundamentalFrequencyInput);
    const hmax = readQuantity(inputs, hmaxInput);
    const alpha = (alphaDegrees * Math.PI) / 180;

    const peakOf = (n: number) => ((4 * vdc) / (n * Math.PI)) * Math.cos(n * alpha);
    const v1Peak = Math.abs(peakOf(1));
    const v1Rms = v1Peak / Math.SQRT2;
    const vrms = vdc * Math.sqrt(1 - (2 * alpha) / Math.PI);

    // Orders up to 50 are always needed for thd50, whatever hmax lists.
    const highestOrder = Math.max(hmax, 50);
    const lines: OrderPeak[] = [];
    for (let n = 3; n <= highestOrder; n += 2) lines.push({ n, peak: Math.abs(peakOf(n)) });

    const wave = steppedCycle(
      [0, alpha, Math.PI - alpha, Math.PI + alpha, 2 * Math.PI - alpha],
      [0, 1, 0, -1, 0],
    );

    const warnings: string[] = [];
    if (alphaDegrees > 80) {
      warnings.push(`α = ${alphaDegrees}° leaves a fundamental of only ${(Math.cos(alpha) * 100).toFixed(1)} % of the square wave's; THD is very high.`);
    }

    return {
      results: {
        vrms: scalar(vrms, "V"),
        v1Peak: scalar(v1Peak, "V"),
        v1Rms: scalar(v1Rms, "V"),
        thd: scalar(thdFromRms(vrms, v1Rms), "%"),
        thd40: scalar(thdUpTo(v1Peak, lines, 40), "%"),
        thd50: scalar(thdUpTo(v1Peak, lines, 50), "%"),
        harmonics: harmonicTable(v1Peak, lines, hmax, f),
        alphaMinThd: scalar((MINIMUM_THD_ANGLE * 180) / Math.PI, "deg"),
        thdMin: scalar(MINIMUM_THD, "%"),
        waveform: steppedCyclePoints(wave, vdc),
      },
      warnings,
    };
  },
};
