/**
 * DC-link capacitance and ripple current of a single-phase inverter.
 *
 * A single-phase load at unity power factor draws p(t) = P·(1 − cos 2ωt): the
 * DC link supplies the average P and the capacitor the part at twice the output
 * frequency. Its current is (P/Vdc)·cos 2ωt, so
 *   I_ripple,rms ≈ P/(√2·Vdc)
 * and the charge it moves in half a ripple period sets the peak-to-peak ripple:
 *   ΔV_pp = P/(2π·f·Vdc·C)   ⇒   C = P/(2π·f·Vdc·ΔV_pp).
 * Assumes a stiff source that supplies only the average current, Vdc ≫ ΔV_pp,
 * and no switching-frequency ripple (that adds to the capacitor's RMS current).
 *
 * With power factor pf = cos φ (v = √2V·sin ωt, i = √2I·sin(ωt − φ)):
 *   p(t) = VI·cos φ − VI·cos(2ωt − φ),
 * so the part at 2ω has amplitude S = VI = P/pf, the apparent power: the ripple,
 * the capacitance and the ripple current all follow S, not P.
 *
 * Source: derived from the instantaneous power of a single-phase load (no single
 * published table; the result is standard).
 */
import { scalar } from "../format";
import { fieldError } from "../errors";
import type { Calculator, QuantityInputSpec } from "../types";
import { dcLinkVoltageInput, LETHAL_VOLTAGE_CAUTION, outputFrequencyInput, readQuantity } from "./shared-inputs";

const pInput: QuantityInputSpec = {
  key: "p",
  label: "Output power",
  description: "Real output power of the single-phase inverter.",
  kind: "quantity",
  dimension: "power",
  displayUnit: "W",
  min: 0,
  minExclusive: true,
  max: 1e9,
};

const pfInput: QuantityInputSpec = {
  key: "pf",
  label: "Load power factor",
  description: "Displacement power factor cos φ of the load, 0 to 1. The second-harmonic ripple follows the apparent power P/pf.",
  kind: "quantity",
  dimension: "dimensionless",
  displayUnit: "",
  min: 0,
  minExclusive: true,
  max: 1,
  default: "1",
};

const vdcInput = dcLinkVoltageInput(undefined, "Mean DC-link voltage.");

const fInput = outputFrequencyInput("Output frequency", "Inverter output frequency; the link ripple is at twice this.");

const rippleInput: QuantityInputSpec = {
  key: "rippleVpp",
  label: "Allowed ripple (peak to peak)",
  description: "Peak-to-peak voltage ripple allowed on the DC link at twice the output frequency.",
  kind: "quantity",
  dimension: "voltage",
  displayUnit: "V",
  min: 0,
  minExclusive: true,
  max: 1e6,
};

/** Above this ripple-to-Vdc ratio the constant-voltage approximation is worth a warning (common practice). */
const LARGE_RIPPLE_RATIO = 0.1;

export const calculator: Calculator = {
  id: "dc-link",
  title: "DC-link capacitor",
  summary: "Capacitance for a given second-harmonic ripple, and the capacitor's ripple current, for a single-phase inverter.",
  description:
    "A single-phase inverter draws its power in pulses at twice the output frequency. Gives the DC-link capacitance that keeps " +
    "that ripple within the allowed peak-to-peak voltage, and the RMS ripple current the capacitor must carry.",
  inputs: [pInput, pfInput, vdcInput, fInput, rippleInput],
  outputs: [
    { key: "c", label: "DC-link capacitance", kind: "scalar", unit: "F" },
    { key: "iRippleRms", label: "Capacitor ripple current (RMS)", kind: "scalar", unit: "A" },
    { key: "rippleFrequency", label: "Ripple frequency", kind: "scalar", unit: "Hz" },
    { key: "apparentPower", label: "Apparent power S = P/pf", kind: "scalar", unit: "VA", description: "The ripple follows this, not the real power." },
  ],
  formulas: [
    { label: "Instantaneous power", latex: String.raw`p(t) = S\cos\varphi - S\cos(2\omega t - \varphi),\quad S = P/pf` },
    { label: "Capacitance", latex: String.raw`C = \frac{S}{2\pi f\,V_{dc}\,\Delta V_{pp}}` },
    { label: "Ripple current", latex: String.raw`I_{C,rms} \approx \frac{S}{\sqrt{2}\,V_{dc}}` },
  ],
  conventions: [
    "Single-phase output; the ripple is the second harmonic of the output frequency and follows the apparent power S = P/pf (pf 1 by default).",
    "The source supplies only the average current; switching-frequency ripple is not included and adds to the capacitor's RMS current.",
    "Vdc is assumed nearly constant (ripple small compared with Vdc).",
  ],
  sources: [
    "Derived from the instantaneous power of a single-phase load, p(t) = S·cos φ − S·cos(2ωt − φ) — derived.",
  ],
  cautions: [
    LETHAL_VOLTAGE_CAUTION,
    "Choose capacitors by ripple-current rating and ESR heating as well as capacitance; fit bleed resistors and allow for tolerance and ageing.",
  ],
  compute(inputs) {
    const p = readQuantity(inputs, pInput);
    const pf = readQuantity(inputs, pfInput);
    const apparent = p / pf;
    const vdc = readQuantity(inputs, vdcInput);
    const f = readQuantity(inputs, fInput);
    const rippleVpp = readQuantity(inputs, rippleInput);
    if (rippleVpp >= vdc) {
      throw fieldError("rippleVpp", `rippleVpp must be below vdc (${scalar(vdc, "V").display}); got ${scalar(rippleVpp, "V").display}`);
    }
    const warnings: string[] = [
      `The ripple follows the apparent power S = P/pf = ${scalar(apparent, "VA").display} (pf ${pf}): a load below unity power factor needs more capacitance and ripple current than its real power suggests.`,
    ];
    if (rippleVpp > LARGE_RIPPLE_RATIO * vdc) {
      warnings.push(`The ripple is ${scalar((rippleVpp / vdc) * 100, "%").display} of Vdc: the constant-Vdc approximation loosens above about 10 % (common practice); check by simulation.`);
    }
    return {
      results: {
        c: scalar(apparent / (2 * Math.PI * f * vdc * rippleVpp), "F"),
        iRippleRms: scalar(apparent / (Math.SQRT2 * vdc), "A"),
        apparentPower: scalar(apparent, "VA"),
        rippleFrequency: scalar(2 * f, "Hz"),
      },
      warnings,
    };
  },
};
