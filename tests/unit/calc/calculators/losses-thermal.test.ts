import { describe, expect, it } from "vitest";
import { calculator } from "~/lib/calc/calculators/losses-thermal";
import { expectClose } from "../../../support/tolerance";
import { triangle } from "../fft-reference";
import { expectAllFinite, run } from "./run-calculator";
import { refuse, run as evaluate, valueOf } from "./run-helpers";

// An invented 1200 V, 100 A IGBT module for the checks (the calculator's defaults), in SI units.
const IGBT = {
  topology: "three-phase",
  device: "igbt",
  vdc: 600,
  iPeak: 70,
  ma: 0.9,
  pf: 0.85,
  fsw: 8000,
  vce0: 0.9,
  rce: 0.009,
  rdsOn: 0.02,
  rdsOnHot: 0.032,
  tHot: 150,
  eon: 0.006,
  eoff: 0.005,
  err: 0.003,
  eTestV: 600,
  eTestI: 100,
  vf0: 1,
  rf: 0.006,
  rthJc: 0.25,
  rthJcDiode: 0.45,
  rthCs: 0.05,
  rthSa: 0.08,
  ta: 40,
  tjMax: 150,
};
type Inputs = typeof IGBT;
const compute = (overrides: Partial<Record<keyof Inputs, number | string>> = {}) => run(calculator, { ...IGBT, ...overrides });

/**
 * One leg simulated over an output cycle on a fine grid: the upper transistor's gate from the carrier comparison,
 * the current Î·sin(θ − φ), instantaneous drops while it conducts forward current, and the datasheet energy
 * (scaled to the current at that instant) at every switching event under forward current; the lower diode conducts
 * the forward current while the upper gate is off and recovers when the upper transistor turns on.
 */
function simulatedLeg(inputs: Inputs, mf: number, r: number, v0: number) {
  const points = 2 ** 20;
  const phi = Math.acos(inputs.pf);
  const f = inputs.fsw / mf;
  const scale = inputs.vdc / inputs.eTestV / inputs.eTestI;
  let conductionT = 0;
  let conductionD = 0;
  let switching = 0;
  let recovery = 0;
  const gate = (theta: number) => inputs.ma * Math.sin(theta) > triangle(mf * (theta - Math.PI / 2));
  let before = gate(0);
  for (let j = 0; j < points; j++) {
    const theta = (2 * Math.PI * (j + 0.5)) / points;
    const on = gate(theta);
    const i = inputs.iPeak * Math.sin(theta - phi);
    if (i > 0) {
      if (on) conductionT += v0 * i + r * i * i;
      else conductionD += inputs.vf0 * i + inputs.rf * i * i;
      if (on && !before) {
        switching += inputs.eon * i * scale;
        recovery += inputs.err * i * scale;
      }
      if (!on && before) switching += inputs.eoff * i * scale;
    }
    before = on;
  }
  return { conductionT: conductionT / points, conductionD: conductionD / points, switching: switching * f, recovery: recovery * f };
}

describe("losses against a simulated switched leg (2^20 points per cycle, mf 199)", () => {
  it.each([
    [0.85, 0.9],
    [0.3, 0.6],
    [1, 1],
    [-0.7, 0.8],
  ])("IGBT, cos φ %s, ma %s: conduction, switching and recovery within 0.5 % (Casanellas 1994, from memory)", (pf, ma) => {
    const mf = 199;
    const inputs = { ...IGBT, pf, ma };
    const reference = simulatedLeg(inputs, mf, inputs.rce, inputs.vce0);
    const { results } = compute({ pf, ma });
    expectClose(valueOf(results, "pCondSwitch"), reference.conductionT, { rel: 5e-3 }, "transistor conduction");
    expectClose(valueOf(results, "pCondDiode"), reference.conductionD, { rel: 5e-3 }, "diode conduction");
    expectClose(valueOf(results, "pSwSwitch"), reference.switching, { rel: 5e-3 }, "switching");
    expectClose(valueOf(results, "pRecDiode"), reference.recovery, { rel: 5e-3 }, "recovery");
  });
});

