/**
 * The engine's lean mathjs instance against the full mathjs bundle (general-purpose
 * npm reference library): the same text must give the same SI value, and unit
 * arithmetic in formulas must match the bundle's own evaluation.
 */
import fc from "fast-check";
import * as full from "mathjs";
import { describe, expect, it } from "vitest";
import { evaluateSheet } from "~/lib/calc/evaluate-sheet";
import type { Dimension, ScalarResult } from "~/lib/calc/types";
import { SI_UNIT } from "~/lib/calc/format";
import { parseQuantity } from "~/lib/calc/units";
import { expectClose } from "../../support/tolerance";


const SPELLINGS: [Dimension, string[]][] = [
  ["voltage", ["V", "mV", "kV", "uV"]],
  ["current", ["A", "mA", "kA", "uA"]],
  ["frequency", ["Hz", "kHz", "MHz", "mHz"]],
  ["capacitance", ["F", "mF", "uF", "nF", "pF"]],
  ["inductance", ["H", "mH", "uH", "nH"]],
  ["resistance", ["ohm", "kohm", "mohm", "Mohm"]],
  ["power", ["W", "kW", "MW", "mW"]],
  ["energy", ["J", "mJ", "uJ", "kJ"]],
  ["time", ["s", "ms", "us", "ns", "min"]],
  ["angle", ["deg", "rad", "mrad"]],
  ["thermalResistance", ["K/W", "degC/W", "K/kW"]],
];

describe("parseQuantity agrees with the full mathjs bundle", () => {
  it.each(SPELLINGS)("%s", (dimension, units) => {
    fc.assert(
      fc.property(fc.double({ min: -1e9, max: 1e9, noNaN: true }), fc.constantFrom(...units), (number, unit) => {
        const text = `${number} ${unit}`;
        const ours = parseQuantity(text, { key: "x", dimension, displayUnit: SI_UNIT[dimension] });
        expect(ours.ok).toBe(true);
        const theirs = full.unit(text).toNumber(SI_UNIT[dimension]);
        expectClose(ours.ok ? ours.value : Number.NaN, theirs, { rel: 1e-14, abs: 1e-300 }, text);
      }),
      { numRuns: 50 },
    );
  });

  it("temperature, with its offset", () => {
    for (const text of ["25 degC", "298.15 K", "77 degF"]) {
      const ours = parseQuantity(text, { key: "t", dimension: "temperature", displayUnit: "degC" });
      expectClose(ours.ok ? ours.value : Number.NaN, full.unit(text).toNumber("degC"), { rel: 1e-12 }, text);
    }
  });
});

describe("formula unit arithmetic agrees with the full mathjs bundle", () => {
  const cases = [
    ["2.2 mH * 3 A / 10 us", "V"],
    ["48 V * 2.5 A", "W"],
    ["1 / (2 pi sqrt(1 mH * 10 uF))", "Hz"],
    ["sqrt(1 mH / 10 uF)", "ohm"],
    ["0.5 * 4.7 uF * (400 V)^2", "J"],
    ["230 V / 4.7 kohm", "A"],
    ["(150 degC - 40 degC) / 25 W", "K/W"],
  ] as const;

  it.each(cases)("%s", (expr, unit) => {
    const sheet = evaluateSheet([{ id: "f", calculator: "formula", inputs: { expr } }]);
    const block = sheet.blocks.f!;
    if (!block.ok) throw new Error(JSON.stringify(block.errors));
    const result = block.results.value as ScalarResult;
    expect(result.unit).toBe(unit);
    expectClose(result.value, full.evaluate(expr).toNumber(unit), { rel: 1e-12 }, expr);
  });
});
