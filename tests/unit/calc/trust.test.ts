// Issue #16: no false pass, no silent guess at a unit, definitions as the standards write them.
// Each check names its source: published, derived (with the derivation), or common practice.
import { describe, expect, it } from "vitest";
import { evaluateCalculator, evaluateSheet, type BlockOutcome } from "~/lib/calc/evaluate-sheet";
import type { LimitRow } from "~/lib/calc/types";
import { expectClose } from "../../support/tolerance";
import { cellAveragedSpectrum, comparatorCellFractions, sampledThdUpTo, triangle } from "./fft-reference";
import { refuse, run, valueOf } from "./calculators/run-helpers";

function sheet(blocks: { id: string; calculator: string; inputs: Record<string, unknown> }[]) {
  return evaluateSheet(blocks).blocks;
}
const okOf = (outcome: BlockOutcome | undefined) => {
  if (!outcome?.ok) throw new Error(`block failed: ${JSON.stringify(outcome)}`);
  return outcome;
};
const errorsOf = (outcome: BlockOutcome | undefined) => (outcome && !outcome.ok ? outcome.errors : []);

/** Naturally sampled bipolar SPWM of a full bridge, levels ±1 (× Vdc), carrier valley at 90°, as cell averages. */
function bipolarSpwm(ma: number, mf: number, points = 2 ** 18) {
  const fractions = comparatorCellFractions((t) => ma * Math.sin(t) - triangle(mf * (t - Math.PI / 2)), points);
  return fractions.map((f) => 2 * f - 1);
}

