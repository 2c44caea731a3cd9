import { describe, expect, it } from "vitest";
import { parseInputs } from "~/lib/calc/inputs";
import { calculators, catalogue, getCalculator } from "~/lib/calc/registry";
import { ENGINE_VERSION } from "~/lib/calc/version";

describe("registry", () => {
  it("lists every calculator, each id once", () => {
    expect(calculators.map((c) => c.id).sort()).toEqual(
      ["dc-link", "formula", "half-bridge", "harmonic-limits", "lc-filter", "quasi-square", "six-step", "spwm", "stepped-wave", "switch-stress", "three-phase-pwm", "harmonic-elimination", "inductor-ripple", "losses-thermal", "lcl-filter", "dead-time"].sort(),
    );
  });

  it("finds a calculator by id and nothing for an unknown one", () => {
    expect(getCalculator("lc-filter")?.title).toBe("LC output filter");
    expect(getCalculator("nope")).toBeUndefined();
    expect(getCalculator("constructor")).toBeUndefined();
  });

  it("has a semver engine version", () => {
    expect(ENGINE_VERSION).toMatch(/^\d+\.\d+\.\d+$/);
  });

  it("gives a JSON-serialisable catalogue with the engine version", () => {
    const data = catalogue();
    expect(JSON.parse(JSON.stringify(data))).toEqual(data);
    expect(data.engineVersion).toBe(ENGINE_VERSION);
    expect(data.calculators).toHaveLength(calculators.length);
  });

  it.each(calculators.map((c) => [c.id, c] as const))("%s documents itself and its inputs are consistent", (_id, calculator) => {
    expect(calculator.summary.length).toBeGreaterThan(10);
    expect(calculator.sources.length).toBeGreaterThan(0);
    expect(calculator.cautions.length).toBeGreaterThan(0);
    const keys = calculator.inputs.map((s) => s.key);
    expect(new Set(keys).size).toBe(keys.length);
    const outputs = calculator.outputs.map((o) => o.key);
    expect(new Set(outputs).size).toBe(outputs.length);
    // Every declared default must itself be a valid input.
    for (const spec of calculator.inputs) {
      if (spec.default === undefined) continue;
      const single = parseInputs({ ...calculator, inputs: [spec] }, { [spec.key]: spec.default });
      expect(single.ok, `${calculator.id}.${spec.key} default "${spec.default}"`).toBe(true);
    }
  });

  it("every calculator whose results guide hardware carries the lethal-voltage caution", () => {
    for (const calculator of calculators.filter((c) => !["formula", "harmonic-limits"].includes(c.id))) {
      expect(calculator.cautions.join(" "), calculator.id).toMatch(/voltages that can kill|lethal/i);
    }
  });
});
