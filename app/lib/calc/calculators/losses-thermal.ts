/**
 * Losses and junction temperatures of a sine-PWM bridge: transistor and diode
 * conduction, switching and reverse recovery, through a thermal chain to the air,
 * and the efficiency.
 *
 * Model (per switch position: one transistor and its antiparallel diode; output
 * current i = Î·sin(θ − φ), reference duty d = (1 + ma·sin θ)/2 of the leg):
 * - Transistor conduction, averaging the on-state drop v = V0 + r·i over the duty
 *   while it carries current (Casanellas, Losses in PWM inverters using IGBTs, IEE
 *   Proc. Electric Power Applications, 1994 — published, equations from memory):
 *     P_cT = V0·Î·(1/(2π) + ma·cos φ/8) + r·Î²·(1/8 + ma·cos φ/(3π))
 *   Diode: the same with −ma·cos φ.  A MOSFET is V0 = 0, r = R_DS(on)(T_j), with
 *   the diode carrying the reverse current (no synchronous rectification).
 * - R_DS(on)(T_j) is linear through the two datasheet points (25 °C and a hot
 *   value) — common practice.
 * - Switching: datasheet energies scaled linearly to the link voltage and to the
 *   current switched, averaged over the half cycle the device switches in:
 *     P_sw = fsw·(E_on + E_off)·(Vdc/V_test)·(Î/π)/I_test,  P_rr = fsw·E_rr·(…) the same
 *   (linear scaling is common practice; real energies grow a little faster with voltage).
 * - Thermal chain: all switch positions share one heatsink,
 *     T_s = T_a + N·(P_T + P_D)·R_th,sa,  T_c = T_s + (P_T + P_D)·R_th,cs,
 *     T_jT = T_c + P_T·R_th,jc(T),  T_jD = T_c + P_D·R_th,jc(D)
 *   solved to a fixed point in T_jT (a MOSFET's loss rises with T_j). When the loss
 *   rises faster than the chain can shed it there is no fixed point: thermal
 *   runaway, reported as such with no temperatures.
 * - Output power: three-phase 3·(ma·Vdc/2)·Î/2·cos φ; full bridge ma·Vdc·Î/2·cos φ;
 *   half bridge (ma·Vdc/2)·Î/2·cos φ.
 *
 * Checked in the tests against a time-domain simulation of the switched leg (carrier
 * comparison, instantaneous drops and energies per switching event) and against
 * the closed-form fixed point of the linear temperature model.
 */
import { scalar } from "../format";
import type { Calculator, ChoiceInputSpec, QuantityInputSpec, Results } from "../types";
import { LETHAL_VOLTAGE_CAUTION, dcLinkVoltageInput, readChoice, readQuantity, quantityInput } from "./shared-inputs";
import { conductionLoss, SWITCH_COUNT } from "./switch-stress";


const topologyInput: ChoiceInputSpec = {
  key: "topology",
  label: "Bridge",
  description: "Sets the number of switch positions on the heatsink (2, 4 or 6) and the output power.",
  kind: "choice",
  options: [
    { value: "half-bridge", label: "Half bridge (2 positions)" },
    { value: "full-bridge", label: "Full bridge (4 positions)" },
    { value: "three-phase", label: "Three-phase bridge (6 positions)" },
  ],
  default: "three-phase",
};

const deviceInput: ChoiceInputSpec = {
  key: "device",
  label: "Transistor",
  description: "IGBT: threshold voltage plus slope resistance. MOSFET: R_DS(on) rising with junction temperature.",
  kind: "choice",
  options: [
    { value: "igbt", label: "IGBT (V_CE0 + r_CE·i)" },
    { value: "mosfet", label: "MOSFET (R_DS(on) at T_j)" },
  ],
  default: "igbt",
};

