/**
 * Voltage and current stress, losses and junction temperature of one switch in a
 * sinusoidal-PWM inverter (full bridge, half bridge or three-phase bridge).
 *
 * Load current: I = P/(pf·Vout) single-phase, I = P/(√3·V_LL·pf) three-phase;
 * Î = √2·I. Without Vout, the largest linear-SPWM output is assumed (ma = 1):
 * Vdc/√2 full bridge, Vdc/(2√2) half bridge, (√3/(2√2))·Vdc ≈ 0.612·Vdc line to line.
 *
 * Per switch position (the transistor with its antiparallel diode), which carries
 * one half-sine of the load current per cycle:
 *   I_rms = Î/2,  I_avg = Î/π,  V_block = Vdc.
 * Conduction, SPWM duty-weighted (Mohan, Undeland & Robbins, 3rd ed., ch. 8
 * averaging): with reference ma·sin θ the upper transistor's duty is
 * d = (1 + ma·sin θ)/2, and it carries the load current Î·sin(θ − φ) while that is
 * positive; the antiparallel diode carries it for the rest, 1 − d. Averaging over
 * the half cycle (derived, x = θ − φ, ∫₀^π sin x·sin(x + φ) dx = (π/2)·cos φ,
 * ∫₀^π sin²x·sin(x + φ) dx = (4/3)·cos φ):
 *   I_T,avg = Î·(1/(2π) + ma·cos φ/8),   I_T,rms² = Î²·(1/8 + ma·cos φ/(3π)),
 *   I_D,avg = Î·(1/(2π) − ma·cos φ/8),   I_D,rms² = Î²·(1/8 − ma·cos φ/(3π)).
 * IGBT: P_T = V_CE0·I_T,avg + r_CE·I_T,rms², P_D = V_F0·I_D,avg + r_D·I_D,rms².
 * MOSFET: the channel conducts both ways (synchronous, dead time neglected), so
 * P = R_DS(on)·(I_T,rms² + I_D,rms²) = R_DS(on)·Î²/4 — the half-sine I_rms² exactly.
 * The old constant-drop figure V_CE·Î/π (all the half-sine charged to the
 * transistor) is kept as pCondBound, labelled as an upper bound.
 * Switching, linearised edges averaged over the half-sine of current:
 *   P_sw = ½·Vdc·(Î/π)·(t_r + t_f)·f_sw,
 * or from datasheet energies scaled linearly from their test point:
 *   P_sw = f_sw·(E_on + E_off)·(Vdc/V_test)·(Î/π)/I_test.
 * Junction: T_j = T_a + R_th(j-a)·(P_cond + P_sw).
 * Voltage margin against the 80 % derating rule: (1 − V_block/(0.8·V_rated))·100 %.
 *
 * ma is Vout over the largest linear output (ma = 1) and cos φ is pf (taken as the
 * displacement factor).
 *
 * Sources: Mohan, Undeland & Robbins, Power Electronics: Converters, Applications,
 * and Design, 3rd ed., ch. 8 (SPWM output: ma·Vdc, ma·Vdc/2, 0.612·ma·Vdc line to
 * line) — published; ch. 2 (switching loss ½·Vd·Io·fs·(t_on + t_off) with linear
 * edges; chapter from memory) — published. Averaging over the sine, the half-sine
 * per-switch current, the constant-drop IGBT model, linear scaling of switching
 * energies and the 80 % voltage derating are common practice.
 */
import { CalculationError } from "../errors";
import { scalar } from "../format";
import type { Calculator, ChoiceInputSpec, FieldError, QuantityInputSpec, Results } from "../types";
import { dcLinkVoltageInput, LETHAL_VOLTAGE_CAUTION, readChoice, readQuantity, quantityInput } from "./shared-inputs";


const topologyInput: ChoiceInputSpec = {
  key: "topology",
  label: "Bridge",
  description: "Which sinusoidal-PWM bridge the switch sits in.",
  kind: "choice",
  options: [
    { value: "full-bridge", label: "Single-phase full bridge (4 switches)" },
    { value: "half-bridge", label: "Single-phase half bridge (2 switches)" },
    { value: "three-phase", label: "Three-phase bridge (6 switches)" },
  ],
  default: "full-bridge",
};

