import { describe, expect, it } from "vitest";
import { calculator } from "~/lib/calc/calculators/lcl-filter";
import type { BodePoint } from "~/lib/calc/types";
import { expectClose } from "../../../support/tolerance";
import { expectAllFinite, run } from "./run-calculator";
import { refuse, run as evaluate, valueOf } from "./run-helpers";

const BASE = { l1: 1.8e-3, l2: 0.6e-3, c: 10e-6, rd: 2, fsw: 10e3, f: 50, vGrid: 230, phases: "3" };
const compute = (overrides: Record<string, number | string> = {}) => run(calculator, { ...BASE, ...overrides });

/**
 * The LCL circuit driven by v_i = sin(2πft) with the grid shorted, integrated with classical RK4 (40 steps per period)
 * until the start-up transient has died away; i1 and i2 amplitudes from their Fourier components over the last periods.
 */
function integratedAmplitudes(l1: number, l2: number, c: number, rd: number, f: number) {
  const stepsPerPeriod = 400;
  const dt = 1 / (f * stepsPerPeriod);
  // State: i1, i2, v_c (capacitor voltage without the resistor's drop). Node voltage v_n = v_c + rd·(i1 − i2).
  const derivative = (t: number, [i1, i2, vc]: number[]) => {
    const vn = vc! + rd * (i1! - i2!);
    return [(Math.sin(2 * Math.PI * f * t) - vn) / l1, vn / l2, (i1! - i2!) / c];
  };
  let state = [0, 0, 0];
  // Periods to settle: the damped resonance (Q of a few) decays within a few tens of its own periods.
  const settle = Math.ceil(200 * f * Math.sqrt((l1 * l2 * c) / (l1 + l2)) * 2 * Math.PI) + 20;
  const measure = 20;
  let s1 = 0;
  let c1 = 0;
  let s2 = 0;
  let c2 = 0;
  for (let n = 0; n < (settle + measure) * stepsPerPeriod; n++) {
    const t = n * dt;
    const k1 = derivative(t, state);
    const k2 = derivative(t + dt / 2, state.map((x, i) => x + (dt / 2) * k1[i]!));
    const k3 = derivative(t + dt / 2, state.map((x, i) => x + (dt / 2) * k2[i]!));
    const k4 = derivative(t + dt, state.map((x, i) => x + dt * k3[i]!));
    state = state.map((x, i) => x + (dt / 6) * (k1[i]! + 2 * k2[i]! + 2 * k3[i]! + k4[i]!));
    if (n >= settle * stepsPerPeriod) {
      const phase = 2 * Math.PI * f * (t + dt);
      s1 += state[0]! * Math.sin(phase);
      c1 += state[0]! * Math.cos(phase);
      s2 += state[1]! * Math.sin(phase);
      c2 += state[1]! * Math.cos(phase);
    }
  }
  const samples = measure * stepsPerPeriod;
  return { i1: (2 / samples) * Math.hypot(s1, c1), i2: (2 / samples) * Math.hypot(s2, c2) };
}

describe("LCL filter against the integrated circuit (RK4)", () => {
  it.each([
    [10e3, 2],
    [4e3, 2],
    [2.37e3, 4],
  ])("at %s Hz with R_d = %s Ω: |i2/i1| and |i2/v_i| within 0.5 %", (frequency, rd) => {
    const { results } = compute({ rd, fsw: frequency });
    const reference = integratedAmplitudes(BASE.l1, BASE.l2, BASE.c, rd, frequency);
    expectClose(valueOf(results, "ripplePassFsw") / 100, reference.i2 / reference.i1, { rel: 5e-3 }, "i2/i1");
    const bode = results.bode as BodePoint[];
    const atFsw = bode.find((p) => Math.abs(p.f / (10 * frequency) - 1) < 1e-9) ?? bode[bode.length - 1]!;
    expect(atFsw.f).toBeCloseTo(10 * frequency, 6);
    // The Bode plot ends at 10·fsw; the response at fsw itself is compared through the attenuation above,
    // and the plot's level is checked against the circuit at its last point.
    const high = integratedAmplitudes(BASE.l1, BASE.l2, BASE.c, rd, 10 * frequency);
    expectClose(10 ** (atFsw.gainDb / 20), high.i2, { rel: 5e-3 }, "|i2/v_i| at 10·fsw");
  });
});

