import { describe, expect, it } from "vitest";
import { formatQuantity, scalar } from "~/lib/calc/format";

// SI prefixes p n µ m k M G and the space between number and unit follow
// BIPM, SI Brochure, 9th ed. (2019), Table 7 and §5.4.3 (numbers from memory) — published.
describe("formatQuantity", () => {
  it.each([
    [4.7e-6, "F", "4.70 µF"],
    [1591.549, "Hz", "1.59 kHz"],
    [48, "V", "48.0 V"],
    [400, "V", "400 V"],
    [0.7226, "A", "723 mA"],
    [2.2e-3, "H", "2.20 mH"],
    [10, "ohm", "10.0 Ω"],
    [3.3e-12, "F", "3.30 pF"],
    [4.7e-9, "F", "4.70 nF"],
    [2.5e6, "W", "2.50 MW"],
    [1.2e9, "Hz", "1.20 GHz"],
    [-43.94, "dB", "-43.9 dB"],
    [48.3426, "%", "48.3 %"],
    [0.05, "%", "0.0500 %"],
    [23.218, "deg", "23.2°"],
    [25, "degC", "25.0 °C"],
    [1.5, "K/W", "1.50 K/W"],
    [0.8, "", "0.800"],
  ])("%s %s → %s", (value, unit, expected) => {
    expect(formatQuantity(value, unit)).toBe(expected);
  });

  it("rounds into the next prefix rather than showing four digits", () => {
    expect(formatQuantity(999.7, "Hz")).toBe("1.00 kHz");
    expect(formatQuantity(0.0009999, "A")).toBe("1.00 mA");
  });

  it("never prefixes %, dB, degrees or °C, however large", () => {
    expect(formatQuantity(1500, "%")).toBe("1500 %");
    expect(formatQuantity(-120, "dB")).toBe("-120 dB");
    expect(formatQuantity(5000, "deg")).toBe("5000°");
    expect(formatQuantity(1500, "degC")).toBe("1500 °C");
  });

  it("shows zero, negative zero and NaN sensibly", () => {
    expect(formatQuantity(0, "V")).toBe("0 V");
    expect(formatQuantity(-0, "V")).toBe("0 V");
    expect(formatQuantity(Number.NaN, "V")).toBe("—");
  });

  it("honours the digits option and trimZeros", () => {
    expect(formatQuantity(1591.549, "Hz", { digits: 6 })).toBe("1.59155 kHz");
    expect(formatQuantity(1e6, "Hz", { trimZeros: true })).toBe("1 MHz");
    expect(formatQuantity(1.5e-3, "A", { digits: 4, trimZeros: true })).toBe("1.5 mA");
  });

  it("falls back to exponent form beyond the prefixes", () => {
    expect(formatQuantity(1e-15, "F")).toBe("1.00e-15 F");
    expect(formatQuantity(2e12, "W")).toBe("2.00e12 W");
  });
});

describe("scalar", () => {
  it("returns value, unit and the same display as formatQuantity", () => {
    expect(scalar(4.7e-6, "F")).toEqual({ value: 4.7e-6, unit: "F", display: "4.70 µF" });
    expect(scalar(1591.549, "Hz", 4).display).toBe("1.592 kHz");
  });

  it("turns −0 into 0 in the value too", () => {
    expect(Object.is(scalar(-0, "V").value, 0)).toBe(true);
  });
});

describe("formatQuantity with one significant figure", () => {
  it("writes the rounded number, not an exponent", () => {
    expect(formatQuantity(480, "V", { digits: 1 })).toBe("500 V");
    expect(formatQuantity(1500, "%", { digits: 1 })).toBe("2000 %");
  });
});
