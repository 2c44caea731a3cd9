/**
 * Half-bridge square-wave inverter: output RMS, fundamental and switch blocking voltage.
 *
 * Two ways of making a two-switch inverter, both switched at 50 % duty:
 * - split capacitor: two capacitors in series across Vdc form the mid-point; the
 *   load between mid-point and the leg sees ±Vdc/2;
 * - centre-tapped transformer (push-pull): each switch drives one primary half with
 *   Vdc; the secondary sees ±n·Vdc, n = secondary turns / turns of one primary half,
 *   and the off switch blocks 2·Vdc (its own half plus the reflected other half).
 *
 * With square-wave amplitude Va (Vdc/2 or n·Vdc):
 *   Vrms = Va;  V1,peak = 4·Va/π;  V1,rms = 2√2/π·Va ≈ 0.9003·Va.
 * The turns ratio for a target takes the target as a fundamental RMS: a filtered
 * output delivers the fundamental, not the square wave's total RMS.
 *
 * Sources: Mohan, Undeland & Robbins, Power Electronics: Converters, Applications,
 * and Design, 3rd ed., ch. 8 (half-bridge and push-pull inverters; square-wave
 * Fourier series) — published; Rashid, Power Electronics: Circuits, Devices and
 * Applications, 3rd ed., ch. 6 — published.
 */
import { scalar } from "../format";
import type { Calculator, ChoiceInputSpec, QuantityInputSpec } from "../types";
import { dcLinkVoltageInput, LETHAL_VOLTAGE_CAUTION, readChoice, readQuantity } from "./shared-inputs";

const vdcInput = dcLinkVoltageInput("48 V", "Total DC supply voltage across the bridge (both capacitors, or the supply feeding the centre tap).");

const modeInput: ChoiceInputSpec = {
  key: "mode",
  label: "Arrangement",
  description: "How the two switches make an alternating output.",
  kind: "choice",
  options: [
    { value: "split-capacitor", label: "Split capacitor (load to the capacitor mid-point)" },
    { value: "centre-tapped", label: "Centre-tapped transformer (push-pull)" },
  ],
  default: "split-capacitor",
};

const turnsRatioInput: QuantityInputSpec = {
  key: "turnsRatio",
  label: "Turns ratio",
  description: "Centre-tapped mode: secondary turns ÷ turns of one primary half. Absent means 1.",
  kind: "quantity",
  dimension: "dimensionless",
  displayUnit: "",
  min: 0,
  minExclusive: true,
  max: 1e4,
  optional: true,
};

const targetInput: QuantityInputSpec = {
  key: "targetVrms",
  label: "Target fundamental RMS",
  description: "Optional: the output voltage wanted after filtering (fundamental RMS), to size the turns ratio.",
  kind: "quantity",
  dimension: "voltage",
  displayUnit: "V",
  min: 0,
  minExclusive: true,
  max: 1e6,
  optional: true,
};

/** Fundamental RMS of a square wave of amplitude 1: 2√2/π. */
export const SQUARE_WAVE_FUNDAMENTAL_RMS = (2 * Math.SQRT2) / Math.PI;

