import { describe, expect, it } from "vitest";
import { expectClose } from "../../../support/tolerance";
import { refuse, run, valueOf } from "./run-helpers";

// Reference: instantaneous power of a single-phase load at unity power factor,
// p(t) = P·(1 − cos 2ωt) — derived from p = v·i with v and i in phase. The checks below
// integrate that waveform numerically instead of reusing the closed form.

/** Capacitor current i_C(t) = (P − p(t))/Vdc sampled over one output cycle, and the charge it moves. */
function simulate(p: number, vdc: number, f: number, points = 200_000) {
  const dt = 1 / f / points;
  let charge = 0;
  let lowest = 0;
  let highest = 0;
  let sumSquares = 0;
  for (let j = 0; j < points; j++) {
    const t = (j + 0.5) * dt;
    const instantaneous = p * (1 - Math.cos(4 * Math.PI * f * t));
    const current = (p - instantaneous) / vdc;
    charge += current * dt;
    lowest = Math.min(lowest, charge);
    highest = Math.max(highest, charge);
    sumSquares += current * current;
  }
  return { chargeSwing: highest - lowest, currentRms: Math.sqrt(sumSquares / points) };
}

describe("dc-link", () => {
  const inputs = { p: "3 kW", vdc: "400 V", f: "50 Hz", rippleVpp: "10 V" };
  const { results } = run("dc-link", inputs);
  const simulated = simulate(3000, 400, 50);

  it("sizes C so the second-harmonic charge swing gives the allowed ripple: C = ΔQ/ΔV", () => {
    expectClose(valueOf(results, "c"), simulated.chargeSwing / 10, { rel: 1e-6 });
    expectClose(valueOf(results, "c"), 3000 / (2 * Math.PI * 50 * 400 * 10), { rel: 1e-12 });
  });

  it("gives the capacitor's RMS ripple current P/(√2·Vdc)", () => {
    expectClose(valueOf(results, "iRippleRms"), simulated.currentRms, { rel: 1e-6 });
  });

  it("puts the ripple at twice the output frequency", () => {
    expectClose(valueOf(results, "rippleFrequency"), 100, { rel: 1e-12 });
  });

  it("halves C when the allowed ripple doubles", () => {
    const doubled = run("dc-link", { ...inputs, rippleVpp: "20 V" }).results;
    expectClose(valueOf(doubled, "c"), valueOf(results, "c") / 2, { rel: 1e-12 });
  });

  it("warns when the ripple is large against Vdc (about 10 %: common practice, no source)", () => {
    expect(run("dc-link", { ...inputs, rippleVpp: "60 V" }).warnings.join(" ")).toMatch(/15.0 % of Vdc/);
  });

  it("refuses a ripple as large as the DC link", () => {
    expect(refuse("dc-link", { ...inputs, rippleVpp: "400 V" })).toEqual([{ field: "rippleVpp", message: "rippleVpp must be below vdc (400 V); got 400 V" }]);
  });
});