describe("limits check: a spectrum that stops short of the table gets no verdict (issue #16 item 1)", () => {
  // IEEE Std 519-2014 Table 1 limits orders to 50; IEC 61000-3-2 Table 1 to 40 — published.
  // An odd-only source listed to an odd hmax also accounts for the even order after it (zero by half-wave symmetry — derived).
  it("refuses an SPWM spectrum listed to 45 for IEEE 519, saying to raise hmax; gives one at 50, whose THD matches an FFT", () => {
    const blocks = (hmax: string) =>
      sheet([
        { id: "pwm", calculator: "spwm", inputs: { vdc: "400 V", ma: "0.9", mf: "51", hmax } },
        { id: "lim", calculator: "harmonic-limits", inputs: { standard: "ieee519-voltage", busVoltage: "400 V", spectrum: "=pwm.harmonics" } },
      ]);
    const short = errorsOf(blocks("45").lim);
    expect(short[0]?.field).toBe("spectrum");
    expect(short[0]?.message).toMatch(/reaches order 46, but IEEE Std 519-2014 limits orders up to 50.*Raise the source block's hmax to 50/);

    const full = okOf(blocks("50").lim);
    // Cross-check (derived): time-domain synthesis on 2^18 cells and FFT, THD over orders 2…50.
    const reference = sampledThdUpTo(cellAveragedSpectrum(bipolarSpwm(0.9, 51)), 50);
    expectClose(valueOf(full.results, "thd"), reference, { rel: 5e-3 });
    expect(reference).toBeGreaterThan(20); // the truncated list would have said 0.02 %
    expect(full.results.pass).toBe(false);
  });

  it("refuses a quasi-square block listed to order 3 (true THD about 30 %)", () => {
    const blocks = sheet([
      { id: "qs", calculator: "quasi-square", inputs: { vdc: "48 V", alpha: "30 deg", hmax: "3" } },
      { id: "lim", calculator: "harmonic-limits", inputs: { standard: "ieee519-voltage", busVoltage: "230 V", spectrum: "=qs.harmonics" } },
    ]);
    expect(errorsOf(blocks.lim)[0]?.message).toMatch(/reaches order 4,/);
  });

  it("takes an odd-only source listed to 49 as reaching 50 (half-wave symmetry: order 50 is zero — derived)", () => {
    const blocks = sheet([
      { id: "qs", calculator: "quasi-square", inputs: { vdc: "48 V", alpha: "30 deg", hmax: "49" } },
      { id: "lim", calculator: "harmonic-limits", inputs: { standard: "ieee519-voltage", busVoltage: "230 V", spectrum: "=qs.harmonics" } },
    ]);
    expect(okOf(blocks.lim).results.pass).toBe(false);
  });

  it("refuses a typed spectrum stopping at 13 unless listedTo says the rest are zero; refuses listedTo on a reference", () => {
    const typed = [{ n: 3, value: "1 %" }, { n: 13, value: "0.2 %" }];
    expect(refuse("harmonic-limits", { standard: "ieee519-voltage", busVoltage: "230 V", spectrum: typed })[0]!.message).toMatch(/set listedTo = 50/);
    expect(run("harmonic-limits", { standard: "ieee519-voltage", busVoltage: "230 V", spectrum: typed, listedTo: "50" }).results.pass).toBe(true);
    expect(refuse("harmonic-limits", { standard: "iec61000-3-2-a", spectrum: [{ n: 1, value: "5 A" }, { n: 39, value: "0.01 A" }] })[0]!.message).toMatch(/limits orders up to 40/);
    const blocks = sheet([
      { id: "qs", calculator: "quasi-square", inputs: { vdc: "48 V", alpha: "30 deg", hmax: "9" } },
      { id: "lim", calculator: "harmonic-limits", inputs: { standard: "ieee519-voltage", busVoltage: "230 V", spectrum: "=qs.harmonics", listedTo: "50" } },
    ]);
    expect(errorsOf(blocks.lim).map((e) => e.field)).toContain("listedTo");
  });
});

describe("limits check: a voltage spectrum is refused for current limits (issue #16 item 2)", () => {
  // IEEE Std 519-2014 Table 2 limits current harmonics (published); a voltage spectrum says nothing about them without the load.
  it.each(["ieee519-current", "ieee1547"])("refuses six-step voltage harmonics for %s", (standard) => {
    const blocks = sheet([
      { id: "six", calculator: "six-step", inputs: { vdc: "400 V", hmax: "50" } },
      { id: "lim", calculator: "harmonic-limits", inputs: { standard, iscIl: "10", spectrum: "=six.harmonics" } },
    ]);
    expect(errorsOf(blocks.lim)[0]?.message).toMatch(/limits harmonic currents, and six.harmonics are voltage harmonics. Current harmonics depend on the load/);
  });

  it("refuses typed volts for a current table", () => {
    expect(refuse("harmonic-limits", { standard: "ieee519-current", iscIl: "10", listedTo: "50", spectrum: [{ n: 1, value: "230 V" }, { n: 3, value: "5 V" }] })[0]!.message).toMatch(/limits harmonic currents/);
  });
});

describe("limits check: interharmonics are reported, never checked as harmonics (issue #16 item 3)", () => {
  // Lines of asynchronous PWM fall at m·mf + n (Holmes & Lipo, 2003, ch. 3 — published); with mf = 20.5 at 12.5, 16.5, 22.5 …
  it("lists non-integer orders separately and gives no verdict", () => {
    const blocks = sheet([
      { id: "pwm", calculator: "spwm", inputs: { vdc: "400 V", ma: "0.8", mf: "20.5", hmax: "60" } },
      { id: "lim", calculator: "harmonic-limits", inputs: { standard: "ieee519-voltage", busVoltage: "400 V", spectrum: "=pwm.harmonics" } },
    ]);
    const lim = okOf(blocks.lim);
    expect(lim.results.pass).toBeUndefined();
    expect((lim.results.rows as LimitRow[]).every((r) => Number.isInteger(r.n))).toBe(true);
    expect(valueOf(lim.results, "interharmonics")).toBeGreaterThan(20);
    expect(lim.warnings.join(" ")).toMatch(/No verdict: the spectrum has \d+ interharmonic line\(s\) at non-integer orders \(.*22.5/);
  });
});

describe("THD excludes DC; DC is its own result (issue #16 item 4)", () => {
  // IEEE Std 519-2014 §3 and IEC 61000-3-2 define THD over harmonic orders h ≥ 2 — published.
  it("bipolar SPWM, ma 1.0, mf 4: dc and THD match an FFT of the synthesized wave", () => {
    const { results, warnings } = run("spwm", { vdc: "100 V", ma: "1", mf: "4", hmax: "50" });
    const spectrum = cellAveragedSpectrum(bipolarSpwm(1, 4));
    const v1 = spectrum.peaks[1]! * 100;
    expectClose(Math.abs(valueOf(results, "dc")), spectrum.mean * 100 === 0 ? 0 : Math.abs(spectrum.mean) * 100, { rel: 1e-3 });
    expect(Math.abs(valueOf(results, "dc")) / (v1 / Math.SQRT2)).toBeGreaterThan(0.01);
    // THD over every order ≥ 2 from the sampled RMS with the fundamental and the mean removed.
    let sumSquares = 0;
    for (let n = 2; n < spectrum.peaks.length; n++) sumSquares += spectrum.peaks[n]! ** 2 / 2;
    const reference = (100 * Math.sqrt(sumSquares)) / (spectrum.peaks[1]! / Math.SQRT2);
    expectClose(valueOf(results, "thd"), reference, { rel: 5e-3 });
    expect(warnings.join(" ")).toMatch(/DC offset .* not counted in THD/);
  });
});

describe("typed inputs never change magnitude by a silent guess (issue #16 items 5–8)", () => {
  it("refuses bare numbers for dimensioned inputs, typed or JSON, with the reading spelled out", () => {
    const lc = (inputs: Record<string, unknown>) => refuse("lc-filter", { l: "1 mH", c: "10 uF", fsw: "20 kHz", rLoad: "10 ohm", ...inputs })[0]!.message;
    expect(lc({ c: "4.7e-6" })).toMatch(/^c: 4.7e-6 has no unit: did you mean 4.7 µF.*\? Write the unit/);
    expect(lc({ fsw: 20000 })).toMatch(/^fsw: 20000 has no unit: did you mean 20 kHz/);
    expect(lc({ l: "1e-3" })).toMatch(/^l: 0.001 has no unit: did you mean 1 mH/);
    // Inputs documented as dimensionless still take bare numbers.
    expect(valueOf(run("spwm", { vdc: "400 V", ma: 0.8, mf: "21" }).results, "v1Peak")).toBeCloseTo(320, 9);
  });

  it("uses a default only for an absent or empty input, and says so", () => {
    const outcome = evaluateCalculator("half-bridge", { vdc: "" });
    expect(outcome.ok && outcome.defaultsUsed).toContainEqual({ key: "vdc", value: "48 V" });
    const none = evaluateCalculator("switch-stress", { vdc: null, p: "1 kW", fsw: "20 kHz", rdsOn: "10 mohm", tr: "20 ns", tf: "20 ns", rthJa: "2 K/W", vRated: "600 V" });
    expect(!none.ok && none.errors[0]).toMatchObject({ field: "vdc", message: expect.stringMatching(/required/) });
  });

  it("refuses a decimal comma inside a list, showing both readings", () => {
    const message = refuse("stepped-wave", { vdc: "48 V", angles: "9,59 deg" })[0]!.message;
    expect(message).toBe('angles: "9,59" has two readings — 9.59 (a decimal comma) or 9 and 59 (two items); write decimals with a point and separate items with a comma and a space, e.g. 9.59 deg or 9 deg, 59 deg');
  });

  it.each([
    ["fsw", "20 KHz", "20 kHz"],
    ["vdc", "48 v", "48 V"],
    ["rLoad", "10 Ohm", "10 Ω"],
    ["c", "4.7 uf", "4.7 µF"],
    ["vdc", "48 VDC", "48 V"],
    ["fsw", "60hz", "60 Hz"],
  ])("reads %s = %s as %s and echoes it", (key, typed, understood) => {
    const { warnings } = key === "vdc" ? run("half-bridge", { vdc: typed }) : run("lc-filter", { l: "1 mH", c: "10 uF", fsw: "20 kHz", rLoad: "10 ohm", [key]: typed });
    expect(warnings).toContain(`${key}: read "${typed}" as ${understood}.`);
  });

  it("reads 30º (ordinal sign) as 30°", () => {
    expect(run("quasi-square", { vdc: "48 V", alpha: "30º" }).warnings).toContain('alpha: read "30º" as 30°.');
  });

  it.each([
    ["vdc", "5 mv", /could be mV or MV/],
    ["fsw", "5 MHZ", /could be mHz or MHz/],
  ])("refuses %s = %s: milli or mega", (key, typed, pattern) => {
    const errors = key === "vdc" ? refuse("half-bridge", { vdc: typed }) : refuse("lc-filter", { l: "1 mH", c: "10 uF", fsw: "20 kHz", rLoad: "10 ohm", [key]: typed });
    expect(errors[0]!.message).toMatch(pattern);
  });

  it("refuses an apparent power for a real-power input", () => {
    expect(refuse("dc-link", { p: "1.5 kVA", vdc: "400 V", rippleVpp: "10 V" })[0]!.message).toMatch(/1.5 kVA is an apparent power \(VA\); this input is real power in W/);
  });
});

describe("switch losses: SPWM duty-weighted conduction (issue #16 item 11)", () => {
  // Mohan, Undeland & Robbins, Power Electronics, 3rd ed., ch. 8: leg duty d = (1 + ma·sin θ)/2 — published.
  // Derived: I_T,avg = Î(1/(2π) + ma·cosφ/8), I_T,rms² = Î²(1/8 + ma·cosφ/(3π)); the diode takes the minus signs.
  const base = { topology: "full-bridge", device: "igbt", vdc: "400 V", p: "2 kW", fsw: "20 kHz", vceSat: "1.2 V", rCe: "40 mohm", vF0: "1 V", rD: "30 mohm", tr: "50 ns", tf: "100 ns", rthJa: "2 K/W", vRated: "600 V" };

  /** A switched leg simulated on a fine grid: transistor conducts i > 0 while the upper switch is on, diode i < 0 while it is on. */
  function simulated(ma: number, pf: number, peak: number) {
    const phi = Math.acos(pf);
    const mf = 999;
    const points = 2 ** 20;
    let tAvg = 0, tRms2 = 0, dAvg = 0, dRms2 = 0;
    for (let j = 0; j < points; j++) {
      const t = (2 * Math.PI * (j + 0.5)) / points;
      const on = ma * Math.sin(t) > triangle(mf * t);
      const i = peak * Math.sin(t - phi);
      if (!on) continue;
      if (i > 0) { tAvg += i; tRms2 += i * i; } else { dAvg -= i; dRms2 += i * i; }
    }
    return { tAvg: tAvg / points, tRms2: tRms2 / points, dAvg: dAvg / points, dRms2: dRms2 / points };
  }

  it.each([
    [1, 1],
    [0.6, 0.5],
  ])("ma %s, pf %s: transistor and diode losses match a switched simulation", (ma, pf) => {
    const vout = `${(ma * 400) / Math.SQRT2} V`;
    const { results, warnings } = run("switch-stress", { ...base, pf: String(pf), vout });
    const peak = valueOf(results, "iPeak");
    const sim = simulated(ma, pf, peak);
    expectClose(valueOf(results, "pCond"), 1.2 * sim.tAvg + 0.04 * sim.tRms2, { rel: 2e-3 });
    expectClose(valueOf(results, "pCondDiode"), 1 * sim.dAvg + 0.03 * sim.dRms2, { rel: 2e-3 });
    expect(valueOf(results, "pCondBound")).toBeCloseTo((1.2 * peak) / Math.PI, 9);
    expect(warnings.join(" ")).toMatch(/SPWM duty-weighted.*Mohan, Undeland & Robbins, Power Electronics, 3rd ed., ch. 8/);
  });

  it("the constant-drop bound is 12 % high at ma 1, pf 1 and 62 % high at ma 0.6, pf 0.5 (derived)", () => {
    const ratio = (ma: number, pf: number) => {
      const { results } = run("switch-stress", { ...base, rCe: undefined, pf: String(pf), vout: `${(ma * 400) / Math.SQRT2} V` });
      return valueOf(results, "pCondBound") / valueOf(results, "pCond");
    };
    expectClose(ratio(1, 1), 1 / Math.PI / (1 / (2 * Math.PI) + 1 / 8), { rel: 1e-9 });
    expectClose(ratio(1, 1), 1.12, { abs: 0.005 });
    expectClose(ratio(0.6, 0.5), 1.62, { abs: 0.01 });
  });
});

describe("DC link: ripple follows apparent power (issue #16 item 12)", () => {
  // Derived: p(t) = VI·cosφ − VI·cos(2ωt − φ); the 2ω part has amplitude S = P/pf.
  it("needs 1/pf times the capacitance and ripple current, and matches the sampled instantaneous power", () => {
    const unity = run("dc-link", { p: "2 kW", vdc: "400 V", rippleVpp: "10 V" });
    const lagging = run("dc-link", { p: "2 kW", pf: "0.8", vdc: "400 V", rippleVpp: "10 V" });
    expectClose(valueOf(lagging.results, "c") / valueOf(unity.results, "c"), 1 / 0.8, { rel: 1e-12 });
    expectClose(valueOf(lagging.results, "iRippleRms") / valueOf(unity.results, "iRippleRms"), 1 / 0.8, { rel: 1e-12 });
    expect(lagging.warnings.join(" ")).toMatch(/follows the apparent power S = P\/pf = 2.50 kVA/);
    // Sampled p(t) = v·i for a 230 V load at pf 0.8 drawing 2 kW: half its swing is S.
    const phi = Math.acos(0.8);
    const current = 2000 / (230 * 0.8);
    let high = -Infinity, low = Infinity;
    for (let j = 0; j < 100000; j++) {
      const t = (2 * Math.PI * j) / 100000;
      const power = 230 * Math.SQRT2 * Math.sin(t) * current * Math.SQRT2 * Math.sin(t - phi);
      high = Math.max(high, power);
      low = Math.min(low, power);
    }
    expectClose((high - low) / 2, valueOf(lagging.results, "apparentPower"), { rel: 1e-6 });
  });
});

describe("formula results keep their meaning (issue #16 item 9)", () => {
  const formula = (expr: string, extra: { id: string; calculator: string; inputs: Record<string, unknown> }[] = []) =>
    sheet([...extra, { id: "f", calculator: "formula", inputs: { expr } }]).f;
  const qs = { id: "qs1", calculator: "quasi-square", inputs: { vdc: "48 V", alpha: "30 deg" } };
  const stress = (id: string, ta: string) => ({
    id,
    calculator: "switch-stress",
    inputs: { vdc: "400 V", p: "1 kW", fsw: "20 kHz", rdsOn: "10 mohm", tr: "20 ns", tf: "20 ns", rthJa: "2 K/W", vRated: "600 V", ta },
  });

  it("a difference of temperatures is in K (SI: a temperature interval is expressed in kelvin — BIPM SI Brochure, 9th ed., §2.3.1, section from memory)", () => {
    const outcome = okOf(formula("hot.tj - cold.tj", [stress("hot", "60 degC"), stress("cold", "40 degC")]));
    expect(outcome.results.value).toMatchObject({ unit: "K", display: "20.0 K" });
    expectClose((outcome.results.value as { value: number }).value, 20, { rel: 1e-9 });
  });

  it("a percentage scaled by a pure number stays a percentage (derived: x % × k = k·x %)", () => {
    const scaled = okOf(formula("qs1.thd * 1", [qs])).results.value as { value: number; unit: string };
    const thd = okOf(sheet([qs]).qs1).results.thd as { value: number };
    expect(scaled.unit).toBe("%");
    expectClose(scaled.value, thd.value, { rel: 1e-12 });
    expect(okOf(formula("qs1.thd * qs1.thd", [qs])).results.value).toMatchObject({ unit: "" });
  });

  it("adding different kinds of quantity gives a user's message, not the library's", () => {
    const errors = errorsOf(formula("qs1.v1Rms + 2 A", [qs]));
    expect(errors[0]!.message).toMatch(/^cannot add 2 A \(a current\) to .* V \(a voltage\): they are different kinds of quantity/);
    expect(errors[0]!.message).not.toMatch(/addScalar|index/);
  });
});

describe("words, not symbols, for the unbounded (issue #16 item 10)", () => {
  // Derived: an unloaded LC low-pass has |H| = 1/|1 − (f/f0)²|, without bound at f0 = 1/(2π√(LC)).
  it("an unloaded filter evaluated at f0 reports no gain there, and says why", () => {
    const f0 = 1 / (2 * Math.PI * Math.sqrt(1e-3 * 10e-6));
    const { results, warnings } = run("lc-filter", { l: "1 mH", c: "10 uF", fsw: `${f0} Hz` });
    expect(results.gainFswDb).toBeUndefined();
    expect(warnings.join(" ")).toMatch(/The gain at the switching frequency \(1.59 kHz\) is unbounded and not reported: it sits at the corner f0 of an unloaded filter, which has no damping/);
    expect(warnings.join(" ")).not.toMatch(/∞|287/);
  });

  it("formats an unbounded value as a word, never ∞ with a unit", async () => {
    const { formatQuantity } = await import("~/lib/calc/format");
    expect(formatQuantity(Infinity, "%")).toBe("unbounded");
    expect(formatQuantity(Infinity, "Hz")).toBe("unbounded");
  });
});
