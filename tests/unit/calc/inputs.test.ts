import { describe, expect, it } from "vitest";
import { parseInputs, type InputContext, type ParseInputsResult } from "~/lib/calc/inputs";
import { getCalculator } from "~/lib/calc/registry";
import type { Calculator, FieldError, ParsedInputs } from "~/lib/calc/types";

function calculator(id: string): Calculator {
  const found = getCalculator(id);
  if (!found) throw new Error(`no calculator ${id}`);
  return found;
}

function values(result: ParseInputsResult): ParsedInputs {
  if (!result.ok) throw new Error(`expected ok, got ${JSON.stringify(result.errors)}`);
  return result.values;
}

function errors(result: ParseInputsResult): FieldError[] {
  if (result.ok) throw new Error(`expected errors, got ${JSON.stringify(result.values)}`);
  return result.errors;
}

const lc = calculator("lc-filter");
const limits = calculator("harmonic-limits");

// Invented demo results for reference resolution.
const context: InputContext = {
  blockResults: {
    qs1: {
      v1Rms: { value: 43.2, unit: "V", display: "43.2 V" },
      thd: { value: 29, unit: "%", display: "29.0 %" },
      harmonics: [
        { n: 1, peak: 61.1, rms: 43.2, percent: 100 },
        { n: 3, peak: 7.9, rms: 5.6, percent: 13 },
      ],
    },
    load: {
      currents: [
        { n: 1, peak: 14.1, rms: 10, percent: 100 },
        { n: 3, peak: 1.41, rms: 1, percent: 10 },
      ],
    },
  },
  blockOutputs: {
    qs1: [{ key: "harmonics", label: "Harmonics", kind: "harmonics" }],
    load: [{ key: "currents", label: "Current harmonics", kind: "harmonics", unit: "A" }],
  },
};

describe("parseInputs: quantities, defaults and optional inputs", () => {
  it("converts typed quantities to SI and applies the default when absent", () => {
    const parsed = values(parseInputs(lc, { l: "1 mH", c: "10 uF", fsw: "20 kHz" }));
    expect(parsed).toEqual({ l: 1e-3, c: 1e-5, fsw: 20e3, f: 50 });
  });

  it("leaves optional inputs out when absent, null or blank", () => {
    const parsed = values(parseInputs(lc, { l: "1 mH", c: "10 uF", fsw: "20 kHz", rLoad: null, vout: "  " }));
    expect("rLoad" in parsed || "vout" in parsed).toBe(false);
  });

  it("says a required input is missing, with an example", () => {
    expect(errors(parseInputs(lc, { c: "10 uF", fsw: "20 kHz" }))).toEqual([{ field: "l", message: "l (Inductance L) is required, e.g. 2.2 mH" }]);
  });

  it("names unknown inputs", () => {
    const found = errors(parseInputs(lc, { l: "1 mH", c: "10 uF", fsw: "20 kHz", inductance: "2 mH" }));
    expect(found).toHaveLength(1);
    expect(found[0]!.field).toBe("inductance");
    expect(found[0]!.message).toMatch(/^unknown input "inductance"; lc-filter takes l, c, rLoad, fsw, f, vout$/);
  });

  it("reports every bad field at once", () => {
    const found = errors(parseInputs(lc, { l: "1 mF", c: "-1 uF", fsw: { x: 1 } }));
    expect(found.map((e) => e.field)).toEqual(["l", "c", "fsw"]);
    expect(found[0]!.message).toMatch(/l must be an inductance; got 1 mF/);
    expect(found[2]!.message).toMatch(/fsw must be a number with a unit, e.g. 20 kHz; got an object/);
  });

  it("refuses inputs that are not an object", () => {
    for (const raw of [null, 42, "l=1mH", [1, 2]]) {
      expect(errors(parseInputs(lc, raw))[0]!.field).toBe("inputs");
    }
  });

  it("checks a choice against its options", () => {
    const found = errors(parseInputs(calculator("half-bridge"), { vdc: "48 V", mode: "full" }));
    expect(found).toEqual([{ field: "mode", message: 'mode must be one of split-capacitor, centre-tapped; got "full"' }]);
  });
});

describe("parseInputs: quantity lists", () => {
  const stepped = calculator("stepped-wave");
  const angles = (raw: unknown) => parseInputs(stepped, { vdc: "48 V", angles: raw });

  it.each([
    ["a comma-separated string", "10 deg, 20°, 30 deg"],
    ["a JSON array of strings typed as text", '["10 deg", "20 deg", "30 deg"]'],
    ["an array of mixed spellings", ["10 deg", "20°", `${(30 * Math.PI) / 180} rad`]],
  ])("accepts %s", (_what, raw) => {
    const list = values(angles(raw)).angles as number[];
    expect(list.map((a) => Math.round(a * 1e9) / 1e9)).toEqual([10, 20, 30]);
  });

  it("names the bad item", () => {
    expect(errors(angles("10 deg, 5 V"))[0]!.message).toBe("angles item 2 must be an angle; got 5 V");
    expect(errors(angles("10 deg, 95 deg"))[0]!.message).toMatch(/^angles item 2 must be at least 0° and below 90°; got 95°/);
  });

  it("refuses a broken JSON list and a non-list", () => {
    expect(errors(angles("[10, 20"))[0]!.message).toMatch(/could not read the list/);
    expect(errors(angles({ a: 1 }))[0]!.message).toMatch(/angles must be a list/);
  });
});

