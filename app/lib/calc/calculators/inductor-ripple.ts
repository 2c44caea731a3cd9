/**
 * Output inductor ripple of a sine-triangle PWM bridge, and the current THD into an R-L load.
 *
 * What it computes: the peak-to-peak ripple current in the output inductor over
 * the fundamental cycle — its maximum, the angle where it occurs and its value at
 * the reference's peak — for bipolar or unipolar PWM; with a load resistance, the
 * current's fundamental, THD and weighted ripple RMS when the bridge drives the
 * inductor and that resistance in series.
 *
 * Ripple model (one switching period, mf ≫ 1, so the output voltage is constant
 * over it and equal to the reference's fundamental v_o = ma·V·sin θ; ideal switches):
 * - bipolar, output swings ±V (V = Vdc full bridge, Vdc/2 half bridge), duty
 *   d = (1 + ma·sin θ)/2:  ΔI_pp = (V − v_o)·d/(L·fsw) = V·(1 − ma²sin²θ)/(2L·fsw),
 *   largest at the zero crossing, V/(2L·fsw);
 * - unipolar (full bridge), the output steps 0 ↔ ±Vdc twice per carrier period:
 *   ΔI_pp = Vdc·ma|sin θ|·(1 − ma|sin θ|)/(2L·fsw), largest where ma|sin θ| = ½
 *   (Vdc/(8L·fsw)) when ma ≥ ½, else at the peak.
 * (Derived from v = L di/dt over the on-time; the same expressions are in Holmes &
 * Lipo, Pulse Width Modulation for Power Converters, 2003, and in most inverter
 * design notes — section from memory.)
 *
 * R-L load current: every line of the bridge voltage (the Bessel closed form of the
 * spwm calculator, Holmes & Lipo 2003 ch. 3) divided by |R + j·n·ω·L|; the lines
 * of 20 carrier groups are summed (the 1/n fall of the impedance leaves less than
 * 1e-6 of the ripple beyond). Checked in the tests against the exact switched
 * voltage integrated through the R-L circuit (exponential segments) and an FFT.
 */
import { fieldError } from "../errors";
import { scalar } from "../format";
import type { Calculator, QuantityInputSpec, Results } from "../types";
import {
  LETHAL_VOLTAGE_CAUTION,
  dcLinkVoltageInput,
  outputFrequencyInput,
  readChoice,
  readQuantity,
} from "./shared-inputs";
import { bridgeInput, schemeInput, visitSidebandLines, type PwmScheme } from "./spwm";

const vdcInput = dcLinkVoltageInput("400 V", "DC-link voltage across the bridge (a half bridge's pole swings ±Vdc/2).");

const lInput: QuantityInputSpec = {
  key: "l",
  label: "Output inductance",
  description: "The inductance between the bridge and the output voltage (for a full bridge, both legs' inductors together).",
  kind: "quantity",
  dimension: "inductance",
  displayUnit: "mH",
  min: 0,
  minExclusive: true,
  max: 10,
  default: "1.5 mH",
};

const fswInput: QuantityInputSpec = {
  key: "fsw",
  label: "Switching (carrier) frequency",
  description: "Frequency of the triangle carrier; each leg switches on and off once per carrier period.",
  kind: "quantity",
  dimension: "frequency",
  displayUnit: "kHz",
  min: 0,
  minExclusive: true,
  max: 10e6,
  default: "20 kHz",
};

const maInput: QuantityInputSpec = {
  key: "ma",
  label: "Modulation index ma",
  description: "Peak of the sine reference over the carrier peak; the output fundamental is ma times the bridge's ±V.",
  kind: "quantity",
  dimension: "dimensionless",
  displayUnit: "",
  min: 0,
  minExclusive: true,
  max: 1,
  default: "0.8",
};

const rInput: QuantityInputSpec = {
  key: "rLoad",
  label: "Load resistance (optional)",
  description: "Series resistance of an R-L load driven through the inductor; gives the load current's fundamental and THD.",
  kind: "quantity",
  dimension: "resistance",
  displayUnit: "ohm",
  min: 0,
  minExclusive: true,
  max: 1e6,
  optional: true,
};

