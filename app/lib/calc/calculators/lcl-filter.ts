/**
 * Grid-side LCL filter: resonance, passive damping, attenuation of the switching
 * ripple, the capacitor's reactive power and the frequency response.
 *
 * Circuit (per phase): inverter — L1 — node — L2 — grid, with C in series with the
 * damping resistor R_d from the node to the star point. Ideal inductors and capacitor.
 *
 *   ω_res = √((L1 + L2)/(L1·L2·C))                                   resonance, undamped
 *   Y(jω) = i2/v_i = Z_C'/(Z_L1·Z_L2 + Z_C'·(Z_L1 + Z_L2)),  Z_C' = R_d + 1/(jωC)
 *   i2/i1 = Z_C'/(Z_C' + Z_L2)                                        ripple reaching the grid
 *   Q_C = m·V²·ωC                                                     reactive power, m phases
 *   R_d suggested = 1/(3·ω_res·C)                                     a third of C's impedance at resonance
 *   P_d = m·(I_C1² + I_Csw²)·R_d                                      damping loss
 * with I_C1 = V·ωC (the capacitor across the grid voltage at the fundamental) and
 * I_Csw the part of the inverter's switching ripple that the capacitor takes.
 *
 * Sources: Liserre, Blaabjerg & Hansen, Design and control of an LCL-filter-based
 * three-phase active rectifier, IEEE Trans. Industry Applications, 2005 — published
 * (resonance formula; design rules 10·f_grid < f_res < f_sw/2, Q_C ≤ 5 % of the
 * rating and R_d ≈ 1/(3ω_res·C) are from memory and are common practice). Parker,
 * McGrath & Holmes, Regions of active damping control for LCL filters, IEEE Trans.
 * Industry Applications, 2014: the critical resonance at one sixth of the control
 * sampling frequency — memory. The transfer functions are derived from the circuit
 * and checked in the tests by integrating it.
 */
import { scalar } from "../format";
import type { BodePoint, Calculator, ChoiceInputSpec, QuantityInputSpec, Results } from "../types";
import { LETHAL_VOLTAGE_CAUTION, outputFrequencyInput, readChoice, readQuantity, quantityInput } from "./shared-inputs";


const l1Input = quantityInput({ key: "l1", label: "Inverter-side inductance L1", description: "Per phase, between the bridge and the capacitor node.", dimension: "inductance", displayUnit: "mH", min: 0, minExclusive: true, max: 10, default: "1.8 mH" });
const l2Input = quantityInput({ key: "l2", label: "Grid-side inductance L2", description: "Per phase, between the capacitor node and the grid (include the grid's own inductance if known).", dimension: "inductance", displayUnit: "mH", min: 0, minExclusive: true, max: 10, default: "0.6 mH" });
const cInput = quantityInput({ key: "c", label: "Filter capacitance C", description: "Per phase, star-connected (convert a delta bank: C_star = 3·C_delta).", dimension: "capacitance", displayUnit: "uF", min: 0, minExclusive: true, max: 1, default: "10 uF" });
const rdInput = quantityInput({ key: "rd", label: "Damping resistor R_d", description: "In series with each capacitor; 0 for an undamped filter.", dimension: "resistance", displayUnit: "ohm", min: 0, max: 1e4, default: "2 ohm" });
const fswInput = quantityInput({ key: "fsw", label: "Switching frequency", description: "The carrier frequency: the first ripple group sits there (or at twice it for unipolar PWM).", dimension: "frequency", displayUnit: "kHz", min: 0, minExclusive: true, max: 1e7, default: "10 kHz" });
const fInput = outputFrequencyInput("Grid frequency", "Fundamental frequency of the grid.");
const vInput = quantityInput({ key: "vGrid", label: "Grid voltage per phase", description: "RMS voltage across each capacitor (line to neutral).", dimension: "voltage", displayUnit: "V", min: 0, max: 1e6, default: "230 V" });
const pRatedInput = quantityInput({ key: "pRated", label: "Rated power", description: "Optional: the converter's rating, to give the capacitor's reactive power as a share of it.", dimension: "power", displayUnit: "kW", min: 0, minExclusive: true, max: 1e9, optional: true });
const iRippleInput = quantityInput({ key: "iRipple", label: "Inverter-side ripple at fsw (RMS)", description: "Optional: RMS of the switching-frequency ripple in L1, for the damping loss (e.g. from the inductor-ripple calculator).", dimension: "current", displayUnit: "A", min: 0, max: 1e5, optional: true });
const fControlInput = quantityInput({ key: "fControl", label: "Control sampling frequency", description: "Optional: the current controller's sampling frequency, to flag a resonance near its critical frequency f_s/6.", dimension: "frequency", displayUnit: "kHz", min: 0, minExclusive: true, max: 1e7, optional: true });
const phasesInput: ChoiceInputSpec = {
  key: "phases",
  label: "Phases",
  description: "Number of phases carrying a filter branch (for the reactive power and damping loss).",
  kind: "choice",
  options: [
    { value: "3", label: "Three-phase" },
    { value: "1", label: "Single-phase" },
  ],
  default: "3",
};

