/**
 * Engine benchmark: a realistic 20-block calc sheet (every calculator, with "="
 * references between blocks) evaluated many times. Prints median and p95 in ms,
 * plus single-calculator figures. Target: median ≤ 2 ms for the sheet.
 *
 * Run: npx tsx tests/bench/engine.bench.ts
 *
 * The waveform spectrum figures (SPWM to h = 500, FFT of 2^16 points) live in their
 * own script, tests/bench/spectrum.bench.ts, kept by the waveform calculators' author.
 */
import { evaluateCalculator, evaluateSheet, type SheetBlock } from "../../app/lib/calc/evaluate-sheet";

// Invented demo design: a 48 V → 230 V, 1 kW inverter worked through on one sheet.
const sheet: SheetBlock[] = [
  { id: "link", calculator: "formula", inputs: { expr: "48 V" } },
  { id: "qs", calculator: "quasi-square", inputs: { vdc: "=link.value", alpha: "30 deg", f: "50 Hz", hmax: "49" } },
  { id: "stair", calculator: "stepped-wave", inputs: { vdc: "=link.value", angles: "9.59 deg, 30 deg, 56.44 deg" } },
  { id: "sixstep", calculator: "six-step", inputs: { vdc: "400 V" } },
  { id: "pwm", calculator: "spwm", inputs: { vdc: "400 V", ma: "0.8", mf: "41", scheme: "unipolar", bridge: "full", hmax: "200" } },
  { id: "pwmHalf", calculator: "spwm", inputs: { vdc: "400 V", ma: "0.9", mf: "21", scheme: "bipolar", bridge: "half" } },
  { id: "hb", calculator: "half-bridge", inputs: { vdc: "=link.value", mode: "centre-tapped", targetVrms: "230 V" } },
  { id: "hbOut", calculator: "half-bridge", inputs: { vdc: "=link.value", mode: "centre-tapped", turnsRatio: "=hb.turnsRatioForTarget" } },
  { id: "filter", calculator: "lc-filter", inputs: { l: "2.2 mH", c: "4.7 uF", rLoad: "52.9 ohm", fsw: "20 kHz", vout: "=hbOut.v1Rms" } },
  { id: "filterIdle", calculator: "lc-filter", inputs: { l: "2.2 mH", c: "4.7 uF", fsw: "20 kHz" } },
  { id: "dc", calculator: "dc-link", inputs: { p: "1 kW", vdc: "=link.value", rippleVpp: "=link.value * 0.05" } },
  { id: "dcHv", calculator: "dc-link", inputs: { p: "3 kW", vdc: "400 V", rippleVpp: "8 V" } },
  { id: "fet", calculator: "switch-stress", inputs: { topology: "full-bridge", device: "mosfet", vdc: "400 V", p: "3 kW", vout: "230 V", fsw: "20 kHz", rdsOn: "45 mohm", tr: "25 ns", tf: "30 ns", rthJa: "1.8 K/W", vRated: "650 V" } },
  { id: "igbt", calculator: "switch-stress", inputs: { topology: "three-phase", device: "igbt", vdc: "700 V", p: "10 kW", pf: "0.9", fsw: "10 kHz", vceSat: "1.7 V", eon: "1.1 mJ", eoff: "0.9 mJ", eTestV: "600 V", eTestI: "40 A", rthJa: "0.9 K/W", vRated: "1200 V", tjMax: "150 degC" } },
  { id: "limitsQs", calculator: "harmonic-limits", inputs: { standard: "ieee519-voltage", busVoltage: "230 V", spectrum: "=qs.harmonics" } },
  { id: "limitsPwm", calculator: "harmonic-limits", inputs: { standard: "ieee519-voltage", busVoltage: "400 V", spectrum: "=pwm.harmonics" } },
  { id: "limitsIec", calculator: "harmonic-limits", inputs: { standard: "iec61000-3-2-a", spectrum: [{ n: 1, value: "4.3 A" }, { n: 3, value: "1.2 A" }, { n: 5, value: "0.6 A" }, { n: 7, value: "0.3 A" }] } },
  { id: "distortion", calculator: "formula", inputs: { expr: "sqrt(qs.vrms^2 - qs.v1Rms^2)" } },
  { id: "capUf", calculator: "formula", inputs: { expr: "dc.c to uF" } },
  { id: "loss", calculator: "formula", inputs: { expr: "fet.pLossTotal / 3 kW * 100" } },
];