describe("junction temperature through the thermal chain", () => {
  it("IGBT: the chain adds up, six positions on one heatsink", () => {
    const { results } = compute();
    const position = valueOf(results, "pPosition");
    const heatsink = 40 + 6 * position * 0.08;
    expectClose(valueOf(results, "tHeatsink"), heatsink, { rel: 1e-12 });
    expectClose(valueOf(results, "tjSwitch"), heatsink + position * 0.05 + (valueOf(results, "pCondSwitch") + valueOf(results, "pSwSwitch")) * 0.25, { rel: 1e-12 });
    expectClose(valueOf(results, "tjMargin"), 150 - Math.max(valueOf(results, "tjSwitch"), valueOf(results, "tjDiode")), { rel: 1e-12 });
    expect(results.runaway).toBe(false);
    expectClose(valueOf(results, "pTotal"), 6 * position, { rel: 1e-12 });
    // Three phases of (ma·Vdc/2)·Î/2·cos φ.
    expectClose(valueOf(results, "pOut"), 3 * ((0.9 * 600) / 2) * 35 * 0.85, { rel: 1e-12 });
  });

  it("MOSFET: the iterated fixed point equals the closed form of the linear R_DS(on) model (derived)", () => {
    const overrides = { device: "mosfet", topology: "full-bridge", iPeak: 30, fsw: 40000, eon: 0.0002, eoff: 0.0001, err: 0.00005 } as const;
    const { results } = compute(overrides);
    const alpha = (0.032 / 0.02 - 1) / (150 - 25);
    // P_T(T) = c·R(T) + P_sw with c = Î²(1/8 + ma·cos φ/(3π)); T_j = a + b·P_T, solved for T_j.
    const c = 30 * 30 * (1 / 8 + (0.9 * 0.85) / (3 * Math.PI));
    const pSw = valueOf(results, "pSwSwitch");
    const pDiode = valueOf(results, "pCondDiode") + valueOf(results, "pRecDiode");
    const b = 4 * 0.08 + 0.05 + 0.25;
    const a = 40 + pDiode * (4 * 0.08 + 0.05);
    const tj = (a + b * (c * 0.02 * (1 - 25 * alpha) + pSw)) / (1 - b * c * 0.02 * alpha);
    expectClose(valueOf(results, "tjSwitch"), tj, { rel: 1e-9 });
    expectClose(valueOf(results, "pCondSwitch"), c * 0.02 * (1 + alpha * (tj - 25)), { rel: 1e-9 });
  });

  it("MOSFET on a heatsink too small for its current: says thermal runaway and gives no temperature", () => {
    const { results, warnings } = compute({ device: "mosfet", topology: "full-bridge", iPeak: 60, rthSa: 3, rdsOnHot: 0.06 });
    expect(results.runaway).toBe(true);
    expect(results.tjSwitch).toBeUndefined();
    expect(warnings.join(" ")).toMatch(/Thermal runaway/);
    expectAllFinite(results);
  });

  it("warns when the hottest junction is above its maximum", () => {
    const { warnings } = compute({ rthSa: 0.5 });
    expect(warnings.join(" ")).toMatch(/above the maximum/);
  });
});

describe("losses: inputs as typed and field errors", () => {
  it("reads inputs as typed on a sheet (every default carries its unit)", () => {
    const typed = Object.fromEntries(calculator.inputs.map((spec) => [spec.key, spec.default]));
    const { results } = evaluate("losses-thermal", typed);
    expect(valueOf(results, "efficiency")).toBeGreaterThan(90);
    expect(valueOf(results, "efficiency")).toBeLessThan(100);
  });

  it("refuses out-of-range inputs, naming the field", () => {
    const typed = Object.fromEntries(calculator.inputs.map((spec) => [spec.key, spec.default]));
    expect(refuse("losses-thermal", { ...typed, ma: "1.3" })[0]!.field).toBe("ma");
    expect(refuse("losses-thermal", { ...typed, pf: "1.2" })[0]!.field).toBe("pf");
    expect(refuse("losses-thermal", { ...typed, device: "thyristor" })[0]!.field).toBe("device");
    expect(refuse("losses-thermal", { ...typed, eTestI: "0 A" })[0]!.field).toBe("eTestI");
  });
});
