/**
 * The one way Sinewright formats a quantity for people: engineering notation
 * with SI prefixes (p n µ m k M G), three significant figures by default.
 *
 * `unit` is always the SI unit a result carries (V, A, Hz, F, H, ohm, W, J, s,
 * deg, degC, K/W, %, dB, or "" for a pure number); the prefix is chosen here.
 * Percent, decibels, angles, temperatures and thermal resistances are never
 * prefixed: "5.00 %", "-43.9 dB", "30.0°", "25.0 °C", "1.50 K/W".
 */
import type { Dimension, ScalarResult } from "./types";

/**
 * The SI unit each dimension is stored in, as mathjs spells it ("" = pure number). Here rather
 * than in units.ts so that showing a value never loads the units engine.
 */
export const SI_UNIT: Record<Dimension, string> = {
  voltage: "V",
  current: "A",
  frequency: "Hz",
  capacitance: "F",
  inductance: "H",
  resistance: "ohm",
  power: "W",
  energy: "J",
  time: "s",
  angle: "deg",
  temperature: "degC",
  thermalResistance: "K/W",
  dimensionless: "",
};

const PREFIXES: { exponent: number; symbol: string }[] = [
  { exponent: -12, symbol: "p" },
  { exponent: -9, symbol: "n" },
  { exponent: -6, symbol: "µ" },
  { exponent: -3, symbol: "m" },
  { exponent: 0, symbol: "" },
  { exponent: 3, symbol: "k" },
  { exponent: 6, symbol: "M" },
  { exponent: 9, symbol: "G" },
];

/** Units that take SI prefixes. Everything else is shown with plain significant figures. */
const PREFIXABLE = new Set(["V", "A", "Hz", "F", "H", "ohm", "Ω", "W", "J", "s", "VA", "var", "C", "Wh"]);

/** How a unit is written beside a number. */
const UNIT_SYMBOL: Record<string, string> = { ohm: "Ω", deg: "°", degC: "°C" };

/** Minus sign used in displays: ASCII, so a copied value parses again. */
const MINUS = "-";

export interface FormatOptions {
  /** Significant figures (1–15). Default 3. */
  digits?: number;
  /** Drop trailing zeros ("1 MHz" rather than "1.00 MHz"): for exact figures such as allowed ranges. */
  trimZeros?: boolean;
}

function trim(numberText: string): string {
  const [mantissa, exponent] = numberText.split("e");
  const trimmed = mantissa!.includes(".") ? mantissa!.replace(/0+$/, "").replace(/\.$/, "") : mantissa!;
  return exponent === undefined ? trimmed : `${trimmed}e${exponent}`;
}

function clampDigits(digits: number | undefined): number {
  const d = Math.round(digits ?? 3);
  return Number.isFinite(d) ? Math.min(15, Math.max(1, d)) : 3;
}

/** Joins a number and a unit the way SI writes it; the degree sign sits against the number. */
function withUnit(numberText: string, prefix: string, unit: string): string {
  const symbol = UNIT_SYMBOL[unit] ?? unit;
  if (unit === "deg") return `${numberText}${symbol}`;
  const full = `${prefix}${symbol}`;
  return full === "" ? numberText : `${numberText} ${full}`;
}

/** Significant-figure rendering without a prefix; exponent form only for very large or small magnitudes. */
function plain(magnitude: number, digits: number): string {
  if (magnitude !== 0 && (magnitude >= 1e6 || magnitude < 1e-3)) {
    const [mantissa, exponent] = magnitude.toExponential(digits - 1).split("e");
    return `${mantissa}e${Number(exponent)}`;
  }
  return precise(magnitude, digits);
}

/** toPrecision without its exponent form: 1500 at 3 digits is "1500", not "1.50e+3". */
function precise(magnitude: number, digits: number): string {
  const text = magnitude.toPrecision(digits);
  return text.includes("e") ? String(Number(text)) : text;
}

/**
 * Formats `value` (in the SI unit `unit`) for display, e.g.
 * formatQuantity(4.7e-6, "F") → "4.70 µF", formatQuantity(0.05, "%") → "0.0500 %".
 * NaN shows as "—"; ±Infinity as "unbounded" (with no unit); −0 shows as 0.
 */
export function formatQuantity(value: number, unit: string, opts: FormatOptions = {}): string {
  const digits = clampDigits(opts.digits);
  const tidy = opts.trimZeros ? trim : (text: string) => text;
  if (typeof value !== "number" || Number.isNaN(value)) return "—";
  // Words, not a symbol: "∞ %" reads like a measured figure.
  if (!Number.isFinite(value)) return value > 0 ? "unbounded" : "unbounded (negative)";
  if (value === 0) return withUnit("0", "", unit);

  const sign = value < 0 ? MINUS : "";
  const magnitude = Math.abs(value);

  if (!PREFIXABLE.has(unit)) return withUnit(sign + tidy(plain(magnitude, digits)), "", unit);

  // Round to the requested significant figures first, so 999.7 becomes "1.00 k", not "1000".
  const rounded = Number(magnitude.toPrecision(digits));
  let exponent = Math.floor(Math.log10(rounded) / 3) * 3;
  // log10 of exact powers of ten can land a hair below the integer.
  if (rounded / 10 ** exponent >= 1000) exponent += 3;
  if (rounded / 10 ** exponent < 1) exponent -= 3;
  const prefix = PREFIXES.find((p) => p.exponent === exponent);
  if (!prefix) return withUnit(sign + tidy(plain(magnitude, digits)), "", unit);

  const scaled = rounded / 10 ** exponent;
  return withUnit(sign + tidy(precise(scaled, digits)), prefix.symbol, unit);
}

/** A scalar result with its display text: the form every calculator returns numbers in. */
export function scalar(value: number, unit: string, digits?: number): ScalarResult {
  const clean = Object.is(value, -0) ? 0 : value;
  return { value: clean, unit, display: formatQuantity(clean, unit, { digits }) };
}