const deviceInput: ChoiceInputSpec = {
  key: "device",
  label: "Device",
  description: "MOSFET (resistive conduction, give rdsOn) or IGBT (constant drop, give vceSat).",
  kind: "choice",
  options: [
    { value: "mosfet", label: "MOSFET" },
    { value: "igbt", label: "IGBT" },
  ],
  default: "mosfet",
};

const vdcInput = dcLinkVoltageInput(undefined, "DC-link voltage across each leg.");
const pInput = quantityInput({ key: "p", label: "Output power", description: "Total real output power of the inverter.", dimension: "power", displayUnit: "W", min: 0, minExclusive: true, max: 1e9 });
const pfInput = quantityInput({ key: "pf", label: "Power factor", description: "Load displacement power factor, 0 to 1.", dimension: "dimensionless", displayUnit: "", min: 0, minExclusive: true, max: 1, default: "1" });
const voutInput = quantityInput({
  key: "vout",
  label: "Output voltage (RMS)",
  description: "Fundamental RMS output voltage: load voltage for single-phase, line to line for three-phase. Absent: the largest linear-SPWM output (ma = 1).",
  dimension: "voltage",
  displayUnit: "V",
  min: 0,
  minExclusive: true,
  max: 1e6,
  optional: true,
});
const fswInput = quantityInput({ key: "fsw", label: "Switching frequency", description: "PWM carrier frequency.", dimension: "frequency", displayUnit: "kHz", min: 0, minExclusive: true, max: 1e8 });
const rdsOnInput = quantityInput({ key: "rdsOn", label: "R_DS(on)", description: "MOSFET on-resistance at the expected junction temperature.", dimension: "resistance", displayUnit: "mohm", min: 0, max: 1e3, optional: true });
const vceSatInput = quantityInput({ key: "vceSat", label: "V_CE0 (IGBT threshold)", description: "IGBT on-state threshold voltage V_CE0 of the linear model V_CE = V_CE0 + r_CE·i, at the expected junction temperature. With no rCe, give V_CE(sat) here: a constant drop.", dimension: "voltage", displayUnit: "V", min: 0, max: 100, optional: true });
const rCeInput = quantityInput({ key: "rCe", label: "r_CE (IGBT slope resistance)", description: "Slope of the IGBT's on-state curve, V_CE = V_CE0 + r_CE·i. Absent: 0 (constant drop).", dimension: "resistance", displayUnit: "mohm", min: 0, max: 1e3, optional: true });
const vF0Input = quantityInput({ key: "vF0", label: "V_F0 (diode threshold)", description: "Antiparallel diode threshold of V_F = V_F0 + r_D·i (IGBT only; a MOSFET's channel conducts reverse current). Absent: diode loss not computed.", dimension: "voltage", displayUnit: "V", min: 0, max: 100, optional: true });
const rDInput = quantityInput({ key: "rD", label: "r_D (diode slope resistance)", description: "Slope of the diode's forward curve. Absent: 0.", dimension: "resistance", displayUnit: "mohm", min: 0, max: 1e3, optional: true });
const trInput = quantityInput({ key: "tr", label: "Rise time t_r", description: "Current rise (turn-on) time from the datasheet.", dimension: "time", displayUnit: "ns", min: 0, max: 1e-3, optional: true });
const tfInput = quantityInput({ key: "tf", label: "Fall time t_f", description: "Current fall (turn-off) time from the datasheet.", dimension: "time", displayUnit: "ns", min: 0, max: 1e-3, optional: true });
const eonInput = quantityInput({ key: "eon", label: "E_on", description: "Turn-on energy per pulse at the datasheet test point.", dimension: "energy", displayUnit: "uJ", min: 0, max: 100, optional: true });
const eoffInput = quantityInput({ key: "eoff", label: "E_off", description: "Turn-off energy per pulse at the datasheet test point.", dimension: "energy", displayUnit: "uJ", min: 0, max: 100, optional: true });
const eTestVInput = quantityInput({ key: "eTestV", label: "Test voltage of E_on/E_off", description: "Datasheet test voltage for the switching energies.", dimension: "voltage", displayUnit: "V", min: 0, minExclusive: true, max: 1e6, optional: true });
const eTestIInput = quantityInput({ key: "eTestI", label: "Test current of E_on/E_off", description: "Datasheet test current for the switching energies.", dimension: "current", displayUnit: "A", min: 0, minExclusive: true, max: 1e6, optional: true });
const rthJaInput = quantityInput({ key: "rthJa", label: "R_th junction to ambient", description: "One switch's total thermal resistance, junction to ambient: R_th(j-c) + R_th(c-s) + R_th(s-a) for its own heatsink.", dimension: "thermalResistance", displayUnit: "K/W", min: 0, max: 1e3 });
const taInput = quantityInput({ key: "ta", label: "Ambient temperature", description: "Air temperature at the heatsink (40 °C is a common design ambient inside an enclosure).", dimension: "temperature", displayUnit: "degC", min: -100, max: 300, default: "40 degC" });
const vRatedInput = quantityInput({ key: "vRated", label: "Rated blocking voltage", description: "Datasheet V_DS or V_CES rating.", dimension: "voltage", displayUnit: "V", min: 0, minExclusive: true, max: 1e6 });
const tjMaxInput = quantityInput({ key: "tjMax", label: "Maximum junction temperature", description: "Optional: the datasheet's T_j(max), to warn when exceeded.", dimension: "temperature", displayUnit: "degC", min: 0, max: 400, optional: true });