const BODE_POINTS = 241;

interface Complex {
  re: number;
  im: number;
}
const add = (a: Complex, b: Complex): Complex => ({ re: a.re + b.re, im: a.im + b.im });
const mul = (a: Complex, b: Complex): Complex => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
const div = (a: Complex, b: Complex): Complex => {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
};
const abs = (a: Complex) => Math.hypot(a.re, a.im);
const toDb = (x: number) => 20 * Math.log10(x);

/** The filter's transfer functions at frequency f (Hz). */
export function lclResponse(l1: number, l2: number, c: number, rd: number, f: number): { admittance: Complex; ripplePass: Complex } {
  const w = 2 * Math.PI * f;
  const zl1 = { re: 0, im: w * l1 };
  const zl2 = { re: 0, im: w * l2 };
  const zc = { re: rd, im: -1 / (w * c) };
  return {
    admittance: div(zc, add(mul(zl1, zl2), mul(zc, add(zl1, zl2)))),
    ripplePass: div(zc, add(zc, zl2)),
  };
}

export const calculator: Calculator = {
  id: "lcl-filter",
  title: "Grid LCL filter",
  summary: "Resonance, damping resistor and its loss, ripple attenuation at the switching frequency and its sidebands, capacitor reactive power and a Bode plot of an LCL filter.",
  description:
    "For a grid-connected inverter's LCL filter with a resistor in series with each capacitor, gives the resonance " +
    "frequency, a suggested damping resistor and the loss in the one chosen, the share of the inverter's switching " +
    "ripple that reaches the grid at the switching frequency and at its sidebands, the capacitor's reactive power, and " +
    "the grid-current response to the inverter voltage as a Bode plot. Flags a resonance too close to the grid, the " +
    "switching frequency or the control's critical frequency.",
  inputs: [l1Input, l2Input, cInput, rdInput, fswInput, fInput, vInput, phasesInput, pRatedInput, iRippleInput, fControlInput],
  outputs: [
    { key: "fRes", label: "Resonance frequency (undamped)", kind: "scalar", unit: "Hz" },
    { key: "rdSuggested", label: "Suggested damping resistor 1/(3·ω_res·C)", kind: "scalar", unit: "ohm" },
    { key: "peakDb", label: "Resonance peak of i2/v_i above its low-frequency asymptote", kind: "scalar", unit: "dB", description: "How much the damping leaves of the resonance; near 0 dB or below is well damped." },
    { key: "ripplePassFsw", label: "Ripple reaching the grid at fsw (i2/i1)", kind: "scalar", unit: "%" },
    { key: "attenuationFswDb", label: "Attenuation of i2/i1 at fsw", kind: "scalar", unit: "dB" },
    { key: "attenuationSidebandDb", label: "Weakest attenuation at fsw ± 2f", kind: "scalar", unit: "dB" },
    { key: "attenuation2FswDb", label: "Attenuation of i2/i1 at 2·fsw", kind: "scalar", unit: "dB" },
    { key: "qCap", label: "Capacitor reactive power", kind: "scalar", unit: "var" },
    { key: "qCapShare", label: "Capacitor reactive power, share of the rating", kind: "scalar", unit: "%" },
    { key: "pDamping", label: "Damping resistor loss", kind: "scalar", unit: "W" },
    { key: "bode", label: "Grid current over inverter voltage, |i2/v_i| (dB re 1 A/V)", kind: "bode" },
  ],
  formulas: [
    { label: "Resonance", latex: String.raw`f_{res} = \frac{1}{2\pi}\sqrt{\frac{L_1 + L_2}{L_1 L_2 C}}` },
    { label: "Grid current over inverter voltage", latex: String.raw`\frac{i_2}{v_i} = \frac{Z_C'}{Z_{L1}Z_{L2} + Z_C'(Z_{L1} + Z_{L2})},\quad Z_C' = R_d + \frac{1}{j\omega C}` },
    { label: "Ripple reaching the grid", latex: String.raw`\frac{i_2}{i_1} = \frac{Z_C'}{Z_C' + Z_{L2}}` },
    { label: "Suggested damping", latex: String.raw`R_d = \frac{1}{3\,\omega_{res} C}` },
    { label: "Reactive power and damping loss", latex: String.raw`Q_C = m V^2 \omega_1 C,\qquad P_d = m\,(I_{C1}^2 + I_{C,sw}^2)\,R_d` },
  ],
  conventions: [
    "Per-phase values of a star-connected filter; m is the number of phases.",
    "Attenuations are of i2/i1, the share of the inverter-side ripple current that reaches the grid (positive dB = attenuated).",
    "The Bode plot is |i2/v_i| in dB relative to 1 A/V, log-spaced from f/10 to 10·fsw; the grid is taken as a stiff source (short for ripple).",
    "The damping loss counts the fundamental capacitor current and, when given, the switching ripple; other harmonics are left out.",
    "Flags follow the common design rules 10·f_grid < f_res < fsw/2 and, for digital control, a resonance near f_s/6.",
  ],
  sources: [
    "Liserre, Blaabjerg & Hansen, IEEE Trans. Industry Applications, 2005: LCL resonance and design rules (rules from memory; common practice) — published.",
    "Parker, McGrath & Holmes, IEEE Trans. Industry Applications, 2014: critical resonance frequency f_s/6 for grid-current control — memory.",
    "Transfer functions of the LCL circuit with series damping — derived; checked by integrating the circuit in the tests.",
  ],
  cautions: [
    LETHAL_VOLTAGE_CAUTION,
    "Grid connection is governed by the network operator's interconnection rules and the applicable grid-code standards; the grid's own impedance moves the resonance, so check it over the range of grid strengths the site may have.",
  ],
  compute(inputs) {
    const l1 = readQuantity(inputs, l1Input);
    const l2 = readQuantity(inputs, l2Input);
    const c = readQuantity(inputs, cInput);
    const rd = readQuantity(inputs, rdInput);
    const fsw = readQuantity(inputs, fswInput);
    const f = readQuantity(inputs, fInput);
    const v = readQuantity(inputs, vInput);
    const phases = Number(readChoice(inputs, phasesInput));
    const pRated = inputs.pRated === undefined ? undefined : readQuantity(inputs, pRatedInput);
    const iRipple = inputs.iRipple === undefined ? undefined : readQuantity(inputs, iRippleInput);
    const fControl = inputs.fControl === undefined ? undefined : readQuantity(inputs, fControlInput);

    const warnings: string[] = [];
    const wRes = Math.sqrt((l1 + l2) / (l1 * l2 * c));
    const fRes = wRes / (2 * Math.PI);
    const passAt = (frequency: number) => abs(lclResponse(l1, l2, c, rd, frequency).ripplePass);
    const attenuation = (frequency: number) => -toDb(passAt(frequency));

    // Peak of |i2/v_i| relative to the inductive asymptote 1/(ω(L1 + L2)) at the resonance.
    const admittanceAt = (frequency: number) => abs(lclResponse(l1, l2, c, rd, frequency).admittance);
    const peakDb = toDb(admittanceAt(fRes) * wRes * (l1 + l2));

    const w1 = 2 * Math.PI * f;
    const qCap = phases * v * v * w1 * c;
    const iC1 = v * w1 * c;
    const iCsw = iRipple === undefined ? 0 : iRipple * capacitorShare(l2, c, rd, fsw);

    const rdSuggested = scalar(1 / (3 * wRes * c), "ohm");
    const results: Results = {
      fRes: scalar(fRes, "Hz"),
      rdSuggested,
      ripplePassFsw: scalar(100 * passAt(fsw), "%"),
      attenuationFswDb: scalar(attenuation(fsw), "dB"),
      attenuationSidebandDb: scalar(Math.min(attenuation(fsw - 2 * f), attenuation(fsw + 2 * f)), "dB"),
      attenuation2FswDb: scalar(attenuation(2 * fsw), "dB"),
      qCap: scalar(qCap, "var"),
      pDamping: scalar(phases * (iC1 * iC1 + iCsw * iCsw) * rd, "W"),
    };
    // Undamped, the peak is unbounded: it is not given, and the warning below says so.
    if (rd > 0) results.peakDb = scalar(peakDb, "dB");
    if (pRated !== undefined) {
      const share = (100 * qCap) / pRated;
      results.qCapShare = scalar(share, "%");
      if (share > 5) warnings.push(`The capacitors draw ${share.toFixed(1)} % of the rating as reactive power (common practice: at most 5 %); a smaller C needs more inductance.`);
    }

    if (fRes < 10 * f) warnings.push(`The resonance (${scalar(fRes, "Hz").display}) is below ten times the grid frequency: low-order grid harmonics are amplified (common practice: 10·f < f_res).`);
    if (fRes > fsw / 2) warnings.push(`The resonance (${scalar(fRes, "Hz").display}) is above half the switching frequency: the switching ripple sits near it and is hardly attenuated (common practice: f_res < fsw/2).`);
    if (fControl !== undefined) {
      const critical = fControl / 6;
      if (Math.abs(fRes - critical) < 0.2 * critical) {
        warnings.push(`The resonance (${scalar(fRes, "Hz").display}) is within 20 % of the control's critical frequency f_s/6 (${scalar(critical, "Hz").display}): grid-current control can neither damp it nor stay stable easily there.`);
      }
    }
    if (rd === 0 || peakDb > 20) {
      warnings.push(`The resonance is barely damped (peak ${rd > 0 ? `${peakDb.toFixed(1)} dB above the inductive asymptote` : "unbounded without a resistor"}): add damping (suggested R_d ≈ ${rdSuggested.display}) or active damping in the control.`);
    }

    const low = f / 10;
    const high = 10 * fsw;
    const bode: BodePoint[] = [];
    for (let i = 0; i < BODE_POINTS; i++) {
      const frequency = low * (high / low) ** (i / (BODE_POINTS - 1));
      const gainDb = toDb(admittanceAt(frequency));
      // An undamped filter evaluated exactly at resonance is infinite: leave that point out of the plot.
      if (Number.isFinite(gainDb)) bode.push({ f: frequency, gainDb });
    }
    results.bode = bode;
    return { results, warnings };
  },
};

/** Share of the inverter-side ripple at frequency f that flows into the capacitor branch: |Z_L2/(Z_C' + Z_L2)|. */
function capacitorShare(l2: number, c: number, rd: number, f: number): number {
  const w = 2 * Math.PI * f;
  const zl2 = { re: 0, im: w * l2 };
  return abs(div(zl2, add({ re: rd, im: -1 / (w * c) }, zl2)));
}
