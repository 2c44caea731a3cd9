import { describe, expect, it } from "vitest";
import { calculator } from "~/lib/calc/calculators/dead-time";
import { expectClose } from "../../../support/tolerance";
import { sampledSpectrum, triangle } from "../fft-reference";
import { expectAllFinite, harmonicsOf, peakAt, run } from "./run-calculator";
import { refuse, run as evaluate, valueOf } from "./run-helpers";

const BASE = { vdc: 600, ma: 0.9, fsw: 10e3, td: 1.5e-6, phi: 30, vT: 1.5, vD: 1.2, f: 50, hmax: 25 };
const compute = (overrides: Partial<typeof BASE> & { tMinOn?: number } = {}) => run(calculator, { ...BASE, ...overrides });

/**
 * The leg written from its definition, on 2^20 points per cycle: gate from the carrier comparison; each switch turns
 * on td after its gate asks (turn-off is immediate); the current Î·sin(θ − φ) picks transistor or diode, and in the
 * dead interval the diode its sign allows.
 */
function synthesizedPole(p: typeof BASE) {
  const mf = p.fsw / p.f;
  const delay = 2 * Math.PI * p.f * p.td;
  const phi = (p.phi * Math.PI) / 180;
  const gate = (t: number) => p.ma * Math.sin(t) > triangle(mf * (t - Math.PI / 2));
  const half = p.vdc / 2;
  return (theta: number) => {
    const now = gate(theta);
    const before = gate(theta - delay);
    const upperOn = now && before;
    const lowerOn = !now && !before;
    const positive = Math.sin(theta - phi) > 0;
    if (upperOn) return positive ? half - p.vT : half + p.vD;
    if (lowerOn) return positive ? -half - p.vD : -half + p.vT;
    return positive ? -half - p.vD : half + p.vD; // dead interval: the diode the current's sign allows
  };
}

describe("dead time against the synthesized switched leg (fft.js, 2^20 points, mf 200)", () => {
  it.each([
    [30, 0.9, 1.5e-6],
    [0, 0.8, 3e-6],
    [80, 0.5, 2e-6],
    [-45, 0.9, 1e-6],
  ])("φ %s°, ma %s, td %s s: fundamental and its phase within 0.5 %, the 3rd–7th within 2 % of their size", (phi, ma, td) => {
    const p = { ...BASE, phi, ma, td };
    const { results } = compute(p);
    const sampled = sampledSpectrum(synthesizedPole(p), 2 ** 20);
    expectClose(valueOf(results, "v1Peak"), sampled.peaks[1]!, { rel: 5e-3 }, "fundamental");
    const table = harmonicsOf(results);
    // Near each current zero crossing one switching period carries part of the error: O(A/mf) per harmonic.
    for (const n of [3, 5, 7]) expectClose(peakAt(table, n), sampled.peaks[n]!, { rel: 2e-2 }, `order ${n}`);
  });

  it("the fundamental lost grows as Vdc·td·fsw: twice the dead time, about twice the loss at φ = 0 (Mohan 3rd ed. §8-7, from memory)", () => {
    const noDrops = { vT: 0, vD: 0, phi: 0 };
    const one = valueOf(compute({ ...noDrops, td: 1e-6 }).results, "v1Loss");
    const two = valueOf(compute({ ...noDrops, td: 2e-6 }).results, "v1Loss");
    expectClose(two, 2 * one, { rel: 1e-12 });
    expectClose(one, (100 * (4 / Math.PI) * 600 * 1e-6 * 10e3) / 270, { rel: 1e-12 });
  });
});

describe("dead time: the narrowest pulse and field errors", () => {
  it("narrowest pulse (1 − ma)/(2·fsw), with a warning when dead time and minimum on-time do not fit", () => {
    const { results, warnings } = compute({ ma: 0.98, tMinOn: 0.5e-6 });
    expectClose(valueOf(results, "minPulse"), 0.02 / 20e3, { rel: 1e-12 });
    expect(valueOf(results, "pulseMargin")).toBeLessThan(0);
    expect(warnings.join(" ")).toMatch(/pulses drop/);
    expect(compute().warnings).toEqual([]);
  });

  it("reads inputs as typed on a sheet and refuses bad ones, naming the field", () => {
    const typed = Object.fromEntries(calculator.inputs.filter((s) => !s.optional).map((s) => [s.key, s.default]));
    const { results } = evaluate("dead-time", typed);
    expect(valueOf(results, "v1Loss")).toBeGreaterThan(0);
    expectAllFinite(results);
    expect(refuse("dead-time", { ...typed, td: "-1 us" })[0]!.field).toBe("td");
    expect(refuse("dead-time", { ...typed, ma: "1.2" })[0]!.field).toBe("ma");
    expect(refuse("dead-time", { ...typed, phi: "200 deg" })[0]!.field).toBe("phi");
  });
});
