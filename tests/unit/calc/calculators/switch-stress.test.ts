import { describe, expect, it } from "vitest";
import { expectClose } from "../../../support/tolerance";
import { refuse, run, valueOf } from "./run-helpers";

/** Mean of g over one period of a half-sine-per-cycle current, by the midpoint rule. */
function cycleMean(g: (current: number) => number, peak: number, points = 100_000): number {
  let sum = 0;
  for (let j = 0; j < points; j++) {
    const theta = (2 * Math.PI * (j + 0.5)) / points;
    sum += g(theta < Math.PI ? peak * Math.sin(theta) : 0);
  }
  return sum / points;
}

const mosfet = {
  topology: "full-bridge",
  device: "mosfet",
  vdc: "400 V",
  p: "3 kW",
  pf: "1",
  vout: "230 V",
  fsw: "20 kHz",
  rdsOn: "50 mohm",
  tr: "30 ns",
  tf: "40 ns",
  rthJa: "2 K/W",
  ta: "40 degC",
  vRated: "650 V",
};

describe("switch-stress: currents", () => {
  const { results } = run("switch-stress", mosfet);
  // Load current from P = V·I·pf (definition of real power), peak √2·I — derived.
  const peak = Math.SQRT2 * (3000 / 230);

  it("takes the load peak from P, pf and Vout", () => {
    expectClose(valueOf(results, "iPeak"), peak, { rel: 1e-12 });
  });

  it("gives the RMS of one half-sine per cycle, Î/2 (derived by numerical integration; the half-sine-per-switch model is common practice, no source)", () => {
    expectClose(valueOf(results, "iRms"), Math.sqrt(cycleMean((i) => i * i, peak)), { rel: 1e-6 });
  });

  // Derived: an off switch of a bridge leg sits across the link.
  it("blocks the DC-link voltage", () => {
    expectClose(valueOf(results, "vBlock"), 400, { rel: 1e-12 });
  });

  // Derived: the definition of balanced three-phase real power.
  it("uses P = √3·V_LL·I·pf for three phases", () => {
    const three = run("switch-stress", { ...mosfet, topology: "three-phase", vout: "400 V", vdc: "700 V", vRated: "1200 V" }).results;
    expectClose(valueOf(three, "iPeak"), Math.SQRT2 * (3000 / (Math.sqrt(3) * 400)), { rel: 1e-12 });
  });

  it("assumes the largest linear-SPWM output without vout: V_LL1 = 0.612·Vdc (Mohan, Undeland & Robbins, 3rd ed., §8-3 — published)", () => {
    const { results: assumed, warnings } = run("switch-stress", { ...mosfet, topology: "three-phase", vout: undefined, vdc: "700 V", vRated: "1200 V" });
    expectClose(valueOf(assumed, "iPeak"), Math.SQRT2 * (3000 / (Math.sqrt(3) * 0.612 * 700)), { rel: 1e-3 });
    expect(warnings.join(" ")).toMatch(/vout not given: the largest linear-SPWM output, 429 V/);
  });

  // Derived: a full bridge's linear-SPWM fundamental peaks at Vdc (ma = 1; Mohan, Undeland & Robbins, 3rd ed., §8-3 —
  // published), so its RMS is at most Vdc/√2 = 212 V from 300 V.
  it("warns when vout needs overmodulation (full bridge: above Vdc/√2)", () => {
    expect(run("switch-stress", { ...mosfet, vdc: "300 V" }).warnings.join(" ")).toMatch(/exceeds the linear-SPWM maximum of 212 V/);
  });
});

