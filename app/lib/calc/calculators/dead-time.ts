/**
 * Dead time and device drops in a sine-PWM leg: the fundamental they cost, the
 * low-order harmonics they add, and the shortest pulse the modulator must make.
 *
 * Model (one leg, pole voltage about the DC midpoint, ±Vdc/2; reference duty
 * d = (1 + ma·sin θ)/2; output current i = Î·sin(θ − φ), sinusoidal and large
 * against its ripple, so its sign is fixed within each switching period):
 * - Dead time td delays every turn-on. While neither switch is on the current
 *   picks the diode: for i > 0 the output stays low, for i < 0 high; so each
 *   switching period loses (or gains) td·Vdc of volt-seconds against the current.
 * - A conducting transistor drops V_T, a conducting diode V_D (constant drops).
 * Averaged over a switching period, the pole voltage error is then exactly
 *   e(θ) = −sgn(i)·[Vdc·td·fsw + (V_T + V_D)/2] − (V_T − V_D)·ma·sin θ / 2,
 * a square wave of amplitude A = Vdc·td·fsw + (V_T + V_D)/2 in phase with the
 * current, plus a small sine in phase with the reference. Its odd harmonics are
 * 4A/(nπ) (triplens cancel line to line in a three-phase bridge).
 * The fundamental is the phasor sum
 *   V1 = (ma·Vdc/2 − (V_T − V_D)·ma/2)∠0 − (4A/π)∠−φ.
 * Shortest pulse: the narrowest off-pulse, at the reference's peak, is
 * (1 − ma)/(2·fsw); the modulator loses control when it falls below td plus the
 * switches' minimum on-time.
 *
 * Sources: Mohan, Undeland & Robbins, Power Electronics, 3rd ed., §8-7 (effect of
 * blanking time on the output voltage; section number from memory) — published;
 * the averaged error with drops and its Fourier series are derived here and
 * checked in the tests against the synthesized switched leg and an FFT.
 */
import { scalar } from "../format";
import { harmonicTable, thdUpTo, type OrderPeak } from "../spectrum";
import type { Calculator, QuantityInputSpec, Results } from "../types";
import { LETHAL_VOLTAGE_CAUTION, dcLinkVoltageInput, fundamentalFrequencyInput, readQuantity, quantityInput } from "./shared-inputs";


const vdcInput = dcLinkVoltageInput("600 V", "DC-link voltage; the leg's pole swings ±Vdc/2 about the midpoint.");
const maInput = quantityInput({ key: "ma", label: "Modulation index ma", description: "Peak of the sine reference over the carrier peak (linear range).", dimension: "dimensionless", displayUnit: "", min: 0, minExclusive: true, max: 1, default: "0.9" });
const fswInput = quantityInput({ key: "fsw", label: "Switching frequency", description: "PWM carrier frequency.", dimension: "frequency", displayUnit: "kHz", min: 0, minExclusive: true, max: 1e7, default: "10 kHz" });
const tdInput = quantityInput({ key: "td", label: "Dead time td", description: "Delay added to every turn-on so the two switches never conduct together.", dimension: "time", displayUnit: "us", min: 0, max: 1e-3, default: "1.5 us" });
const phiInput = quantityInput({ key: "phi", label: "Current lag φ", description: "Angle by which the output current lags the reference (0° resistive, 90° inductive).", dimension: "angle", displayUnit: "deg", min: -180, max: 180, default: "30 deg" });
const vTInput = quantityInput({ key: "vT", label: "Transistor drop V_T", description: "On-state drop of a conducting transistor, taken as constant.", dimension: "voltage", displayUnit: "V", min: 0, max: 50, default: "1.5 V" });
const vDInput = quantityInput({ key: "vD", label: "Diode drop V_D", description: "Forward drop of a conducting diode, taken as constant.", dimension: "voltage", displayUnit: "V", min: 0, max: 50, default: "1.2 V" });
const tMinInput = quantityInput({ key: "tMinOn", label: "Minimum on-time", description: "Optional: shortest pulse the switches and drivers can make, beside the dead time.", dimension: "time", displayUnit: "us", min: 0, max: 1e-3, optional: true });
const hmaxInput = quantityInput({ key: "hmax", label: "Highest harmonic order listed", description: "The harmonics table stops at this order.", dimension: "dimensionless", displayUnit: "", min: 3, max: 199, integer: true, default: "25" });