/** Blocking voltage kept at or below this share of the rating (common practice). */
export const VOLTAGE_DERATING = 0.8;

/** Switch positions (transistor with its antiparallel diode) of each bridge. */
export const SWITCH_COUNT: Record<string, number> = { "full-bridge": 4, "half-bridge": 2, "three-phase": 6 };

/**
 * Average conduction loss of a device carrying V0 + r·i in a sine-PWM leg, duty-weighted over the
 * cycle; σ = +1 for the transistor, −1 for its antiparallel diode (Mohan, Undeland & Robbins,
 * 3rd ed., ch. 8 averaging; integrals derived in the module comment).
 */
export function conductionLoss(v0: number, r: number, iPeak: number, ma: number, pf: number, sigma: 1 | -1): number {
  return v0 * iPeak * (1 / (2 * Math.PI) + (sigma * ma * pf) / 8) + r * iPeak * iPeak * (1 / 8 + (sigma * ma * pf) / (3 * Math.PI));
}

/** Largest linear-SPWM fundamental RMS (ma = 1), load voltage or line to line. Mohan 3rd ed. ch. 8. */
export function maxLinearOutputRms(topology: string, vdc: number): number {
  if (topology === "half-bridge") return vdc / (2 * Math.SQRT2);
  if (topology === "three-phase") return (Math.sqrt(3) / (2 * Math.SQRT2)) * vdc;
  return vdc / Math.SQRT2;
}

const optional = (inputs: Parameters<Calculator["compute"]>[0], spec: QuantityInputSpec) =>
  inputs[spec.key] === undefined ? undefined : readQuantity(inputs, spec);

