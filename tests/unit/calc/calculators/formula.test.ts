import * as reference from "mathjs";
import { describe, expect, it } from "vitest";
import { evaluateSheet } from "~/lib/calc/evaluate-sheet";
import type { ScalarResult } from "~/lib/calc/types";
import { expectClose } from "../../../support/tolerance";
import { refuse } from "./run-helpers";

/** Evaluates `expr` on a small sheet; tests cross-check it with the full mathjs bundle, the referenced values written in. */
function formulaValue(expr: string): ScalarResult {
  const sheet = evaluateSheet([
    { id: "hb1", calculator: "half-bridge", inputs: { vdc: "48 V" } },
    { id: "dc1", calculator: "dc-link", inputs: { p: "1 kW", vdc: "48 V", rippleVpp: "2 V" } },
    { id: "lc1", calculator: "lc-filter", inputs: { l: "1 mH", c: "10 uF", rLoad: "10 ohm", fsw: "20 kHz" } },
    { id: "out", calculator: "formula", inputs: { expr } },
  ]);
  const block = sheet.blocks.out!;
  if (!block.ok) throw new Error(JSON.stringify(block.errors));
  return block.results.value as ScalarResult;
}

describe("formula", () => {
  it("multiplies a reference, in SI", () => {
    const value = formulaValue("hb1.v1Rms * 2");
    const expected = reference.evaluate(`(2 * sqrt(2) / pi * 24 V) * 2`).toNumber("V");
    expect(value.unit).toBe("V");
    expectClose(value.value, expected, { rel: 1e-12 });
  });

  it("converts with `to` and shows the unit asked for, keeping the value in SI", () => {
    const value = formulaValue("dc1.c to uF");
    const expectedFarads = 1000 / (2 * Math.PI * 50 * 48 * 2);
    expect(value.unit).toBe("F");
    expectClose(value.value, expectedFarads, { rel: 1e-12 });
    expect(value.display).toBe(`${reference.format(expectedFarads * 1e6, { precision: 3 })} µF`);
  });

  it("combines quantities into a new dimension: V/Ω is a current", () => {
    const value = formulaValue("hb1.vrms / lc1.z0");
    expect(value.unit).toBe("A");
    expectClose(value.value, 2.4, { rel: 1e-12 });
  });

  it("keeps a bare reference as it is, unit and all", () => {
    expect(formulaValue("lc1.gainFswDb").unit).toBe("dB");
  });

  it("refuses an escape attempt as a field error on expr", () => {
    const errors = refuse("formula", { expr: "import({}, {override: true})" });
    expect(errors).toEqual([{ field: "expr", message: expect.stringMatching(/^expr: the function "import" is not allowed/) }]);
  });

  it("refuses references outside a sheet", () => {
    expect(refuse("formula", { expr: "hb1.vrms" })[0]!.message).toMatch(/no block "hb1"/);
  });

  it("computes plain arithmetic with units on its own", () => {
    const sheet = evaluateSheet([{ id: "f", calculator: "formula", inputs: { expr: "230 V * 2 pi * 50 Hz * 10 uF" } }]);
    const block = sheet.blocks.f!;
    expect(block.ok && (block.results.value as ScalarResult).unit).toBe("A");
  });
});
