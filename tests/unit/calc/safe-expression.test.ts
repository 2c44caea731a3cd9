import { describe, expect, it } from "vitest";
import { checkExpression, evaluateExpression, MAX_EXPRESSION_DEPTH, MAX_EXPRESSION_LENGTH } from "~/lib/calc/safe-expression";
import { math, type MathUnit } from "~/lib/calc/units";
import type { Results } from "~/lib/calc/types";
import { expectClose } from "../../support/tolerance";

// Invented demo results; the checks below are about the evaluator, not the numbers.
const sheet: Record<string, Results> = {
  qs1: {
    v1Rms: { value: 43.2, unit: "V", display: "43.2 V" },
    thd: { value: 48.3, unit: "%", display: "48.3 %" },
    harmonics: [{ n: 1, peak: 61.1, rms: 43.2, percent: 100 }],
  },
  dc1: { c: { value: 4.7e-6, unit: "F", display: "4.70 µF" } },
};

function refused(text: string): string {
  const outcome = evaluateExpression(text, sheet);
  expect(outcome.ok, `"${text.slice(0, 40)}" should be refused`).toBe(false);
  return outcome.ok ? "" : outcome.message;
}

function quantity(text: string) {
  const outcome = evaluateExpression(text, sheet);
  if (!outcome.ok) throw new Error(outcome.message);
  if (outcome.kind !== "quantity") throw new Error("expected a quantity");
  return outcome;
}

describe("evaluateExpression: what is allowed", () => {
  it("multiplies a reference and keeps its unit", () => {
    const out = quantity("qs1.v1Rms * 1.1");
    expect(math.isUnit(out.quantity)).toBe(true);
    expectClose((out.quantity as MathUnit).toNumber("V"), 47.52, { rel: 1e-12 });
  });

  it("converts with `to`, and reports the unit asked for", () => {
    const out = quantity("dc1.c to uF");
    expect(out.targetUnit).toBe("uF");
    expectClose((out.quantity as MathUnit).toNumber("uF"), 4.7, { rel: 1e-12 });
  });

  it("turns a percent reference into a fraction in arithmetic", () => {
    expectClose(quantity("qs1.thd * 2").quantity as number, 0.966, { rel: 1e-12 });
  });

  it("evaluates the allowed functions with units: sin(30 deg) = 1/2", () => {
    expectClose(quantity("sin(30 deg)").quantity as number, 0.5, { rel: 1e-12 });
    expectClose(quantity("sin(30°)").quantity as number, 0.5, { rel: 1e-12 });
    expectClose((quantity("2 * 4.7 µF").quantity as MathUnit).toNumber("uF"), 9.4, { rel: 1e-12 });
    expectClose((quantity("sqrt(16 V^2)").quantity as MathUnit).toNumber("V"), 4, { rel: 1e-12 });
    expectClose((quantity("max(2 V, 3 V)").quantity as MathUnit).toNumber("V"), 3, { rel: 1e-12 });
  });

  it("returns a non-scalar reference untouched when it stands alone", () => {
    const outcome = evaluateExpression("=qs1.harmonics", sheet);
    expect(outcome.ok && outcome.kind === "result" && outcome.value).toEqual(sheet.qs1!.harmonics);
  });
});