describe("parseInputs: spectra", () => {
  const check = (spectrum: unknown, standard = "ieee519-voltage", ctx?: InputContext) =>
    parseInputs(limits, { standard, busVoltage: "400 V", spectrum }, ctx);

  it("reads numbers, percent strings and JSON text, sorted by order", () => {
    const parsed = values(check('[{"n": 5, "value": "3.1 %"}, {"n": 3, "value": 2.5}]'));
    expect(parsed.spectrum).toEqual([
      { n: 3, value: 2.5 },
      { n: 5, value: 3.1 },
    ]);
  });

  it("converts amperes to percent of the fundamental for IEEE tables", () => {
    const parsed = values(check([{ n: 1, value: "10 A" }, { n: 3, value: "0.5 A" }], "ieee519-current"));
    expect(parsed.spectrum).toEqual([
      { n: 1, value: 100 },
      { n: 3, value: 5 },
    ]);
  });

  it("converts percent to amperes for IEC Class A when the fundamental is given", () => {
    const parsed = values(check([{ n: 1, value: "8 A" }, { n: 3, value: "10 %" }], "iec61000-3-2-a"));
    expect(parsed.spectrum).toEqual([
      { n: 1, value: 8 },
      { n: 3, value: 0.8 },
    ]);
  });

  it("asks for the fundamental when a conversion needs it", () => {
    expect(errors(check([{ n: 3, value: "0.5 A" }], "ieee519-current"))[0]!.message).toMatch(/also give the fundamental \(n = 1\) in amperes/);
    expect(errors(check([{ n: 3, value: "10 %" }], "iec61000-3-2-a"))[0]!.message).toMatch(/also give the fundamental/);
  });

  it("refuses duplicate orders, bad orders and negative values", () => {
    expect(errors(check([{ n: 3, value: 1 }, { n: 3, value: 2 }]))[0]!.message).toMatch(/order 3 is listed twice/);
    expect(errors(check([{ n: 2.5, value: 1 }]))[0]!.message).toMatch(/n must be a whole harmonic order/);
    expect(errors(check([{ n: 3, value: -1 }]))[0]!.message).toMatch(/must be a non-negative number/);
    expect(errors(check("3: 2.5 %"))[0]!.message).toMatch(/must be a list of harmonics/);
  });

  it("resolves =block.harmonics as percent of the fundamental, and says where it came from", () => {
    const result = check("=qs1.harmonics", "ieee519-voltage", context);
    expect(values(result).spectrum).toEqual([
      { n: 1, value: 100 },
      { n: 3, value: 13 },
    ]);
    expect(result.ok && result.warnings).toEqual(["spectrum is taken from qs1.harmonics: voltage harmonics, in % of the fundamental, listed to order 3."]);
  });

  it("takes amperes from a current spectrum for IEC, and refuses a voltage spectrum", () => {
    expect(values(check("=load.currents", "iec61000-3-2-a", context)).spectrum).toEqual([
      { n: 1, value: 10 },
      { n: 3, value: 1 },
    ]);
    expect(errors(check("=qs1.harmonics", "iec61000-3-2-a", context))[0]!.message).toMatch(/limits harmonic currents, and qs1.harmonics are voltage harmonics/);
  });

  it("needs a sheet for a reference", () => {
    expect(errors(check("=qs1.harmonics"))[0]!.message).toMatch(/work only inside a calc sheet/);
  });
});

describe("parseInputs: = expressions in quantity inputs", () => {
  const halfBridge = calculator("half-bridge");

  it("evaluates the expression and checks its dimension like typed text", () => {
    expect(values(parseInputs(halfBridge, { vdc: "=qs1.v1Rms * 2" }, context)).vdc).toBeCloseTo(86.4, 12);
    expect(errors(parseInputs(lc, { l: "1 mH", c: "=qs1.v1Rms", fsw: "20 kHz" }, context))[0]!.message).toBe("c must be a capacitance; got 43.2 V");
  });

  it("checks the range of the result", () => {
    expect(errors(parseInputs(halfBridge, { vdc: "=qs1.v1Rms * -1" }, context))[0]!.message).toBe("vdc must be above 0 V and at most 1 MV; got -43.2 V");
  });

  it("refuses a bare-number result for a dimensioned input, as for typed text", () => {
    expect(errors(parseInputs(halfBridge, { vdc: "=24 * 2" }, context))[0]!.message).toMatch(/^vdc: 48 has no unit: did you mean 48 V\?/);
  });

  it("takes a referenced percent as a fraction for a pure-number input", () => {
    expect(values(parseInputs(halfBridge, { vdc: "48 V", mode: "centre-tapped", turnsRatio: "=qs1.thd" }, context)).turnsRatio).toBeCloseTo(0.29, 12);
  });

  it("names a missing block, and refuses references outside a sheet", () => {
    expect(errors(parseInputs(halfBridge, { vdc: "=qs9.v1Rms" }, context))[0]!.message).toBe('vdc: there is no block "qs9" with results on this sheet');
    expect(errors(parseInputs(halfBridge, { vdc: "=qs1.v1Rms" }))[0]!.message).toMatch(/work only inside a calc sheet/);
  });
});

describe("parseInputs never throws", () => {
  it("turns a hostile object into a field error", () => {
    const hostile = new Proxy(
      {},
      {
        ownKeys: () => {
          throw new Error("no keys for you");
        },
      },
    );
    const result = parseInputs(lc, hostile);
    expect(result.ok).toBe(false);
  });
});