const vdcInput = dcLinkVoltageInput("600 V", "DC-link voltage; each device blocks it and switching energies scale with it.");
const iPeakInput = quantityInput({ key: "iPeak", label: "Output current peak Î", description: "Peak of the sinusoidal output (phase) current.", dimension: "current", displayUnit: "A", min: 0, minExclusive: true, max: 1e5, default: "70 A" });
const maInput = quantityInput({ key: "ma", label: "Modulation index ma", description: "Peak of the leg's sine reference over the carrier peak (linear range).", dimension: "dimensionless", displayUnit: "", min: 0, max: 1.155, default: "0.9" });
const pfInput = quantityInput({ key: "pf", label: "Displacement power factor cos φ", description: "Cosine of the angle by which the current lags the voltage; negative when power flows back into the link.", dimension: "dimensionless", displayUnit: "", min: -1, max: 1, default: "0.85" });
const fswInput = quantityInput({ key: "fsw", label: "Switching frequency", description: "PWM carrier frequency.", dimension: "frequency", displayUnit: "kHz", min: 0, max: 1e7, default: "8 kHz" });
const vce0Input = quantityInput({ key: "vce0", label: "IGBT threshold V_CE0", description: "Intercept of the datasheet's on-state line at the temperature of interest (IGBT only).", dimension: "voltage", displayUnit: "V", min: 0, max: 10, default: "0.9 V" });
const rceInput = quantityInput({ key: "rce", label: "IGBT slope resistance r_CE", description: "Slope of the on-state line (IGBT only).", dimension: "resistance", displayUnit: "mohm", min: 0, max: 10, default: "9 mohm" });
const rdsOnInput = quantityInput({ key: "rdsOn", label: "R_DS(on) at 25 °C", description: "MOSFET on-resistance at 25 °C junction (MOSFET only).", dimension: "resistance", displayUnit: "mohm", min: 0, minExclusive: true, max: 10, default: "20 mohm" });
const rdsOnHotInput = quantityInput({ key: "rdsOnHot", label: "R_DS(on) hot", description: "MOSFET on-resistance at the hot datasheet temperature (MOSFET only).", dimension: "resistance", displayUnit: "mohm", min: 0, minExclusive: true, max: 10, default: "32 mohm" });
const tHotInput = quantityInput({ key: "tHot", label: "Hot datasheet temperature", description: "Junction temperature of the hot R_DS(on) value.", dimension: "temperature", displayUnit: "degC", min: 26, max: 400, default: "150 degC" });
const eonInput = quantityInput({ key: "eon", label: "Turn-on energy E_on", description: "Datasheet turn-on energy at the test voltage and current.", dimension: "energy", displayUnit: "mJ", min: 0, max: 10, default: "6 mJ" });
const eoffInput = quantityInput({ key: "eoff", label: "Turn-off energy E_off", description: "Datasheet turn-off energy at the test voltage and current.", dimension: "energy", displayUnit: "mJ", min: 0, max: 10, default: "5 mJ" });
const errInput = quantityInput({ key: "err", label: "Diode recovery energy E_rr", description: "Datasheet reverse-recovery energy at the test voltage and current.", dimension: "energy", displayUnit: "mJ", min: 0, max: 10, default: "3 mJ" });
const eTestVInput = quantityInput({ key: "eTestV", label: "Energy test voltage", description: "DC voltage at which the datasheet energies are given.", dimension: "voltage", displayUnit: "V", min: 0, minExclusive: true, max: 1e5, default: "600 V" });
const eTestIInput = quantityInput({ key: "eTestI", label: "Energy test current", description: "Current at which the datasheet energies are given.", dimension: "current", displayUnit: "A", min: 0, minExclusive: true, max: 1e5, default: "100 A" });
const vf0Input = quantityInput({ key: "vf0", label: "Diode threshold V_F0", description: "Intercept of the diode's forward line.", dimension: "voltage", displayUnit: "V", min: 0, max: 10, default: "1 V" });
const rfInput = quantityInput({ key: "rf", label: "Diode slope resistance r_F", description: "Slope of the diode's forward line.", dimension: "resistance", displayUnit: "mohm", min: 0, max: 10, default: "6 mohm" });
const rthJcInput = quantityInput({ key: "rthJc", label: "R_th junction–case, transistor", description: "Per transistor.", dimension: "thermalResistance", displayUnit: "K/W", min: 0, max: 100, default: "0.25 K/W" });
const rthJcDiodeInput = quantityInput({ key: "rthJcDiode", label: "R_th junction–case, diode", description: "Per diode.", dimension: "thermalResistance", displayUnit: "K/W", min: 0, max: 100, default: "0.45 K/W" });
const rthCsInput = quantityInput({ key: "rthCs", label: "R_th case–heatsink", description: "Per switch position (transistor and diode together), including the interface material.", dimension: "thermalResistance", displayUnit: "K/W", min: 0, max: 100, default: "0.05 K/W" });
const rthSaInput = quantityInput({ key: "rthSa", label: "R_th heatsink–ambient", description: "Of the one heatsink carrying every switch position.", dimension: "thermalResistance", displayUnit: "K/W", min: 0, max: 100, default: "0.08 K/W" });
const taInput = quantityInput({ key: "ta", label: "Ambient temperature", description: "Air at the heatsink inlet.", dimension: "temperature", displayUnit: "degC", min: -60, max: 200, default: "40 degC" });
const tjMaxInput = quantityInput({ key: "tjMax", label: "Maximum junction temperature", description: "Datasheet T_j(max) (or the design limit below it).", dimension: "temperature", displayUnit: "degC", min: 0, max: 400, default: "150 degC" });


