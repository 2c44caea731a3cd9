/**
 * Second-order LC output filter: series inductor L, shunt capacitor C, load R across C.
 *
 *   f0 = 1/(2π√(LC)),  Z0 = √(L/C),  Q = R/Z0
 *   |H(jω)| = 1/√((1 − ω²LC)² + (ωL/R)²)   (unloaded: the second term drops)
 *   well above f0 the gain falls at −40 dB/decade; |H(f0)| = Q.
 * Capacitor current at the fundamental, for an output RMS voltage Vout: Ic = Vout·2πfC.
 *
 * Unloaded, the filter has no damping: Q is unbounded and is not reported.
 *
 * Sources: Erickson & Maksimović, Fundamentals of Power Electronics, 2nd ed.,
 * ch. 8 (second-order response, Q and resonance; chapter number from memory) —
 * published. Corner placement (a decade below fsw, well above the fundamental)
 * is common practice.
 */
import { scalar } from "../format";
import type { BodePoint, Calculator, QuantityInputSpec, Results } from "../types";
import { LETHAL_VOLTAGE_CAUTION, outputFrequencyInput, readQuantity } from "./shared-inputs";

const lInput: QuantityInputSpec = {
  key: "l",
  label: "Inductance L",
  description: "Series filter inductance (per output line).",
  kind: "quantity",
  dimension: "inductance",
  displayUnit: "mH",
  min: 0,
  minExclusive: true,
  max: 100,
};

const cInput: QuantityInputSpec = {
  key: "c",
  label: "Capacitance C",
  description: "Shunt filter capacitance across the load.",
  kind: "quantity",
  dimension: "capacitance",
  displayUnit: "uF",
  min: 0,
  minExclusive: true,
  max: 10,
};

const rLoadInput: QuantityInputSpec = {
  key: "rLoad",
  label: "Load resistance R",
  description: "Resistive load across C. Leave empty for the unloaded (undamped) filter.",
  kind: "quantity",
  dimension: "resistance",
  displayUnit: "ohm",
  min: 0,
  minExclusive: true,
  max: 1e9,
  optional: true,
};

const fswInput: QuantityInputSpec = {
  key: "fsw",
  label: "Switching frequency",
  description: "Frequency of the ripple the filter must remove (for unipolar PWM, the ripple sits at twice the carrier).",
  kind: "quantity",
  dimension: "frequency",
  displayUnit: "kHz",
  min: 0,
  minExclusive: true,
  max: 1e9,
};

const fInput = outputFrequencyInput("Fundamental frequency", "Output frequency the filter must pass.");

const voutInput: QuantityInputSpec = {
  key: "vout",
  label: "Output voltage (RMS)",
  description: "Optional: RMS output voltage across C, to give the capacitor's fundamental current.",
  kind: "quantity",
  dimension: "voltage",
  displayUnit: "V",
  min: 0,
  max: 1e6,
  optional: true,
};

const BODE_POINTS = 200;
/** Above this Q the resonance peak is worth a warning (common practice; about 6 dB). */
const PEAKING_Q = 2;

/** |H| of the LC filter at angular frequency ω; rLoad undefined means unloaded. */
export function lcFilterGain(omega: number, l: number, c: number, rLoad?: number): number {
  const real = 1 - omega * omega * l * c;
  const imaginary = rLoad === undefined ? 0 : (omega * l) / rLoad;
  return 1 / Math.sqrt(real * real + imaginary * imaginary);
}

const toDb = (gain: number) => 20 * Math.log10(gain);

/** |1 − (f/f0)²| below this counts as "at f0" for an unloaded filter: the gain would exceed 180 dB, which only rounding can produce. */
const UNBOUNDED_BAND = 1e-9;