const fInput = outputFrequencyInput("Output frequency", "Fundamental frequency of the output; fsw/f is the frequency ratio mf.");

/** Carrier groups whose sidebands are summed for the load current. */
const CURRENT_GROUPS = 20;

/** Peak-to-peak ripple, per unit of V/(L·fsw), at reference angle θ. */
export function ripplePerUnit(scheme: PwmScheme, ma: number, theta: number): number {
  const s = ma * Math.abs(Math.sin(theta));
  return scheme === "bipolar" ? (1 - s * s) / 2 : (s * (1 - s)) / 2;
}

/** The angle (deg, 0…90) of the largest ripple and its per-unit value. */
export function largestRipple(scheme: PwmScheme, ma: number): { angle: number; perUnit: number } {
  if (scheme === "bipolar") return { angle: 0, perUnit: 0.5 };
  if (ma >= 0.5) return { angle: (Math.asin(0.5 / ma) * 180) / Math.PI, perUnit: 1 / 8 };
  return { angle: 90, perUnit: (ma * (1 - ma)) / 2 };
}

export const calculator: Calculator = {
  id: "inductor-ripple",
  title: "Output inductor ripple",
  summary: "Peak-to-peak inductor ripple over the cycle for bipolar and unipolar PWM, and the current THD into an R-L load.",
  description:
    "For a half or full bridge with sine-triangle PWM feeding an output inductor, gives the peak-to-peak ripple current " +
    "over the fundamental cycle: its maximum and the angle where it occurs, and its value at the reference's peak. With " +
    "a load resistance it also gives the fundamental current, the current THD and the ripple RMS into the R-L load.",
  inputs: [vdcInput, lInput, fswInput, maInput, schemeInput, bridgeInput, fInput, rInput],
  outputs: [
    { key: "ripplePpMax", label: "Largest peak-to-peak ripple", kind: "scalar", unit: "A" },
    { key: "ripplePpMaxAngle", label: "Where it occurs (reference angle)", kind: "scalar", unit: "deg", description: "In the first quarter cycle; the ripple repeats mirrored in the others." },
    { key: "ripplePpAtPeak", label: "Ripple at the reference's peak (90°)", kind: "scalar", unit: "A" },
    { key: "mf", label: "Frequency ratio fsw/f", kind: "scalar", unit: "" },
    { key: "i1Rms", label: "Load current fundamental RMS", kind: "scalar", unit: "A" },
    { key: "irms", label: "Load current RMS", kind: "scalar", unit: "A" },
    { key: "rippleRms", label: "Load current ripple RMS (all but the fundamental)", kind: "scalar", unit: "A" },
    { key: "thdCurrent", label: "Load current THD", kind: "scalar", unit: "%" },
  ],
  formulas: [
    { label: "Bipolar (output ±V)", latex: String.raw`\Delta I_{pp}(\theta) = \frac{V\,(1 - m_a^2\sin^2\theta)}{2 L f_{sw}},\qquad \Delta I_{pp,\max} = \frac{V}{2 L f_{sw}}\ \text{at}\ \theta = 0` },
    { label: "Unipolar (full bridge)", latex: String.raw`\Delta I_{pp}(\theta) = \frac{V_{dc}\,m_a|\sin\theta|\,(1 - m_a|\sin\theta|)}{2 L f_{sw}},\qquad \Delta I_{pp,\max} = \frac{V_{dc}}{8 L f_{sw}}\ \text{at}\ m_a\sin\theta = \tfrac12` },
    { label: "Load current line n", latex: String.raw`I_n = \frac{V_n}{\sqrt{R^2 + (n\,\omega_1 L)^2}},\qquad \mathrm{THD}_I = \frac{\sqrt{\sum_{n\ne1} I_n^2}}{I_1}` },
  ],
  conventions: [
    "The output voltage is taken as the bridge voltage's fundamental, constant over each switching period (mf ≫ 1); the ripple formulas are exact in that limit and within about 1/mf otherwise.",
    "Bipolar: the output swings ±Vdc (full bridge) or ±Vdc/2 (half bridge). Unipolar needs a full bridge.",
    "Peak-to-peak ripple is the rise of the inductor current during one switching period's on-time.",
    "The load-current figures treat the inductor and the load resistance as a series R-L driven by the bridge voltage (no output capacitor).",
    "Ideal switches, no dead time, stiff DC link, linear inductance (no saturation).",
  ],
  sources: [
    "Holmes & Lipo, Pulse Width Modulation for Power Converters, IEEE Press/Wiley, 2003: ripple current of PWM inverters, and ch. 3, double Fourier series of sine-triangle PWM (sections from memory) — published.",
    "Ripple per switching period from v = L·di/dt over the on-time — derived.",
  ],
  cautions: [
    LETHAL_VOLTAGE_CAUTION,
    "Inductance falls with current in powder and gapped ferrite cores: check the ripple at the peak current with the inductance the core keeps there.",
  ],
  compute(inputs) {
    const vdc = readQuantity(inputs, vdcInput);
    const l = readQuantity(inputs, lInput);
    const fsw = readQuantity(inputs, fswInput);
    const ma = readQuantity(inputs, maInput);
    const scheme = readChoice(inputs, schemeInput) as PwmScheme;
    const bridge = readChoice(inputs, bridgeInput);
    const f = readQuantity(inputs, fInput);
    const r = inputs.rLoad === undefined ? undefined : readQuantity(inputs, rInput);
    if (scheme === "unipolar" && bridge === "half") {
      throw fieldError("scheme", "Unipolar PWM needs two legs: choose a full bridge, or bipolar PWM for a half bridge.");
    }
    const mf = fsw / f;
    if (mf < 3) throw fieldError("fsw", "The switching frequency must be at least 3 times the output frequency.");

    const warnings: string[] = [];
    if (mf < 20) {
      warnings.push(`fsw/f = ${mf.toFixed(1)}: the output voltage changes within a switching period, so the ripple figures are only rough below about 20.`);
    }
    const swing = bridge === "half" ? vdc / 2 : vdc;
    const base = swing / (l * fsw);
    const largest = largestRipple(scheme, ma);

    const results: Results = {
      ripplePpMax: scalar(largest.perUnit * base, "A"),
      ripplePpMaxAngle: scalar(largest.angle, "deg"),
      ripplePpAtPeak: scalar(ripplePerUnit(scheme, ma, Math.PI / 2) * base, "A"),
      mf: scalar(mf, ""),
    };

    if (r !== undefined) {
      const omega = 2 * Math.PI * f;
      let fundamental = 0;
      let distortionSquares = 0;
      // Lines of one order from different carrier groups add as signed amplitudes (same phase convention).
      const byOrder = new Map<number, number>();
      visitSidebandLines(ma, mf, scheme, CURRENT_GROUPS * mf * (scheme === "unipolar" ? 2 : 1), (order, amplitude) => {
        const key = Math.round(order * 1e9);
        byOrder.set(key, (byOrder.get(key) ?? 0) + amplitude);
      });
      for (const [key, amplitude] of byOrder) {
        const order = key / 1e9;
        if (order <= 0) continue;
        const current = (Math.abs(amplitude) * swing) / Math.hypot(r, order * omega * l);
        if (key === 1e9) fundamental = current;
        else distortionSquares += current * current;
      }
      if (!(fundamental > 0)) throw fieldError("ma", "The output has no fundamental at these inputs; raise ma.");
      const rippleRms = Math.sqrt(distortionSquares / 2);
      results.i1Rms = scalar(fundamental / Math.SQRT2, "A");
      results.irms = scalar(Math.sqrt(fundamental * fundamental / 2 + rippleRms * rippleRms), "A");
      results.rippleRms = scalar(rippleRms, "A");
      results.thdCurrent = scalar((100 * Math.sqrt(distortionSquares)) / fundamental, "%");
    }
    return { results, warnings };
  },
};
