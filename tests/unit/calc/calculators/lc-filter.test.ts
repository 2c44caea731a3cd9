import * as reference from "mathjs";
import { describe, expect, it } from "vitest";
import type { BodePoint } from "~/lib/calc/types";
import { expectClose } from "../../../support/tolerance";
import { refuse, run, valueOf } from "./run-helpers";

/** |H| from the circuit itself, Vout/Vin = Z_RC / (jωL + Z_RC), in the full mathjs bundle's complex numbers (independent of the engine). */
function circuitGain(f: number, l: number, c: number, r?: number): number {
  const w = 2 * Math.PI * f;
  const zc = reference.complex(0, -1 / (w * c));
  const zShunt = r === undefined ? zc : reference.divide(reference.multiply(zc, r), reference.add(zc, r));
  const ratio = reference.divide(zShunt, reference.add(reference.complex(0, w * l), zShunt as never));
  return reference.abs(ratio as never) as unknown as number;
}

const worked = { l: "1 mH", c: "10 uF", rLoad: "10 ohm", fsw: "20 kHz" };

describe("lc-filter: worked check L = 1 mH, C = 10 µF, R = 10 Ω", () => {
  // Derived from Erickson & Maksimović, Fundamentals of Power Electronics, 2nd ed., ch. 8 (chapter from memory):
  // f0 = 1/(2π√(1 mH·10 µF)) = 1591.55 Hz, Z0 = √(L/C) = 10 Ω, Q = R/Z0 = 1,
  // |H(20 kHz)| = 1/√((1 − ω²LC)² + (ωL/R)²) = −43.94 dB.
  const { results, warnings } = run("lc-filter", worked);

  it("f0 = 1591.55 Hz and Z0 = 10 Ω (derived)", () => {
    expectClose(valueOf(results, "f0"), 1591.55, { abs: 0.005 });
    expectClose(valueOf(results, "z0"), 10, { rel: 1e-12 });
  });

  it("Q = R/Z0 = 1 (Erickson & Maksimović, Fundamentals of Power Electronics, 2nd ed., ch. 8; chapter from memory)", () => {
    expectClose(valueOf(results, "q"), 1, { rel: 1e-12 });
  });

  it("|H(20 kHz)| = −43.94 dB (derived)", () => {
    expectClose(valueOf(results, "gainFswDb"), -43.94, { abs: 0.005 });
  });

  it("has no warnings for a well-placed corner", () => {
    expect(warnings).toEqual([]);
  });
});

describe("lc-filter: transfer function", () => {
  it("matches the circuit's complex divider at every Bode point (mathjs complex arithmetic)", () => {
    const { results } = run("lc-filter", worked);
    const bode = results.bode as BodePoint[];
    expect(bode.length).toBe(200);
    for (const point of bode) {
      expectClose(point.gainDb, 20 * Math.log10(circuitGain(point.f, 1e-3, 10e-6, 10)), { abs: 1e-9 }, `gain at ${point.f} Hz`);
    }
  });

  it("spans f/10 to 10·fsw, log-spaced", () => {
    const bode = run("lc-filter", worked).results.bode as BodePoint[];
    expectClose(bode[0]!.f, 5, { rel: 1e-12 });
    expectClose(bode.at(-1)!.f, 200e3, { rel: 1e-12 });
    expectClose(bode[1]!.f / bode[0]!.f, bode[100]!.f / bode[99]!.f, { rel: 1e-12 });
  });

  it("peaks at |H(f0)| = Q (Erickson & Maksimović, 2nd ed., ch. 8 — published)", () => {
    // f0 of L = 1 mH, C = 10 µF is 1591.549 Hz; evaluate the gain exactly there through fsw.
    const f0 = 1 / (2 * Math.PI * Math.sqrt(1e-3 * 10e-6));
    const { results } = run("lc-filter", { l: "1 mH", c: "10 uF", rLoad: "40 ohm", fsw: `${f0} Hz` });
    expectClose(valueOf(results, "gainFswDb"), 20 * Math.log10(4), { abs: 1e-9 });
  });

  it("falls at −40 dB/decade well above f0 (same source)", () => {
    const a = valueOf(run("lc-filter", { ...worked, fsw: "100 kHz" }).results, "gainFswDb");
    const b = valueOf(run("lc-filter", { ...worked, fsw: "1 MHz" }).results, "gainFswDb");
    expectClose(b - a, -40, { abs: 0.01 });
  });

  // Derived: a capacitor across Vout carries Vout/X_C = Vout·2πfC at the fundamental; mathjs does the unit arithmetic.
  it("gives the capacitor's fundamental current Vout·2πfC (230 V, 50 Hz, 10 µF)", () => {
    const { results } = run("lc-filter", { ...worked, vout: "230 V" });
    const byUnits = reference.evaluate("230 V * 2 pi * 50 Hz * 10 uF").toNumber("A");
    expectClose(valueOf(results, "icRms"), byUnits, { rel: 1e-12 });
  });
});

describe("lc-filter: unloaded and poorly placed filters", () => {
  it("omits Q when unloaded and says why", () => {
    const { results, warnings } = run("lc-filter", { l: "1 mH", c: "10 uF", fsw: "20 kHz" });
    expect("q" in results).toBe(false);
    expect(warnings.join(" ")).toMatch(/Unloaded filter/);
    expectClose(valueOf(results, "gainFswDb"), 20 * Math.log10(circuitGain(20e3, 1e-3, 10e-6)), { abs: 1e-9 });
  });

  it("never returns an infinite gain, even exactly at resonance unloaded", () => {
    const f0 = 1 / (2 * Math.PI * Math.sqrt(1e-3 * 10e-6));
    const { results, warnings } = run("lc-filter", { l: "1 mH", c: "10 uF", fsw: `${f0} Hz` });
    for (const value of Object.values(results)) expect(JSON.stringify(value)).not.toMatch(/null|Infinity/);
    expect(warnings.length).toBeGreaterThan(0);
  });

  it("warns when the corner is not a decade below fsw (common practice, no source)", () => {
    expect(run("lc-filter", { l: "100 uH", c: "1 uF", rLoad: "10 ohm", fsw: "20 kHz" }).warnings.join(" ")).toMatch(/not a decade below the switching frequency/);
  });

  it("warns when the corner is near the fundamental (common practice, no source)", () => {
    expect(run("lc-filter", { l: "10 mH", c: "100 uF", rLoad: "10 ohm", fsw: "20 kHz" }).warnings.join(" ")).toMatch(/within a decade of the fundamental/);
  });

  // Derived: R = 100 Ω gives Q = 10, and |H(f0)| = Q (Erickson & Maksimović, 2nd ed., ch. 8 — published) is 20 dB.
  it("warns of resonance peaking when Q is large", () => {
    expect(run("lc-filter", { ...worked, rLoad: "100 ohm" }).warnings.join(" ")).toMatch(/peaks by about 20.0 dB/);
  });

  it("refuses a capacitance typed as an inductance", () => {
    expect(refuse("lc-filter", { ...worked, c: "10 mH" })).toEqual([{ field: "c", message: "c must be a capacitance; got 10 mH" }]);
  });
});