/** An iterate above this has left every physical range: the iteration is running away. */
const RUNAWAY_ABOVE = 1e6;

export const calculator: Calculator = {
  id: "losses-thermal",
  title: "Losses and junction temperature",
  summary: "Conduction, switching and recovery losses of a sine-PWM bridge, junction temperatures through the thermal chain, and efficiency.",
  description:
    "For a half, full or three-phase bridge with sine-triangle PWM, gives each transistor's and diode's conduction and " +
    "switching losses from datasheet figures (IGBT threshold and slope, or MOSFET R_DS(on) rising with temperature; " +
    "switching and recovery energies scaled to the link voltage and current), the heatsink, case and junction " +
    "temperatures through the thermal resistances, solved to a fixed point, and the efficiency. Says plainly when no " +
    "fixed point exists (thermal runaway).",
  inputs: [
    topologyInput, deviceInput, vdcInput, iPeakInput, maInput, pfInput, fswInput, vce0Input, rceInput, rdsOnInput, rdsOnHotInput, tHotInput,
    eonInput, eoffInput, errInput, eTestVInput, eTestIInput, vf0Input, rfInput, rthJcInput, rthJcDiodeInput, rthCsInput, rthSaInput, taInput, tjMaxInput,
  ],
  outputs: [
    { key: "pCondSwitch", label: "Transistor conduction loss", kind: "scalar", unit: "W" },
    { key: "pSwSwitch", label: "Transistor switching loss", kind: "scalar", unit: "W" },
    { key: "pCondDiode", label: "Diode conduction loss", kind: "scalar", unit: "W" },
    { key: "pRecDiode", label: "Diode recovery loss", kind: "scalar", unit: "W" },
    { key: "pPosition", label: "Loss per switch position", kind: "scalar", unit: "W" },
    { key: "pTotal", label: "Bridge loss", kind: "scalar", unit: "W" },
    { key: "pOut", label: "Output power", kind: "scalar", unit: "W" },
    { key: "efficiency", label: "Efficiency (bridge only)", kind: "scalar", unit: "%" },
    { key: "tHeatsink", label: "Heatsink temperature", kind: "scalar", unit: "degC" },
    { key: "tjSwitch", label: "Transistor junction temperature", kind: "scalar", unit: "degC" },
    { key: "tjDiode", label: "Diode junction temperature", kind: "scalar", unit: "degC" },
    { key: "tjMargin", label: "Margin to the maximum junction temperature", kind: "scalar", unit: "K" },
    { key: "runaway", label: "Thermal runaway", kind: "boolean", description: "True when the losses rise with temperature faster than the chain sheds them: no steady state." },
  ],
  formulas: [
    { label: "Transistor conduction", latex: String.raw`P_{cT} = V_0\hat I\left(\frac{1}{2\pi} + \frac{m_a\cos\varphi}{8}\right) + r\hat I^2\left(\frac18 + \frac{m_a\cos\varphi}{3\pi}\right)` },
    { label: "Diode conduction", latex: String.raw`P_{cD} = V_{F0}\hat I\left(\frac{1}{2\pi} - \frac{m_a\cos\varphi}{8}\right) + r_F\hat I^2\left(\frac18 - \frac{m_a\cos\varphi}{3\pi}\right)` },
    { label: "Switching and recovery", latex: String.raw`P_{sw} = f_{sw}(E_{on}+E_{off})\frac{V_{dc}}{V_{test}}\frac{\hat I/\pi}{I_{test}},\qquad P_{rr} = f_{sw}E_{rr}\frac{V_{dc}}{V_{test}}\frac{\hat I/\pi}{I_{test}}` },
    { label: "MOSFET on-resistance", latex: String.raw`R_{DS(on)}(T_j) = R_{25}\left(1 + \alpha\,(T_j - 25\,^\circ\mathrm{C})\right),\quad \alpha = \frac{R_{hot}/R_{25} - 1}{T_{hot} - 25\,^\circ\mathrm{C}}` },
    { label: "Thermal chain", latex: String.raw`T_{jT} = T_a + N(P_T + P_D)R_{sa} + (P_T + P_D)R_{cs} + P_T R_{jc,T}` },
  ],
  conventions: [
    "Losses are per device and averaged over the output cycle; the output current is sinusoidal with peak Î and lags the leg voltage by φ.",
    "cos φ = 1: motoring, the transistors carry most of the current; cos φ < 0: power flows back, the diodes carry most of it.",
    "MOSFETs carry only forward current here; their body diodes (or the diode inputs) carry the reverse current (no synchronous rectification).",
    "Every switch position sits on one heatsink with R_th,sa; R_th,cs is per position; temperatures are cycle averages (the junction ripples around them at the output frequency).",
    "IGBT and diode figures are taken at the temperature of interest and do not change with it; a MOSFET's R_DS(on) does.",
  ],
  sources: [
    "Casanellas, Losses in PWM inverters using IGBTs, IEE Proceedings — Electric Power Applications, 1994: conduction losses with sine-PWM duty weighting — published; equations from memory, unverified.",
    "Linear scaling of switching and recovery energies with voltage and current; linear R_DS(on) temperature model — common practice.",
    "Thermal resistance chain and steady-state fixed point — derived.",
  ],
  cautions: [
    LETHAL_VOLTAGE_CAUTION,
    "Datasheet energies depend on gate resistance, stray inductance and temperature: measure them in the real layout (double-pulse test) before trusting a margin of a few kelvin.",
  ],
  compute(inputs) {
    const read = (spec: QuantityInputSpec) => readQuantity(inputs, spec);
    const topology = readChoice(inputs, topologyInput);
    const device = readChoice(inputs, deviceInput);
    const [vdc, iPeak, ma, pf, fsw] = [vdcInput, iPeakInput, maInput, pfInput, fswInput].map(read) as [number, number, number, number, number];
    const [eon, eoff, err, eTestV, eTestI] = [eonInput, eoffInput, errInput, eTestVInput, eTestIInput].map(read) as [number, number, number, number, number];
    const [vf0, rf, rthJc, rthJcDiode, rthCs, rthSa, ta, tjMax] = [vf0Input, rfInput, rthJcInput, rthJcDiodeInput, rthCsInput, rthSaInput, taInput, tjMaxInput].map(read) as
      [number, number, number, number, number, number, number, number];
    const positions = SWITCH_COUNT[topology]!;
    const warnings: string[] = [];

    // Conduction loss of the transistor as a function of its junction temperature.
    let switchConduction: (tj: number) => number;
    if (device === "igbt") {
      const loss = conductionLoss(read(vce0Input), read(rceInput), iPeak, ma, pf, 1);
      switchConduction = () => loss;
    } else {
      const r25 = read(rdsOnInput);
      const rHot = read(rdsOnHotInput);
      const tHot = read(tHotInput);
      const alpha = (rHot / r25 - 1) / (tHot - 25);
      if (alpha < 0) warnings.push("R_DS(on) hot is below its 25 °C value: check the datasheet figures (on-resistance normally rises with temperature).");
      switchConduction = (tj) => conductionLoss(0, Math.max(0, r25 * (1 + alpha * (tj - 25))), iPeak, ma, pf, 1);
    }
    const switchedCurrent = iPeak / Math.PI / eTestI;
    const pSw = fsw * (eon + eoff) * (vdc / eTestV) * switchedCurrent;
    const pRec = fsw * err * (vdc / eTestV) * switchedCurrent;
    const pCondDiode = conductionLoss(vf0, rf, iPeak, ma, pf, -1);
    const pDiode = pCondDiode + pRec;

    const temperatures = (pSwitch: number) => {
      const position = pSwitch + pDiode;
      const heatsink = ta + positions * position * rthSa;
      const caseT = heatsink + position * rthCs;
      return { heatsink, switchJ: caseT + pSwitch * rthJc, diodeJ: caseT + pDiode * rthJcDiode };
    };

    // Fixed point T = g(T), started at the ambient; g is increasing, so the iteration climbs monotonically to the
    // fixed point when there is one, and past any bound when there is none.
    let tj = ta;
    let converged = false;
    for (let iteration = 0; iteration < 500; iteration++) {
      const next = temperatures(switchConduction(tj) + pSw).switchJ;
      if (!Number.isFinite(next) || next > RUNAWAY_ABOVE) break;
      if (Math.abs(next - tj) < 1e-9 * Math.max(1, Math.abs(next))) {
        tj = next;
        converged = true;
        break;
      }
      tj = next;
    }

    const pCondSwitch = switchConduction(converged ? tj : ta);
    const pSwitch = pCondSwitch + pSw;
    const pPosition = pSwitch + pDiode;
    const pTotal = positions * pPosition;
    const legPhaseVoltage = (ma * vdc) / 2;
    const phases = topology === "three-phase" ? 3 : 1;
    const bridgeVoltage = topology === "full-bridge" ? ma * vdc : legPhaseVoltage;
    const pOut = phases * bridgeVoltage * (iPeak / 2) * pf;

    const results: Results = {
      pCondSwitch: scalar(pCondSwitch, "W"),
      pSwSwitch: scalar(pSw, "W"),
      pCondDiode: scalar(pCondDiode, "W"),
      pRecDiode: scalar(pRec, "W"),
      pPosition: scalar(pPosition, "W"),
      pTotal: scalar(pTotal, "W"),
      pOut: scalar(pOut, "W"),
      runaway: !converged,
    };
    if (pOut > 0) results.efficiency = scalar((100 * pOut) / (pOut + pTotal), "%");
    else warnings.push("Power flows from the output into the link (cos φ ≤ 0): efficiency is not given.");

    if (!converged) {
      warnings.push(
        "Thermal runaway: the transistor's loss rises with its temperature faster than the heatsink chain can shed it, so there is no steady state. " +
          "Losses are shown at the ambient temperature; lower the current or the thermal resistances, or choose a device with a lower R_DS(on).",
      );
      return { results, warnings };
    }
    const settled = temperatures(pSwitch);
    results.tHeatsink = scalar(settled.heatsink, "degC");
    results.tjSwitch = scalar(settled.switchJ, "degC");
    results.tjDiode = scalar(settled.diodeJ, "degC");
    const hottest = Math.max(settled.switchJ, settled.diodeJ);
    results.tjMargin = scalar(tjMax - hottest, "K");
    if (hottest > tjMax) warnings.push(`The hottest junction, ${hottest.toFixed(0)} °C, is above the maximum of ${tjMax.toFixed(0)} °C.`);
    if (device === "mosfet" && hottest > read(tHotInput)) {
      warnings.push("The junction is hotter than the hot R_DS(on) point: the on-resistance is extrapolated.");
    }
    return { results, warnings };
  },
};