export const calculator: Calculator = {
  id: "dead-time",
  title: "Dead time and device drops",
  summary: "Fundamental lost and low-order harmonics added by dead time and device drops in a sine-PWM leg, and the shortest pulse.",
  description:
    "For one leg of a sine-PWM bridge with a given dead time, transistor and diode drops and output-current phase, " +
    "gives the average voltage error (a square wave in phase with the current), the fundamental with and without it, " +
    "the 3rd, 5th, 7th … harmonics it adds, and the narrowest pulse the modulator must make against the dead time " +
    "plus the switches' minimum on-time.",
  inputs: [vdcInput, maInput, fswInput, tdInput, phiInput, vTInput, vDInput, fundamentalFrequencyInput, tMinInput, hmaxInput],
  outputs: [
    { key: "errorAmplitude", label: "Error square-wave amplitude A", kind: "scalar", unit: "V", description: "Vdc·td·fsw + (V_T + V_D)/2, against the current's sign." },
    { key: "v1Ideal", label: "Ideal fundamental peak (pole)", kind: "scalar", unit: "V" },
    { key: "v1Peak", label: "Fundamental peak with dead time and drops (pole)", kind: "scalar", unit: "V" },
    { key: "v1Loss", label: "Fundamental lost", kind: "scalar", unit: "%", description: "Of the ideal fundamental." },
    { key: "v1Shift", label: "Phase shift of the fundamental", kind: "scalar", unit: "deg" },
    { key: "thdLowOrder", label: "THD of the added harmonics, orders 3–hmax (pole)", kind: "scalar", unit: "%" },
    { key: "thdLowOrderLine", label: "THD of the added harmonics, line to line (three-phase, no triplens)", kind: "scalar", unit: "%" },
    { key: "minPulse", label: "Narrowest pulse (at the reference peak)", kind: "scalar", unit: "s" },
    { key: "pulseMargin", label: "Margin over dead time + minimum on-time", kind: "scalar", unit: "s" },
    { key: "harmonics", label: "Harmonics added (pole)", kind: "harmonics", description: "Fundamental first, then the odd orders of the error wave." },
  ],
  formulas: [
    { label: "Averaged error", latex: String.raw`e(\theta) = -\operatorname{sgn}(i)\Big[V_{dc}t_d f_{sw} + \tfrac{V_T + V_D}{2}\Big] - (V_T - V_D)\frac{m_a}{2}\sin\theta` },
    { label: "Fundamental (phasor)", latex: String.raw`\underline{V}_1 = \Big(\frac{m_a V_{dc}}{2} - \frac{(V_T - V_D)m_a}{2}\Big) - \frac{4A}{\pi}e^{-j\varphi}` },
    { label: "Harmonics added", latex: String.raw`V_n = \frac{4A}{n\pi},\ n = 3, 5, 7 \ldots` },
    { label: "Narrowest pulse", latex: String.raw`t_{min} = \frac{1 - m_a}{2 f_{sw}} \ \ge\ t_d + t_{on,min}` },
  ],
  conventions: [
    "Pole voltage about the DC midpoint; the line-to-line fundamental of a three-phase bridge is √3 times it, and its triplen error harmonics cancel.",
    "The current is sinusoidal with a fixed sign through each switching period; near its zero crossings, where the ripple makes it change sign within a period, the real error is smaller than the model's (the model is the worst case).",
    "Drops are constant (no slope resistance); φ is the current's lag behind the reference.",
    "Harmonics listed are those of the error only (the ideal PWM's own sidebands sit near the carrier).",
  ],
  sources: [
    "Mohan, Undeland & Robbins, Power Electronics: Converters, Applications, and Design, 3rd ed., §8-7, effect of blanking time (section from memory) — published.",
    "Averaged error with device drops, its Fourier series and the narrowest pulse — derived; checked against the synthesized switched leg.",
  ],
  cautions: [
    LETHAL_VOLTAGE_CAUTION,
    "Too short a dead time lets both switches of a leg conduct at once (shoot-through), which can destroy them: take the dead time from the drivers' and switches' worst-case delays, not from this distortion figure.",
  ],
  compute(inputs) {
    const vdc = readQuantity(inputs, vdcInput);
    const ma = readQuantity(inputs, maInput);
    const fsw = readQuantity(inputs, fswInput);
    const td = readQuantity(inputs, tdInput);
    const phi = (readQuantity(inputs, phiInput) * Math.PI) / 180;
    const vT = readQuantity(inputs, vTInput);
    const vD = readQuantity(inputs, vDInput);
    const f = readQuantity(inputs, fundamentalFrequencyInput);
    const tMinOn = inputs.tMinOn === undefined ? 0 : readQuantity(inputs, tMinInput);
    const hmax = readQuantity(inputs, hmaxInput);
    const warnings: string[] = [];

    const amplitude = vdc * td * fsw + (vT + vD) / 2;
    const ideal = (ma * vdc) / 2;
    const inPhase = ideal - ((vT - vD) * ma) / 2 - ((4 * amplitude) / Math.PI) * Math.cos(phi);
    const quadrature = ((4 * amplitude) / Math.PI) * Math.sin(phi);
    const v1 = Math.hypot(inPhase, quadrature);
    const lines: OrderPeak[] = [];
    for (let n = 3; n <= hmax; n += 2) lines.push({ n, peak: (4 * amplitude) / (n * Math.PI) });
    const minPulse = (1 - ma) / (2 * fsw);
    const margin = minPulse - td - tMinOn;
    if (margin < 0) {
      warnings.push(
        `The narrowest pulse, ${scalar(minPulse, "s").display}, is shorter than the dead time plus minimum on-time (${scalar(td + tMinOn, "s").display}): ` +
          "pulses drop near the reference's peaks, adding low-order distortion this model does not show. Lower ma or the switching frequency.",
      );
    }
    if (td * fsw > 0.05) warnings.push(`Dead time is ${(100 * td * fsw).toFixed(1)} % of the switching period: compensate it in the modulator or lower the switching frequency.`);

    const results: Results = {
      errorAmplitude: scalar(amplitude, "V"),
      v1Ideal: scalar(ideal, "V"),
      v1Peak: scalar(v1, "V"),
      v1Loss: scalar((100 * (ideal - v1)) / ideal, "%"),
      v1Shift: scalar((Math.atan2(quadrature, inPhase) * 180) / Math.PI, "deg"),
      thdLowOrder: scalar(thdUpTo(v1, lines, hmax), "%"),
      // Triplen orders cancel between the legs' line-to-line voltages.
      thdLowOrderLine: scalar(thdUpTo(v1, lines.filter((line) => line.n % 3 !== 0), hmax), "%"),
      minPulse: scalar(minPulse, "s"),
      pulseMargin: scalar(margin, "s"),
      harmonics: harmonicTable(v1, lines, hmax, f),
    };
    return { results, warnings };
  },
};