describe("switch-stress: losses and temperature", () => {
  const { results } = run("switch-stress", mosfet);
  const peak = Math.SQRT2 * (3000 / 230);

  // Derived: a MOSFET conducts as a resistance, so its loss is the mean of i²·R_DS(on) over the cycle.
  it("conduction loss of a MOSFET is I_rms²·R_DS(on) (derived)", () => {
    expectClose(valueOf(results, "pCond"), cycleMean((i) => i * i * 0.05, peak), { rel: 1e-6 });
  });

  it("switching loss is Mohan's ½·V·I·(t_r + t_f)·f_sw averaged over the sine", () => {
    // Mohan, Undeland & Robbins, 3rd ed., ch. 2 (chapter from memory) — published; the average over the sine is common practice.
    const expected = cycleMean((i) => 0.5 * 400 * i * (30e-9 + 40e-9) * 20e3, peak);
    expectClose(valueOf(results, "pSw"), expected, { rel: 1e-6 });
  });

  // Derived: the definition of a steady-state junction-to-ambient thermal resistance, T_j − T_a = R_th(j-a)·P.
  it("junction temperature is T_a + R_th·(P_cond + P_sw) (derived)", () => {
    expectClose(valueOf(results, "tj"), 40 + 2 * (valueOf(results, "pCond") + valueOf(results, "pSw")), { rel: 1e-12 });
  });

  // Derived: a full bridge has four switches, each carrying one half-sine per cycle.
  it("totals the loss over the bridge's four switches (derived)", () => {
    expectClose(valueOf(results, "pLossTotal"), 4 * (valueOf(results, "pCond") + valueOf(results, "pSw")), { rel: 1e-12 });
  });

  it("IGBT conduction is V_CE(sat) times the mean current Î/π (constant-drop model: common practice, no source)", () => {
    const igbt = run("switch-stress", { ...mosfet, device: "igbt", rdsOn: undefined, vceSat: "1.7 V" }).results;
    expectClose(valueOf(igbt, "pCondBound"), cycleMean((i) => 1.7 * i, peak), { rel: 1e-6 });
  });

  it("scales datasheet switching energies linearly with voltage and current (common practice, no source)", () => {
    const energies = { ...mosfet, tr: undefined, tf: undefined, eon: "100 uJ", eoff: "60 uJ", eTestV: "400 V", eTestI: "20 A" };
    const base = valueOf(run("switch-stress", energies).results, "pSw");
    expectClose(base, cycleMean((i) => 20e3 * 160e-6 * (i / 20), peak), { rel: 1e-6 });
    const higherLink = valueOf(run("switch-stress", { ...energies, vdc: "500 V", vRated: "900 V" }).results, "pSw");
    expectClose(higherLink / base, 500 / 400, { rel: 1e-12 });
  });
});

describe("switch-stress: voltage margin (80 % derating: common practice, no source)", () => {
  it("is the headroom below 80 % of the rating", () => {
    const { results } = run("switch-stress", mosfet);
    expectClose(valueOf(results, "voltageMargin"), (1 - 400 / (0.8 * 650)) * 100, { rel: 1e-12 });
  });

  it("turns negative, with a warning, above 80 % of the rating", () => {
    const { results, warnings } = run("switch-stress", { ...mosfet, vdc: "600 V" });
    expect(valueOf(results, "voltageMargin")).toBeLessThan(0);
    expect(warnings.join(" ")).toMatch(/above the 80 % derating rule/);
  });

  it("warns beyond T_j(max)", () => {
    expect(run("switch-stress", { ...mosfet, rthJa: "40 K/W", tjMax: "150 degC" }).warnings.join(" ")).toMatch(/exceeds T_j\(max\)/);
  });
});

describe("switch-stress: device data that does not fit together", () => {
  it("asks for R_DS(on) for a MOSFET", () => {
    expect(refuse("switch-stress", { ...mosfet, rdsOn: undefined })).toEqual([{ field: "rdsOn", message: "rdsOn is needed for a MOSFET, e.g. 25 mohm" }]);
  });

  it("asks for V_CE(sat) for an IGBT", () => {
    expect(refuse("switch-stress", { ...mosfet, device: "igbt" }).map((e) => e.field)).toEqual(["vceSat"]);
  });

  it("names the missing parts of a partial set of switching energies", () => {
    const fields = refuse("switch-stress", { ...mosfet, tr: undefined, tf: undefined, eon: "100 uJ" }).map((e) => e.field);
    expect(fields).toEqual(["eoff", "eTestV", "eTestI"]);
  });

  it("asks for switching data when none is given", () => {
    expect(refuse("switch-stress", { ...mosfet, tr: undefined, tf: undefined }).map((e) => e.field)).toEqual(["tr", "tf"]);
  });
});