describe("LCL filter: resonance and design rules", () => {
  it("resonance √((L1 + L2)/(L1·L2·C)): 2250.8 Hz for 1 mH, 1 mH, 10 µF (Liserre, Blaabjerg & Hansen 2005 — formula; value derived)", () => {
    const { results } = compute({ l1: 1e-3, l2: 1e-3, c: 10e-6, rd: 0.05 });
    expectClose(valueOf(results, "fRes"), Math.sqrt(2e8) / (2 * Math.PI), { rel: 1e-12 });
    expectClose(valueOf(results, "fRes"), 2250.79, { abs: 0.01 });
    const bode = results.bode as BodePoint[];
    // Below the resonance the inductive response 1/(ω(L1 + L2)) is higher still: look above 1 kHz.
    const peak = bode.filter((p) => p.f > 1000).reduce((p, q) => (q.gainDb > p.gainDb ? q : p));
    // 241 log-spaced points over five decades: one step is 4.9 %.
    expectClose(peak.f, valueOf(results, "fRes"), { rel: 0.05 }, "Bode peak");
  });

  it("the suggested resistor is a third of the capacitor's impedance at resonance, and damps the peak to about 11 dB", () => {
    const { results } = compute();
    const wRes = 2 * Math.PI * valueOf(results, "fRes");
    expectClose(valueOf(results, "rdSuggested"), 1 / (3 * wRes * BASE.c), { rel: 1e-12 });
    expect(valueOf(results, "peakDb")).toBeLessThan(12);
    const undamped = compute({ rd: 0 });
    expect(undamped.results.peakDb).toBeUndefined();
    expect(undamped.warnings.join(" ")).toMatch(/barely damped/);
  });

  it("reactive power m·V²·ωC and damping loss m·(I_C1² + I_Csw²)·R_d (derived)", () => {
    const { results } = compute({ pRated: 15e3, iRipple: 2 });
    const w1 = 2 * Math.PI * 50;
    expectClose(valueOf(results, "qCap"), 3 * 230 * 230 * w1 * 10e-6, { rel: 1e-12 });
    expectClose(valueOf(results, "qCapShare"), (100 * 3 * 230 * 230 * w1 * 10e-6) / 15e3, { rel: 1e-12 });
    const w = 2 * Math.PI * 10e3;
    const share = Math.abs(w * 0.6e-3) / Math.hypot(2, w * 0.6e-3 - 1 / (w * 10e-6));
    expectClose(valueOf(results, "pDamping"), 3 * ((230 * w1 * 10e-6) ** 2 + (2 * share) ** 2) * 2, { rel: 1e-12 });
  });

  it("flags a resonance above fsw/2, near the control's f_s/6, and a capacitor over 5 % of the rating (common practice)", () => {
    expect(compute({ fsw: 4e3 }).warnings.join(" ")).toMatch(/above half the switching frequency/);
    expect(compute({ fControl: 14e3 }).warnings.join(" ")).toMatch(/critical frequency/);
    expect(compute({ pRated: 5e3 }).warnings.join(" ")).toMatch(/reactive power/);
    expect(compute().warnings).toEqual([]);
  });
});

describe("LCL filter: inputs as typed and field errors", () => {
  it("reads inputs as typed on a sheet", () => {
    const { results } = evaluate("lcl-filter", { l1: "1.8 mH", l2: "0.6 mH", c: "10 uF", rd: "2 ohm", fsw: "10 kHz", f: "50 Hz", vGrid: "230 V", phases: "3" });
    expectClose(valueOf(results, "fRes"), Math.sqrt((2.4e-3) / (1.8e-3 * 0.6e-3 * 10e-6)) / (2 * Math.PI), { rel: 1e-12 });
    expectAllFinite(results);
  });

  it("refuses a zero inductance or capacitance and an unknown phase count, naming the field", () => {
    const base = { l1: "1.8 mH", l2: "0.6 mH", c: "10 uF", rd: "2 ohm", fsw: "10 kHz", f: "50 Hz", vGrid: "230 V", phases: "3" };
    expect(refuse("lcl-filter", { ...base, l2: "0 H" })[0]!.field).toBe("l2");
    expect(refuse("lcl-filter", { ...base, c: "0 F" })[0]!.field).toBe("c");
    expect(refuse("lcl-filter", { ...base, phases: "2" })[0]!.field).toBe("phases");
  });
});