// The calculators of the three-phase and multilevel work, timed one by one (they are not on the 20-block sheet above).
const singleBlocks: SheetBlock[] = [
  { id: "pwm3", calculator: "three-phase-pwm", inputs: { vdc: "540 V", ma: "1.1", mf: "51", reference: "svpwm", sampling: "regular-asymmetric", f: "400 Hz", hmax: "200" } },
  { id: "she", calculator: "harmonic-elimination", inputs: { vdc: "48 V", wave: "stepped", m: "0.8", eliminate: "5, 7, 11", f: "50 Hz" } },
  { id: "ripple", calculator: "inductor-ripple", inputs: { vdc: "400 V", l: "1.5 mH", fsw: "20 kHz", ma: "0.8", scheme: "unipolar", bridge: "full", f: "50 Hz", rLoad: "10 ohm" } },
  { id: "losses", calculator: "losses-thermal", inputs: { topology: "three-phase", device: "mosfet", vdc: "540 V", iPeak: "68 A", ma: "1.1", pf: "0.8", fsw: "20.4 kHz", rdsOn: "16 mohm", rdsOnHot: "28 mohm", tHot: "175 degC", eon: "1.2 mJ", eoff: "0.6 mJ", err: "0.1 mJ", eTestV: "600 V", eTestI: "100 A", vf0: "2.6 V", rf: "12 mohm", rthJc: "0.15 K/W", rthJcDiode: "0.3 K/W", rthCs: "0.05 K/W", rthSa: "0.05 K/W", ta: "45 degC", tjMax: "175 degC" } },
  { id: "lcl", calculator: "lcl-filter", inputs: { l1: "1.8 mH", l2: "0.6 mH", c: "10 uF", rd: "2.2 ohm", fsw: "10 kHz", f: "50 Hz", vGrid: "230 V", phases: "3", pRated: "15 kW", iRipple: "1.9 A", fControl: "20 kHz" } },
  { id: "dead", calculator: "dead-time", inputs: { vdc: "400 V", ma: "0.813", fsw: "20 kHz", td: "1 us", phi: "30 deg", vT: "1.6 V", vD: "1.3 V", f: "50 Hz", tMinOn: "0.5 us", hmax: "25" } },
  { id: "sheNone", calculator: "harmonic-elimination", inputs: { vdc: "48 V", wave: "stepped", m: "0.95", eliminate: "5, 7, 11, 13, 17", f: "50 Hz" } },
];

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))]!;
}

function measure(label: string, runs: number, task: () => unknown): { median: number; p95: number } {
  for (let i = 0; i < Math.min(200, runs); i++) task(); // warm up the JIT
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const start = performance.now();
    task();
    times.push(performance.now() - start);
  }
  times.sort((a, b) => a - b);
  const median = percentile(times, 50);
  const p95 = percentile(times, 95);
  console.log(`${label.padEnd(42)} median ${median.toFixed(3).padStart(8)} ms   p95 ${p95.toFixed(3).padStart(8)} ms   (${runs} runs)`);
  return { median, p95 };
}

const check = evaluateSheet(sheet);
const failed = Object.entries(check.blocks).filter(([, block]) => !block.ok);
if (failed.length > 0) {
  console.log("Blocks that did not compute (the figures below still include them):");
  for (const [id, block] of failed) console.log(`  ${id}: ${JSON.stringify(!block.ok && block.errors)}`);
}

console.log(`Engine benchmark — ${sheet.length}-block sheet, ${new Set(sheet.map((b) => b.calculator)).size} calculators`);
const { median } = measure("evaluateSheet (20 blocks)", 2000, () => evaluateSheet(sheet));
console.log(`  target ≤ 2 ms median: ${median <= 2 ? "met" : "NOT met"}`);

console.log("\nSingle blocks (evaluateCalculator; target ≤ 2 ms median each):");
for (const block of [...sheet, ...singleBlocks]) {
  const references = JSON.stringify(block.inputs).includes('"=');
  if (references || block.calculator === "formula") continue;
  measure(`  ${block.id} (${block.calculator})`, 1000, () => evaluateCalculator(block.calculator, block.inputs));
}