export const calculator: Calculator = {
  id: "lc-filter",
  title: "LC output filter",
  summary: "Corner frequency, characteristic impedance, Q, attenuation at the switching frequency and a Bode plot of an LC filter.",
  description:
    "For a series inductor and a shunt capacitor feeding a resistive load (or no load): the corner frequency, characteristic " +
    "impedance and quality factor, the gain at the fundamental and at the switching frequency, the capacitor's fundamental " +
    "current and the magnitude response from a tenth of the fundamental to ten times the switching frequency.",
  inputs: [lInput, cInput, rLoadInput, fswInput, fInput, voutInput],
  outputs: [
    { key: "f0", label: "Corner frequency", kind: "scalar", unit: "Hz" },
    { key: "z0", label: "Characteristic impedance", kind: "scalar", unit: "ohm" },
    { key: "q", label: "Quality factor", kind: "scalar", unit: "", description: "R/Z0; omitted when unloaded." },
    { key: "gainFswDb", label: "Gain at the switching frequency", kind: "scalar", unit: "dB" },
    { key: "gainF1Db", label: "Gain at the fundamental", kind: "scalar", unit: "dB" },
    { key: "icRms", label: "Capacitor current at the fundamental", kind: "scalar", unit: "A", description: "Only when vout is given." },
    { key: "bode", label: "Magnitude response", kind: "bode" },
  ],
  formulas: [
    { label: "Corner frequency", latex: String.raw`f_0 = \frac{1}{2\pi\sqrt{LC}}` },
    { label: "Characteristic impedance", latex: String.raw`Z_0 = \sqrt{L/C}` },
    { label: "Quality factor", latex: String.raw`Q = R / Z_0` },
    { label: "Magnitude", latex: String.raw`|H(j\omega)| = \frac{1}{\sqrt{\left(1-\omega^2LC\right)^2 + \left(\omega L/R\right)^2}}` },
    { label: "Capacitor current", latex: String.raw`I_C = V_{out}\,2\pi f C` },
  ],
  conventions: [
    "Series L, shunt C, resistive load R across C; source impedance and the inductor's and capacitor's losses are neglected.",
    "Gains are |Vout/Vin| in dB; negative means attenuation.",
    "Unloaded (no R): no damping, so Q is not reported and the response peaks without bound at f0.",
    "The Bode plot runs log-spaced from f/10 to 10·fsw.",
  ],
  sources: [
    "Erickson & Maksimović, Fundamentals of Power Electronics, 2nd ed., ch. 8: f0, Z0, Q = R/Z0, |H(f0)| = Q, −40 dB/decade (chapter number from memory) — published.",
    "Worked check L = 1 mH, C = 10 µF, R = 10 Ω: f0 = 1591.55 Hz, Q = 1, |H(20 kHz)| = −43.94 dB — derived.",
    "f0 at least a decade below fsw and well above the fundamental — common practice.",
  ],
  cautions: [
    LETHAL_VOLTAGE_CAUTION,
    "A lightly loaded LC filter rings at f0: check the inverter's control and any active or passive damping on the real load range.",
  ],
  compute(inputs) {
    const l = readQuantity(inputs, lInput);
    const c = readQuantity(inputs, cInput);
    const rLoad = inputs.rLoad === undefined ? undefined : readQuantity(inputs, rLoadInput);
    const fsw = readQuantity(inputs, fswInput);
    const f = readQuantity(inputs, fInput);
    const vout = inputs.vout === undefined ? undefined : readQuantity(inputs, voutInput);

    const f0 = 1 / (2 * Math.PI * Math.sqrt(l * c));
    const z0 = Math.sqrt(l / c);
    const gainAt = (frequency: number) => lcFilterGain(2 * Math.PI * frequency, l, c, rLoad);
    const warnings: string[] = [];

    // Unloaded, |H| = 1/|1 − ω²LC| has no bound at f0; within rounding of f0 the number is noise (a +287 dB "result"), so say so in words.
    const atUndampedCorner = (frequency: number) => rLoad === undefined && Math.abs(1 - (frequency / f0) ** 2) < UNBOUNDED_BAND;
    const results: Results = { f0: scalar(f0, "Hz"), z0: scalar(z0, "ohm") };
    for (const [key, frequency, name] of [
      ["gainFswDb", fsw, "the switching frequency"],
      ["gainF1Db", f, "the fundamental"],
    ] as const) {
      if (atUndampedCorner(frequency)) {
        warnings.push(
          `The gain at ${name} (${scalar(frequency, "Hz").display}) is unbounded and not reported: it sits at the corner f0 of an unloaded filter, which has no damping to limit the resonance.`,
        );
      } else {
        results[key] = scalar(toDb(gainAt(frequency)), "dB");
      }
    }

    if (rLoad === undefined) {
      warnings.push("Unloaded filter: there is no damping, so Q is unbounded and not reported; the response peaks without limit at f0.");
    } else {
      const q = scalar(rLoad / z0, "");
      results.q = q;
      if (q.value > PEAKING_Q) {
        warnings.push(`Q = ${q.display}: the response peaks by about ${scalar(toDb(q.value), "dB").display} at f0 (common practice: add damping when Q exceeds about ${PEAKING_Q}).`);
      }
    }
    if (vout !== undefined) results.icRms = scalar(vout * 2 * Math.PI * f * c, "A");

    if (f0 > fsw / 10) {
      warnings.push(
        `The corner (${scalar(f0, "Hz").display}) is not a decade below the switching frequency (${scalar(fsw, "Hz").display}); ` +
          (atUndampedCorner(fsw) ? "there is no attenuation there at all" : `attenuation there is only ${scalar(-toDb(gainAt(fsw)), "dB").display}`) +
          " (common practice: f0 ≤ fsw/10).",
      );
    }
    if (f0 <= f) {
      warnings.push(`The corner (${scalar(f0, "Hz").display}) is at or below the fundamental (${scalar(f, "Hz").display}): the filter attenuates or distorts the output itself.`);
    } else if (f0 < 10 * f) {
      warnings.push(`The corner (${scalar(f0, "Hz").display}) is within a decade of the fundamental (${scalar(f, "Hz").display}): low-order harmonics near f0 are amplified (common practice: f0 ≥ 10·f).`);
    }

    const low = Math.min(f / 10, 10 * fsw);
    const high = Math.max(f / 10, 10 * fsw);
    const bode: BodePoint[] = [];
    for (let i = 0; i < BODE_POINTS; i++) {
      const frequency = low * (high / low) ** (i / (BODE_POINTS - 1));
      const gainDb = toDb(gainAt(frequency));
      // An unloaded filter at (or within rounding of) f0 is unbounded: leave that point out of the plot.
      if (Number.isFinite(gainDb) && !atUndampedCorner(frequency)) bode.push({ f: frequency, gainDb });
    }
    results.bode = bode;
    return { results, warnings };
  },
};