export const calculator: Calculator = {
  id: "half-bridge",
  title: "Half-bridge square-wave inverter",
  summary: "Output RMS, fundamental, switch blocking voltage and transformer turns ratio of a two-switch square-wave inverter.",
  description:
    "For a half bridge with a split-capacitor mid-point, or a push-pull stage on a centre-tapped transformer, switched as a " +
    "square wave: the output RMS, the fundamental's peak and RMS, the voltage each switch must block, and — given a target — " +
    "the turns ratio that delivers that fundamental RMS.",
  inputs: [vdcInput, modeInput, turnsRatioInput, targetInput],
  outputs: [
    { key: "vrms", label: "Output RMS (square wave)", kind: "scalar", unit: "V" },
    { key: "v1Peak", label: "Fundamental peak", kind: "scalar", unit: "V" },
    { key: "v1Rms", label: "Fundamental RMS", kind: "scalar", unit: "V" },
    { key: "vBlock", label: "Switch blocking voltage", kind: "scalar", unit: "V" },
    {
      key: "turnsRatioForTarget",
      label: "Turns ratio for the target",
      kind: "scalar",
      unit: "",
      description: "Secondary ÷ primary (half) turns giving the target fundamental RMS; only when a target is given.",
    },
  ],
  formulas: [
    { label: "Square-wave amplitude", latex: String.raw`V_a = \begin{cases} V_{dc}/2 & \text{split capacitor} \\ n\,V_{dc} & \text{centre-tapped} \end{cases}` },
    { label: "Output RMS", latex: String.raw`V_{rms} = V_a` },
    { label: "Fundamental", latex: String.raw`V_{1,pk} = \frac{4V_a}{\pi},\quad V_{1,rms} = \frac{2\sqrt{2}}{\pi}V_a \approx 0.9003\,V_a` },
    { label: "Blocking voltage", latex: String.raw`V_{block} = \begin{cases} V_{dc} & \text{split capacitor} \\ 2V_{dc} & \text{centre-tapped} \end{cases}` },
    { label: "Turns ratio for a target", latex: String.raw`n = \frac{V_{target}}{\frac{2\sqrt{2}}{\pi}V_{a,1}}` },
  ],
  conventions: [
    "Split capacitor: the load sits between the leg and the capacitor mid-point and sees ±Vdc/2.",
    "Centre-tapped: turnsRatio is secondary turns ÷ turns of one primary half; each half sees Vdc.",
    "The target is a fundamental RMS: an LC-filtered output delivers the fundamental, not the square wave's total RMS (which is about 11 % higher).",
    "For the split capacitor, turnsRatioForTarget is the ratio of an output transformer placed after the bridge; for centre-tapped mode it is the push-pull transformer's own ratio.",
    "Ideal switches, 50 % duty, no dead time, stiff DC link; blocking voltages exclude the overshoot from stray and leakage inductance.",
  ],
  sources: [
    "Mohan, Undeland & Robbins, Power Electronics: Converters, Applications, and Design, 3rd ed., ch. 8: half-bridge and push-pull inverters; square-wave fundamental 4/π of the amplitude — published.",
    "Rashid, Power Electronics: Circuits, Devices and Applications, 3rd ed., ch. 6: square-wave Fourier series, fundamental RMS 0.90·Va — published.",
    "Push-pull blocking voltage 2·Vdc: follows from the transformer's two primary halves in series — derived.",
  ],
  cautions: [
    LETHAL_VOLTAGE_CAUTION,
    "Split capacitor: the mid-point drifts if the load draws any DC; the capacitors must carry the full load current.",
    "Centre-tapped: leakage inductance adds a turn-off spike above 2·Vdc, and unequal volt-seconds walk the core into saturation; allow for both.",
  ],
  compute(inputs) {
    const vdc = readQuantity(inputs, vdcInput);
    const mode = readChoice(inputs, modeInput);
    const turnsRatio = inputs.turnsRatio === undefined ? undefined : readQuantity(inputs, turnsRatioInput);
    const target = inputs.targetVrms === undefined ? undefined : readQuantity(inputs, targetInput);
    const warnings: string[] = [];

    const centreTapped = mode === "centre-tapped";
    if (!centreTapped && turnsRatio !== undefined) {
      warnings.push("turnsRatio applies to the centre-tapped transformer only; it is ignored for the split capacitor.");
    }
    // Amplitude per unit of turns ratio, so the target ratio follows directly.
    const amplitudePerTurn = centreTapped ? vdc : vdc / 2;
    const amplitude = centreTapped ? amplitudePerTurn * (turnsRatio ?? 1) : amplitudePerTurn;

    const results: Record<string, ReturnType<typeof scalar>> = {
      vrms: scalar(amplitude, "V"),
      v1Peak: scalar((4 / Math.PI) * amplitude, "V"),
      v1Rms: scalar(SQUARE_WAVE_FUNDAMENTAL_RMS * amplitude, "V"),
      vBlock: scalar(centreTapped ? 2 * vdc : vdc, "V"),
    };
    if (target !== undefined) {
      const ratio = target / (SQUARE_WAVE_FUNDAMENTAL_RMS * amplitudePerTurn);
      results.turnsRatioForTarget = scalar(ratio, "");
      if (!centreTapped) {
        warnings.push(`The split-capacitor bridge gives a fundamental of ${results.v1Rms!.display}; reaching the target needs an output transformer of ratio ${results.turnsRatioForTarget.display}.`);
      }
    }
    return { results, warnings };
  },
};
