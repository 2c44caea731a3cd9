import { describe, expect, it } from "vitest";
import { parseQuantity, type QuantitySpec } from "~/lib/calc/units";
import { expectClose } from "../../support/tolerance";

// Reference for the unit factors below: SI prefixes and units as defined in
// BIPM, The International System of Units (SI Brochure), 9th ed. (2019), Table 7 (prefixes; table number from memory) — published.
const spec = (over: Partial<QuantitySpec> & Pick<QuantitySpec, "dimension">): QuantitySpec => ({
  key: "x",
  displayUnit: "",
  ...over,
});
const voltage = spec({ key: "vdc", dimension: "voltage", displayUnit: "V", min: 0, minExclusive: true });
const capacitance = spec({ key: "c", dimension: "capacitance", displayUnit: "uF" });
const frequency = spec({ key: "f", dimension: "frequency", displayUnit: "Hz", min: 1, max: 1e6 });
const angle = spec({ key: "alpha", dimension: "angle", displayUnit: "deg" });

function value(text: string | number, s: QuantitySpec): number {
  const parsed = parseQuantity(text, s);
  if (!parsed.ok) throw new Error(`expected "${text}" to parse, got: ${parsed.message}`);
  return parsed.value;
}

function message(text: string | number, s: QuantitySpec): string {
  const parsed = parseQuantity(text, s);
  if (parsed.ok) throw new Error(`expected "${text}" to be refused, got ${parsed.value}`);
  return parsed.message;
}

describe("parseQuantity: the spellings engineers type", () => {
  it.each([
    ["48 V", voltage, 48],
    ["0.12 kV", voltage, 120],
    ["4.7 uF", capacitance, 4.7e-6],
    ["4.7µF", capacitance, 4.7e-6], // U+00B5 micro sign
    ["4.7μF", capacitance, 4.7e-6], // U+03BC Greek small mu
    ["4.7 μF", capacitance, 4.7e-6],
    ["6800 nF", capacitance, 6.8e-6],
    ["1e-6 F", capacitance, 1e-6],
    ["2.2mH", spec({ dimension: "inductance", displayUnit: "mH" }), 2.2e-3],
    ["20 kHz", frequency, 20e3],
    ["20kHz", frequency, 20e3],
    ["30 deg", angle, 30],
    ["30°", angle, 30],
    ["1.5 K/W", spec({ dimension: "thermalResistance", displayUnit: "K/W" }), 1.5],
    ["1.5 °C/W", spec({ dimension: "thermalResistance", displayUnit: "K/W" }), 1.5],
    ["25 degC", spec({ dimension: "temperature", displayUnit: "degC" }), 25],
    ["25 °C", spec({ dimension: "temperature", displayUnit: "degC" }), 25],
    ["10 ohm", spec({ dimension: "resistance", displayUnit: "ohm" }), 10],
    ["10 Ω", spec({ dimension: "resistance", displayUnit: "ohm" }), 10], // U+03A9 Greek capital omega
    ["10 Ω", spec({ dimension: "resistance", displayUnit: "ohm" }), 10], // U+2126 ohm sign
    ["4.7 kΩ", spec({ dimension: "resistance", displayUnit: "ohm" }), 4700],
    ["0.8", spec({ dimension: "dimensionless" }), 0.8],
    ["80 %", spec({ dimension: "dimensionless" }), 0.8],
    ["−5 V", spec({ dimension: "voltage", displayUnit: "V" }), -5], // U+2212 minus sign
  ])("%s", (text, s, expected) => {
    expectClose(value(text, s), expected, { rel: 1e-12 }, String(text));
  });

  it("4.7 uF and 4700 nF are the same capacitance", () => {
    expect(value("4.7 uF", capacitance)).toBe(value("4700 nF", capacitance));
    expect(value("4.7µF", capacitance)).toBe(value("4.7e-6 F", capacitance));
  });

  it("angles come out in degrees: π/6 rad is 30°", () => {
    // 1 rad = 180/π degrees — definition (SI Brochure, 9th ed., Table 8; table number from memory) — published.
    expectClose(value(`${Math.PI / 6} rad`, angle), 30, { rel: 1e-12 });
  });

  it("a thermodynamic temperature in kelvin comes out in °C (T/K − 273.15)", () => {
    // 0 °C = 273.15 K — SI Brochure, 9th ed., §2.3.1 (section from memory) — published.
    expectClose(value("373.15 K", spec({ dimension: "temperature", displayUnit: "degC" })), 100, { rel: 1e-12 });
  });

  it("a bare number for a dimensioned input is refused, naming its readings (issue #16 item 5)", () => {
    expect(message("48", voltage)).toMatch(/48 has no unit: did you mean 48 V\?/);
    expect(message(48, voltage)).toMatch(/48 has no unit: did you mean 48 V\?/);
    expect(message("4.7", capacitance)).toMatch(/4.7 has no unit: did you mean .*4.7 µF/);
  });
});

describe("parseQuantity: clear refusals", () => {
  it("names the input and the dimension expected", () => {
    expect(message("5 V", spec({ key: "alpha", dimension: "angle", displayUnit: "deg" }))).toBe("alpha must be an angle; got 5 V");
    expect(message("2 mH", capacitance)).toMatch(/^c must be a capacitance; got 2 mH/);
    expect(message("1.5 A", spec({ key: "pf", dimension: "dimensionless" }))).toBe("pf must be a pure number; got 1.5 A");
  });

  it("gives the allowed range in engineering notation", () => {
    expect(message("0 Hz", frequency)).toBe("f must be between 1 Hz and 1 MHz; got 0 Hz");
    expect(message("2 MHz", frequency)).toBe("f must be between 1 Hz and 1 MHz; got 2 MHz");
    expect(message("-5 V", voltage)).toBe("vdc must be greater than 0 V; got -5 V");
  });

  it("refuses non-finite values with the range", () => {
    expect(message("1e400 V", voltage)).toMatch(/^vdc must be greater than 0 V; got unbounded/);
    expect(message("Infinity", frequency)).toMatch(/^f must be between 1 Hz and 1 MHz/);
    expect(message("NaN", frequency)).toBe("f must be between 1 Hz and 1 MHz; got not a number");
    expect(message(Number.NaN, voltage)).toMatch(/^vdc must be greater than 0 V/);
  });

  it("says what was expected, with an example, for unreadable text", () => {
    expect(message("abc", voltage)).toBe('vdc: could not read "abc" as a voltage; type a number and a unit, e.g. 48 V');
    expect(message("V", voltage)).toMatch(/could not read "V" as a voltage/);
    expect(message("4,7 uF", capacitance)).toMatch(/e\.g\. 4\.7 uF/);
    expect(message("", voltage)).toMatch(/could not read/);
  });

  it("checks whole numbers where the input needs one", () => {
    expect(message("2.5", spec({ key: "hmax", dimension: "dimensionless", integer: true }))).toBe("hmax must be a whole number; got 2.5");
  });
});
