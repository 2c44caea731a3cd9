import { describe, expect, it } from "vitest";
import { fieldError } from "~/lib/calc/errors";
import { scalar } from "~/lib/calc/format";
import { runCalculator } from "~/lib/calc/run";
import type { Calculator, ComputeOutcome } from "~/lib/calc/types";

/** A stand-in calculator whose compute the test controls. */
function stub(compute: () => ComputeOutcome): Calculator {
  return {
    id: "stub",
    title: "Stub",
    summary: "Test double",
    description: "",
    inputs: [],
    outputs: [
      { key: "good", label: "Good output", kind: "scalar", unit: "V" },
      { key: "bad", label: "Bad output", kind: "scalar", unit: "V" },
      { key: "plot", label: "Plot", kind: "bode" },
    ],
    formulas: [],
    conventions: [],
    sources: [],
    cautions: [],
    compute,
  };
}

describe("runCalculator keeps NaN and ±Infinity out of results", () => {
  it("omits a non-finite scalar and says which", () => {
    const outcome = runCalculator(stub(() => ({ results: { good: scalar(1, "V"), bad: scalar(Number.NaN, "V") }, warnings: [] })), {});
    expect(outcome).toEqual({ ok: true, results: { good: scalar(1, "V") }, warnings: ["Bad output is not shown: it is not a finite number for these inputs."] });
  });

  it("omits a plot with an infinite point", () => {
    const outcome = runCalculator(stub(() => ({ results: { plot: [{ f: 1, gainDb: 0 }, { f: 2, gainDb: Infinity }] }, warnings: [] })), {});
    expect(outcome.ok && Object.keys(outcome.results)).toEqual([]);
  });

  it("turns a CalculationError into field errors", () => {
    const outcome = runCalculator(stub(() => { throw fieldError("x", "x must be below y"); }), {});
    expect(outcome).toEqual({ ok: false, errors: [{ field: "x", message: "x must be below y" }] });
  });

  it("turns any other throw into a field error instead of breaking the sheet", () => {
    const outcome = runCalculator(stub(() => { throw new TypeError("boom"); }), {});
    expect(outcome).toEqual({ ok: false, errors: [{ field: "calculation", message: "Stub could not compute these inputs: boom" }] });
  });
});