export const calculator: Calculator = {
  id: "switch-stress",
  title: "Switch stress and losses",
  summary: "Blocking voltage, peak and RMS current, conduction and switching loss, junction temperature and voltage margin of one inverter switch.",
  description:
    "For a sinusoidal-PWM full bridge, half bridge or three-phase bridge: the stresses on one switch, its conduction and " +
    "switching losses from datasheet figures (R_DS(on) or V_CE(sat); rise and fall times or switching energies), its junction " +
    "temperature through one thermal resistance to ambient, and the headroom of its voltage rating against an 80 % derating rule.",
  inputs: [topologyInput, deviceInput, vdcInput, pInput, pfInput, voutInput, fswInput, rdsOnInput, vceSatInput, rCeInput, vF0Input, rDInput, trInput, tfInput, eonInput, eoffInput, eTestVInput, eTestIInput, rthJaInput, taInput, vRatedInput, tjMaxInput],
  outputs: [
    { key: "vBlock", label: "Blocking voltage", kind: "scalar", unit: "V" },
    { key: "iPeak", label: "Peak current", kind: "scalar", unit: "A" },
    { key: "iRms", label: "RMS current per switch", kind: "scalar", unit: "A" },
    { key: "pCond", label: "Conduction loss per transistor", kind: "scalar", unit: "W", description: "SPWM duty-weighted, V0 + r·i model (MOSFET: R_DS(on), both directions)." },
    { key: "pCondDiode", label: "Conduction loss per diode", kind: "scalar", unit: "W", description: "IGBT's antiparallel diode, SPWM duty-weighted; given when vF0 is." },
    { key: "pCondBound", label: "Conduction loss, upper bound (IGBT)", kind: "scalar", unit: "W", description: "V_CE0·Î/π: the whole half-sine charged to the transistor. An upper bound, not an estimate." },
    { key: "ma", label: "Modulation index used", kind: "scalar", unit: "", description: "Vout over the largest linear SPWM output." },
    { key: "pSw", label: "Switching loss per switch", kind: "scalar", unit: "W" },
    { key: "pLossTotal", label: "Loss in all switches", kind: "scalar", unit: "W" },
    { key: "tj", label: "Junction temperature", kind: "scalar", unit: "degC" },
    { key: "voltageMargin", label: "Voltage margin (80 % rule)", kind: "scalar", unit: "%", description: "Positive: headroom within the derating rule; negative: the rule is broken." },
  ],
  formulas: [
    { label: "Load current", latex: String.raw`\hat I = \sqrt{2}\,\frac{P}{pf\,V_{out}}\ \text{(1-ph)},\quad \hat I = \sqrt{2}\,\frac{P}{\sqrt{3}\,V_{LL}\,pf}\ \text{(3-ph)}` },
    { label: "Per-switch current", latex: String.raw`I_{rms} = \hat I/2,\quad I_{avg} = \hat I/\pi` },
    { label: "Transistor currents, SPWM", latex: String.raw`I_{T,avg} = \hat I\left(\frac{1}{2\pi} + \frac{m_a\cos\varphi}{8}\right),\quad I_{T,rms}^2 = \hat I^2\left(\frac18 + \frac{m_a\cos\varphi}{3\pi}\right)` },
    { label: "Diode currents, SPWM", latex: String.raw`I_{D,avg} = \hat I\left(\frac{1}{2\pi} - \frac{m_a\cos\varphi}{8}\right),\quad I_{D,rms}^2 = \hat I^2\left(\frac18 - \frac{m_a\cos\varphi}{3\pi}\right)` },
    { label: "Conduction loss", latex: String.raw`P_T = V_{CE0} I_{T,avg} + r_{CE} I_{T,rms}^2,\quad P_D = V_{F0} I_{D,avg} + r_D I_{D,rms}^2,\quad P_{MOSFET} = R_{DS(on)}\,\hat I^2/4` },
    { label: "Switching loss (edge times)", latex: String.raw`P_{sw} = \tfrac12 V_{dc}\,\frac{\hat I}{\pi}\,(t_r + t_f)\,f_{sw}` },
    { label: "Switching loss (energies)", latex: String.raw`P_{sw} = f_{sw}\,(E_{on} + E_{off})\,\frac{V_{dc}}{V_{test}}\,\frac{\hat I/\pi}{I_{test}}` },
    { label: "Junction temperature", latex: String.raw`T_j = T_a + R_{th(j\text{-}a)}\,(P_{cond} + P_{sw})` },
    { label: "Voltage margin", latex: String.raw`\left(1 - \frac{V_{block}}{0.8\,V_{rated}}\right)\cdot 100\,\%` },
  ],
  conventions: [
    "A switch position (transistor with its antiparallel diode) carries one half-sine of the load current per cycle; SPWM shares it between transistor (duty (1 + ma·sin θ)/2) and diode, weighted by ma and cos φ = pf.",
    "IGBT and diode: V0 + r·i on-state model. MOSFET: the channel conducts both directions (synchronous; dead time neglected).",
    "pCondBound (V_CE0·Î/π) charges the whole half-sine to the transistor: an upper bound, shown for comparison.",
    "Without vout, the largest linear sinusoidal-PWM output (ma = 1) is assumed.",
    "If both edge times and switching energies are given, the energies are used.",
    "Each switch has its own thermal path R_th(j-a) to the ambient; for a shared heatsink, enter the equivalent per switch.",
    "Diode reverse-recovery losses, dead time and gate-drive losses are not included.",
  ],
  sources: [
    "Mohan, Undeland & Robbins, Power Electronics: Converters, Applications, and Design, 3rd ed., ch. 8: SPWM output ma·Vdc (full bridge), ma·Vdc/2 (half bridge), 0.612·ma·Vdc line to line (three-phase) — published.",
    "Mohan, Undeland & Robbins, 3rd ed., ch. 2: switching loss ½·Vd·Io·fs·(t_c(on) + t_c(off)) with linearised edges (chapter from memory) — published.",
    "Mohan, Undeland & Robbins, 3rd ed., ch. 8: SPWM duty ratio of a leg, d = (1 + ma·sin θ)/2, averaged over the switching period — published; the transistor and diode average and RMS currents above follow from it by integration over the half cycle — derived.",
    "V0 + r·i on-state models of IGBT and diode, averaging the switching loss over the sine (× 1/π of the peak), linear scaling of E_on/E_off with voltage and current — common practice, no source.",
    "Blocking voltage at most 80 % of the device rating — common practice.",
  ],
  cautions: [
    LETHAL_VOLTAGE_CAUTION,
    "Blocking voltage excludes turn-off overshoot from stray inductance, which can be large: measure it on the built layout.",
    "Losses here are first estimates; confirm with the manufacturer's loss model or measurement, and keep the device within its safe operating area.",
  ],
  compute(inputs) {
    const topology = readChoice(inputs, topologyInput);
    const device = readChoice(inputs, deviceInput);
    const vdc = readQuantity(inputs, vdcInput);
    const p = readQuantity(inputs, pInput);
    const pf = readQuantity(inputs, pfInput);
    const voutGiven = optional(inputs, voutInput);
    const fsw = readQuantity(inputs, fswInput);
    const rdsOn = optional(inputs, rdsOnInput);
    const vceSat = optional(inputs, vceSatInput);
    const rCe = optional(inputs, rCeInput) ?? 0;
    const vF0 = optional(inputs, vF0Input);
    const rD = optional(inputs, rDInput) ?? 0;
    const tr = optional(inputs, trInput);
    const tf = optional(inputs, tfInput);
    const eon = optional(inputs, eonInput);
    const eoff = optional(inputs, eoffInput);
    const eTestV = optional(inputs, eTestVInput);
    const eTestI = optional(inputs, eTestIInput);
    const rthJa = readQuantity(inputs, rthJaInput);
    const ta = readQuantity(inputs, taInput);
    const vRated = readQuantity(inputs, vRatedInput);
    const tjMax = optional(inputs, tjMaxInput);
    const warnings: string[] = [];
    const problems: FieldError[] = [];

    if (device === "mosfet" && rdsOn === undefined) problems.push({ field: "rdsOn", message: "rdsOn is needed for a MOSFET, e.g. 25 mohm" });
    if (device === "igbt" && vceSat === undefined) problems.push({ field: "vceSat", message: "vceSat is needed for an IGBT, e.g. 1.7 V" });
    if (device === "mosfet" && vceSat !== undefined) warnings.push("vceSat is ignored for a MOSFET.");
    if (device === "igbt" && rdsOn !== undefined) warnings.push("rdsOn is ignored for an IGBT.");

    const energyParts = { eon, eoff, eTestV, eTestI };
    const energiesGiven = Object.values(energyParts).filter((v) => v !== undefined).length;
    const useEnergies = energiesGiven > 0;
    if (useEnergies && energiesGiven < 4) {
      for (const [key, value] of Object.entries(energyParts)) {
        if (value === undefined) problems.push({ field: key, message: `${key} is needed with the other switching energies (eon, eoff, eTestV, eTestI)` });
      }
    } else if (!useEnergies && (tr === undefined || tf === undefined)) {
      for (const [key, value] of Object.entries({ tr, tf })) {
        if (value === undefined) problems.push({ field: key, message: `give tr and tf (e.g. 50 ns), or eon, eoff, eTestV and eTestI` });
      }
    }
    if (useEnergies && (tr !== undefined || tf !== undefined)) warnings.push("Switching energies are given, so tr and tf are not used.");
    if (problems.length > 0) throw new CalculationError(problems);

    const maxLinear = maxLinearOutputRms(topology, vdc);
    const vout = voutGiven ?? maxLinear;
    if (voutGiven === undefined) {
      warnings.push(`vout not given: the largest linear-SPWM output, ${scalar(maxLinear, "V").display} (ma = 1), is assumed.`);
    } else if (voutGiven > maxLinear * (1 + 1e-9)) {
      warnings.push(`vout (${scalar(voutGiven, "V").display}) exceeds the linear-SPWM maximum of ${scalar(maxLinear, "V").display} for this bridge and DC link: overmodulation adds low-order harmonics.`);
    }

    const loadCurrentRms = topology === "three-phase" ? p / (Math.sqrt(3) * vout * pf) : p / (vout * pf);
    const iPeak = Math.SQRT2 * loadCurrentRms;
    const iRms = iPeak / 2;
    const iAvg = iPeak / Math.PI;
    const vBlock = vdc;

    // SPWM duty weighting (see the module comment); ma above 1 is overmodulation, where the linear duty no longer holds.
    const ma = Math.min(vout / maxLinear, 1);
    // A MOSFET's channel carries the current both ways: R_DS(on) over the transistor's and the diode's share.
    const pCond =
      device === "mosfet"
        ? conductionLoss(0, rdsOn!, iPeak, ma, pf, 1) + conductionLoss(0, rdsOn!, iPeak, ma, pf, -1)
        : conductionLoss(vceSat!, rCe, iPeak, ma, pf, 1);
    const pCondDiode = device === "igbt" && vF0 !== undefined ? conductionLoss(vF0, rD, iPeak, ma, pf, -1) : undefined;
    if (device === "igbt" && vF0 === undefined) warnings.push("vF0 not given: the antiparallel diode's conduction loss is not included in the totals.");
    if (device === "mosfet" && (rCe > 0 || vF0 !== undefined || rD > 0)) warnings.push("rCe, vF0 and rD are IGBT inputs and are ignored for a MOSFET.");
    const pSw = useEnergies
      ? fsw * (eon! + eoff!) * (vdc / eTestV!) * (iAvg / eTestI!)
      : 0.5 * vdc * iAvg * (tr! + tf!) * fsw;
    const pSwitch = pCond + (pCondDiode ?? 0) + pSw;
    const tj = ta + rthJa * pSwitch;
    const voltageMargin = (1 - vBlock / (VOLTAGE_DERATING * vRated)) * 100;

    if (useEnergies && (vdc > 1.5 * eTestV! || vdc < 0.5 * eTestV!)) {
      warnings.push(`The switching energies were measured at ${scalar(eTestV!, "V").display}, far from Vdc = ${scalar(vdc, "V").display}: linear scaling is rough there.`);
    }
    if (vBlock > vRated) {
      warnings.push(`The blocking voltage (${scalar(vBlock, "V").display}) exceeds the device rating (${scalar(vRated, "V").display}).`);
    } else if (voltageMargin < 0) {
      warnings.push(`The blocking voltage is ${scalar((vBlock / vRated) * 100, "%").display} of the rating, above the 80 % derating rule (common practice).`);
    }
    if (tjMax !== undefined && tj > tjMax) {
      warnings.push(`The junction temperature (${scalar(tj, "degC").display}) exceeds T_j(max) (${scalar(tjMax, "degC").display}).`);
    }

    warnings.push(
      `Conduction: SPWM duty-weighted, ${device === "mosfet" ? "R_DS(on) in both directions" : "V_CE0 + r_CE·i for the transistor" + (pCondDiode === undefined ? "" : ", V_F0 + r_D·i for the diode")}, at ma = ${ma.toFixed(3)} and cos φ = ${pf} (Mohan, Undeland & Robbins, Power Electronics, 3rd ed., ch. 8 averaging; integrals derived).`,
    );
    const results: Results = {
      vBlock: scalar(vBlock, "V"),
      iPeak: scalar(iPeak, "A"),
      iRms: scalar(iRms, "A"),
      pCond: scalar(pCond, "W"),
      ...(pCondDiode === undefined ? {} : { pCondDiode: scalar(pCondDiode, "W") }),
      ...(device === "igbt" ? { pCondBound: scalar(vceSat! * iAvg, "W") } : {}),
      ma: scalar(ma, ""),
      pSw: scalar(pSw, "W"),
      pLossTotal: scalar(SWITCH_COUNT[topology]! * pSwitch, "W"),
      tj: scalar(tj, "degC"),
      voltageMargin: scalar(voltageMargin, "%"),
    };
    return { results, warnings };
  },
};
