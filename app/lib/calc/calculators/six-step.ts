/**
 * Three-phase six-step (180° conduction) inverter on a DC link Vdc.
 *
 * Each leg is high for half a cycle and low for the other half, the legs 120°
 * apart. The line-to-line voltage is then a quasi-square wave with a 30° zero
 * interval at each edge: +Vdc from 30° to 150°, −Vdc from 210° to 330°, angles
 * measured from the positive-going zero crossing of its fundamental.
 *
 * Formulas:
 *   V_LL,rms  = √(2/3)·Vdc                 V_LL1,rms = (√6/π)·Vdc ≈ 0.7797·Vdc
 *   V_LN,rms  = (√2/3)·Vdc (balanced Y)    V_LN1,rms = (√2/π)·Vdc = V_LL1,rms/√3
 *   harmonics only at n = 6k ± 1, with V_n/V_1 = 1/n (triplen orders cancel between lines)
 *   THD = √(π²/9 − 1) ≈ 31.08 % for both line-to-line and line-to-neutral voltages
 *
 * Sources: Mohan, Undeland & Robbins, Power Electronics: Converters, Applications,
 * and Design, 3rd ed., §8-6 (square-wave operation of three-phase inverters);
 * Rashid, Power Electronics: Circuits, Devices and Applications, 3rd ed., §6.5
 * (180° conduction). Section numbers from memory; the values are published.
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
import type { Calculator } from "../types";
import {
  LETHAL_VOLTAGE_CAUTION,
  dcLinkVoltageInput,
  fundamentalFrequencyInput,
  highestOrderInput,
  readQuantity,
} from "./shared-inputs";

const vdcInput = dcLinkVoltageInput("600 V", "DC-link voltage across the three-phase bridge.");
const hmaxInput = highestOrderInput("49");

export const calculator: Calculator = {
  id: "six-step",
  title: "Six-step three-phase inverter",
  summary: "Line and phase voltages, harmonics and THD of a three-phase bridge in 180° conduction.",
  description:
    "For a three-phase bridge with each leg conducting 180° (square-wave or six-step operation), gives the line-to-line " +
    "and line-to-neutral (balanced Y load) RMS voltages and fundamentals, the line-to-line harmonics at orders 6k ± 1, " +
    "and the THD, exact and over orders to 40 and 50.",
  inputs: [vdcInput, fundamentalFrequencyInput, hmaxInput],
  outputs: [
    { key: "vllRms", label: "Line-to-line RMS", kind: "scalar", unit: "V" },
    { key: "vll1Rms", label: "Line-to-line fundamental RMS", kind: "scalar", unit: "V" },
    { key: "vlnRms", label: "Line-to-neutral RMS (Y load)", kind: "scalar", unit: "V" },
    { key: "vln1Rms", label: "Line-to-neutral fundamental RMS (Y load)", kind: "scalar", unit: "V" },
    { key: "thd", label: "THD, all harmonics", kind: "scalar", unit: "%" },
    { key: "thd40", label: "THD, orders 2–40", kind: "scalar", unit: "%" },
    { key: "thd50", label: "THD, orders 2–50", kind: "scalar", unit: "%" },
    { key: "harmonics", label: "Line-to-line harmonics", kind: "harmonics", description: "Fundamental first, then orders 6k ± 1 up to hmax." },
    { key: "waveform", label: "Line-to-line voltage, one cycle", kind: "waveform" },
  ],
  formulas: [
    { label: "Line-to-line RMS", latex: String.raw`V_{LL,rms} = \sqrt{\tfrac{2}{3}}\,V_{dc}` },
    { label: "Line-to-line fundamental", latex: String.raw`V_{LL1,rms} = \frac{\sqrt{6}}{\pi}V_{dc}` },
    { label: "Line-to-neutral RMS (Y)", latex: String.raw`V_{LN,rms} = \frac{\sqrt{2}}{3}V_{dc},\quad V_{LN1,rms} = \frac{\sqrt{2}}{\pi}V_{dc}` },
    { label: "Harmonics", latex: String.raw`V_{LL,n} = \frac{V_{LL,1}}{n},\quad n = 6k \pm 1` },
    { label: "THD, all harmonics", latex: String.raw`\mathrm{THD} = \sqrt{\frac{\pi^2}{9} - 1}` },
  ],
  conventions: [
    "Each leg conducts 180°; legs are 120° apart. The line-to-line wave is +Vdc from 30° to 150° and −Vdc from 210° to 330° of its own fundamental.",
    "Line-to-neutral values assume a balanced, ungrounded Y load (neutral floating).",
    "Harmonic percentages are of the fundamental (THD_F, as in IEEE Std 519). Line-to-neutral voltages have the same percentages and THD.",
    "thd counts every harmonic (exact, from the RMS); thd40 and thd50 count orders up to 40 and 50 only. None depends on hmax.",
    "Ideal switches, no dead time, stiff DC link; the output amplitude is set by Vdc alone.",
  ],
  sources: [
    "Mohan, Undeland & Robbins, Power Electronics: Converters, Applications, and Design, 3rd ed., §8-6, square-wave operation of three-phase inverters (section from memory) — published.",
    "Rashid, Power Electronics: Circuits, Devices and Applications, 3rd ed., §6.5, 180° conduction (section from memory) — published.",
    "THD √(π²/9 − 1) from the RMS identity — derived.",
  ],
  cautions: [
    LETHAL_VOLTAGE_CAUTION,
    "Six-step outputs have large 5th and 7th harmonics: check motor heating, torque ripple and filter ratings before running hardware this way.",
  ],
  compute(inputs) {
    const vdc = readQuantity(inputs, vdcInput);
    const f = readQuantity(inputs, fundamentalFrequencyInput);
    const hmax = readQuantity(inputs, hmaxInput);

    const vll1Peak = ((2 * Math.sqrt(3)) / Math.PI) * vdc;
    const vll1Rms = vll1Peak / Math.SQRT2;
    const vllRms = Math.sqrt(2 / 3) * vdc;
    const vlnRms = (Math.SQRT2 / 3) * vdc;
    const vln1Rms = (Math.SQRT2 / Math.PI) * vdc;

    const highestOrder = Math.max(hmax, 50);
    const lines: OrderPeak[] = [];
    for (let k = 1; 6 * k - 1 <= highestOrder; k++) {
      for (const n of [6 * k - 1, 6 * k + 1]) if (n <= highestOrder) lines.push({ n, peak: vll1Peak / n });
    }

    const wave = steppedCycle([0, Math.PI / 6, (5 * Math.PI) / 6, (7 * Math.PI) / 6, (11 * Math.PI) / 6], [0, 1, 0, -1, 0]);

    return {
      results: {
        vllRms: scalar(vllRms, "V"),
        vll1Rms: scalar(vll1Rms, "V"),
        vlnRms: scalar(vlnRms, "V"),
        vln1Rms: scalar(vln1Rms, "V"),
        thd: scalar(thdFromRms(vllRms, vll1Rms), "%"),
        thd40: scalar(thdUpTo(vll1Peak, lines, 40), "%"),
        thd50: scalar(thdUpTo(vll1Peak, lines, 50), "%"),
        harmonics: harmonicTable(vll1Peak, lines, hmax, f),
        waveform: steppedCyclePoints(wave, vdc),
      },
      warnings: [],
    };
  },
};