describe("evaluateExpression: what is refused, and why", () => {
  it.each([
    ["import({}, {override:true})", /function "import" is not allowed/],
    ['createUnit("x")', /function "createUnit" is not allowed/],
    ['evaluate("1")', /function "evaluate" is not allowed/],
    ['parse("1")', /function "parse" is not allowed/],
    ['compile("1")', /function "compile" is not allowed/],
    ['simplify("x")', /function "simplify" is not allowed/],
    ['derivative("x^2", "x")', /function "derivative" is not allowed/],
    ["resolve(1)", /function "resolve" is not allowed/],
    ["simplify", /unknown name "simplify"/],
    ["f(x)=x", /defining functions is not allowed/],
    ["a=1", /assignment is not allowed/],
    ["qs1.v1Rms = 2", /assignment is not allowed/],
    ['cos.constructor("return process")(1)', /only the listed functions may be called|property access/],
    ['cos.constructor("return process")()', /could not read the expression/],
    ["[].map.constructor", /property access is only allowed as blockId.output/],
    ['"".constructor', /property access is only allowed as blockId.output/],
    ["this", /unknown name "this"/],
    ["qs1.__proto__", /property access is only allowed/],
    ["qs1.constructor", /block "qs1" has no output "constructor"/],
    ["qs1['v1Rms']", /property access is only allowed/],
    ["1; 2", /only one expression is allowed/],
    ["[1, 2]", /lists, objects, ranges and indexing are not allowed/],
    ["{a: 1}", /lists, objects, ranges and indexing are not allowed/],
    ['"text"', /only numbers and units are allowed/],
    ["2 mod 3", /operator "mod" is not allowed/],
    ["2 == 2", /operator "==" is not allowed/],
    ["true ? 1 : 2", /not allowed/],
    ["process", /unknown name "process"/],
  ])("%s", (text, expected) => {
    expect(refused(text)).toMatch(expected);
  });

  it(`refuses nesting deeper than ${MAX_EXPRESSION_DEPTH} levels`, () => {
    const deep = "(".repeat(MAX_EXPRESSION_DEPTH + 10) + "1" + ")".repeat(MAX_EXPRESSION_DEPTH + 10);
    expect(deep.length).toBeLessThanOrEqual(MAX_EXPRESSION_LENGTH);
    expect(refused(deep)).toMatch(/nested too deeply/);
  });

  it(`refuses input longer than ${MAX_EXPRESSION_LENGTH} characters before parsing it`, () => {
    expect(refused("1+".repeat(400) + "1")).toMatch(/too long \(801 characters; the limit is 500\)/);
    expect(refused("(".repeat(100_000))).toMatch(/too long/);
  });

  it("names a missing block or output", () => {
    expect(refused("qs9.v1Rms")).toBe('there is no block "qs9" with results on this sheet');
    expect(refused("qs1.nope")).toMatch(/block "qs1" has no output "nope"; it has v1Rms, thd, harmonics/);
  });

  it("refuses a list in arithmetic, mismatched units and division by zero", () => {
    expect(refused("qs1.harmonics * 2")).toMatch(/qs1.harmonics is a list/);
    expect(refused("5 V + 3 A")).toBe("cannot add 3 A (a current) to 5 V (a voltage): they are different kinds of quantity; check the units");
    expect(refused("1/0")).toMatch(/finite/);
  });

  it("leaves no side effect behind", () => {
    for (const attempt of ['createUnit("blorp")', "import({sqrt: 1}, {override: true})", "sqrt = 1", "pi = 3"]) refused(attempt);
    expect(math.Unit.isValuelessUnit("blorp")).toBe(false);
    expectClose(quantity("sqrt(4)").quantity as number, 2, { rel: 0 });
    expectClose(quantity("pi").quantity as number, Math.PI, { rel: 0 });
  });

  it("refuses the disabled functions even when called directly on the instance", () => {
    expect(() => (math as unknown as { import: (o: object) => void }).import({ x: 1 })).toThrow(/not available/);
    expect(() => (math as unknown as { createUnit: (n: string) => void }).createUnit("blorp")).toThrow(/not available/);
  });
});

describe("checkExpression", () => {
  it("lists the references without evaluating", () => {
    const checked = checkExpression("sqrt(hb1.vrms^2 - hb1.v1Rms^2) / dc1.c");
    expect(checked.ok && checked.references).toEqual([
      { block: "hb1", output: "vrms" },
      { block: "hb1", output: "v1Rms" },
      { block: "dc1", output: "c" },
    ]);
  });

  it("refuses non-text", () => {
    expect(checkExpression(42)).toEqual({ ok: false, message: "an expression must be text" });
  });
});
