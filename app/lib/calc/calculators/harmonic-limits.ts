/**
 * Harmonic spectrum against a published limit table: one row per harmonic order
 * (value, limit, pass, margin), the spectrum's THD against the table's total
 * limit where it has one, and an overall verdict with its source.
 *
 * Tables (app/lib/standards):
 * - IEEE Std 519-2014 Table 1: voltage at the PCC; individual and THD limits by bus voltage.
 * - IEEE Std 519-2014 Table 2: current, 120 V–69 kV, Isc/IL < 20 only; even orders
 *   25 % of the odd limits; TDD 5 %.
 * - IEC 61000-3-2 Class A: amperes, orders 2–40; no total limit.
 * - IEEE Std 1547-2018 §7.3 (from memory, unverified): odd orders and TRD 5 %.
 *
 *   THD = √(Σ_{n=2}^{H} V_n²) / V_1,  H = 50 (IEEE) or 40 (IEC).
 *
 * IEEE 519's current limits are in % of the maximum demand current IL (TDD);
 * here they are compared with % of the spectrum's fundamental. That equals TDD at
 * full load and is conservative below it (the fundamental is then smaller than IL).
 *
 * No verdict is given (`pass` is left out, and a note says why) when:
 * - the spectrum stops short of the table's range (IEEE 519: order 50; IEC
 *   61000-3-2: order 40) — a truncated spectrum under-counts THD; a referenced
 *   spectrum reaches its source's hmax, a typed one its highest listed order or
 *   `listedTo`; this is refused as a field error saying what to raise;
 * - the spectrum has interharmonics (non-integer orders, e.g. from an
 *   asynchronous carrier): the tables do not limit them; they are listed and
 *   totalled on their own, never folded into THD or left unmentioned;
 * - the table's rows are from memory (IEEE 1547): the rows are informative only.
 * A voltage spectrum given to a current table (or the reverse) is refused by
 * dimension: current harmonics depend on the load.
 *
 * Every verdict is an engineering estimate: compliance is established by
 * accredited testing and the utility's interconnection rules.
 */
import { fieldError } from "../errors";
import { scalar } from "../format";
import { IEC61000_3_2_CLASS_A, IEC61000_3_2_CLASS_A_ORIGIN, IEC61000_3_2_HIGHEST_ORDER, IEC61000_3_2_MAX_INPUT_CURRENT } from "../../standards/iec61000-3-2";
import {
  IEEE519_CURRENT_LIMITS_BELOW_20,
  IEEE519_HIGHEST_ORDER,
  IEEE519_TABLE_2_ORIGIN,
  IEEE519_TABLE_2_VOLTAGE_RANGE,
  IEEE519_TDD_BELOW_20,
  ieee519VoltageRow,
} from "../../standards/ieee519";
import { IEEE1547_HIGHEST_ORDER, IEEE1547_ODD_LIMITS, IEEE1547_ORIGIN, IEEE1547_TRD } from "../../standards/ieee1547";
import { tableLimitAt, type TableOrigin } from "../../standards/types";
import type { Calculator, ChoiceInputSpec, LimitRow, QuantityInputSpec, Results, SpectrumInputSpec, SpectrumLine, StandardSource } from "../types";
import { readChoice, readQuantity } from "./shared-inputs";
import { VERDICT_NOTE } from "../verdict-note";

const standardInput: ChoiceInputSpec = {
  key: "standard",
  label: "Limit table",
  description: "Which published limits to check against.",
  kind: "choice",
  options: [
    { value: "ieee519-voltage", label: "IEEE Std 519-2014 Table 1 — voltage at the PCC" },
    { value: "ieee519-current", label: "IEEE Std 519-2014 Table 2 — current, 120 V–69 kV" },
    { value: "iec61000-3-2-a", label: "IEC 61000-3-2 Class A — equipment ≤ 16 A per phase" },
    { value: "ieee1547", label: "IEEE Std 1547-2018 §7.3 — DER current (from memory, unverified: informative only, no verdict)" },
  ],
  default: "ieee519-voltage",
};

const busVoltageInput: QuantityInputSpec = {
  key: "busVoltage",
  label: "Bus voltage at the PCC",
  description: "Nominal system voltage at the point of common coupling; needed for IEEE 519 voltage limits.",
  kind: "quantity",
  dimension: "voltage",
  displayUnit: "V",
  min: 0,
  minExclusive: true,
  max: 2e6,
  optional: true,
};

const iscIlInput: QuantityInputSpec = {
  key: "iscIl",
  label: "Isc/IL",
  description: "Short-circuit current at the PCC divided by the maximum demand load current; needed for IEEE 519 current limits.",
  kind: "quantity",
  dimension: "dimensionless",
  displayUnit: "",
  min: 0,
  minExclusive: true,
  max: 1e9,
  optional: true,
};

const listedToInput: QuantityInputSpec = {
  key: "listedTo",
  label: "Spectrum complete to order",
  description:
    "For a typed spectrum: the highest order it accounts for, orders not listed up to it being zero (default: the highest order listed). A referenced spectrum reaches its source block's hmax.",
  kind: "quantity",
  dimension: "dimensionless",
  displayUnit: "",
  min: 1,
  max: 1000,
  integer: true,
  optional: true,
};

const spectrumInput: SpectrumInputSpec = {
  key: "spectrum",
  label: "Harmonic spectrum",
  description:
    'Harmonics as [{"n": 3, "value": "2.1 %"}, …] or a reference such as =qs1.harmonics. IEEE tables take % of the fundamental; IEC Class A takes amperes RMS.',
  kind: "spectrum",
  valueUnit: "%",
  valueUnitByChoice: { input: "standard", units: { "iec61000-3-2-a": "A" } },
  quantityByChoice: {
    input: "standard",
    quantities: { "ieee519-voltage": "voltage", "ieee519-current": "current", "iec61000-3-2-a": "current", ieee1547: "current" },
  },
  coverageInput: "listedTo",
};

/** Orders closer than this to an integer are harmonics; the rest are interharmonics. */
const ORDER_TOLERANCE = 1e-9;

const isHarmonicOrder = (n: number) => Math.abs(n - Math.round(n)) <= ORDER_TOLERANCE;

/** An order as read: 22.5, or 12.333 for a line between harmonics. */
function formatOrder(n: number): string {
  return String(Number(n.toFixed(3)));
}

function sourceOf(origin: TableOrigin, note?: string): StandardSource {
  const source: StandardSource = { standard: origin.standard, edition: origin.edition, table: origin.table, status: origin.status };
  if (note) source.note = note;
  return source;
}

/** THD in %, over orders 2..highest, relative to `fundamental` (100 when values are already % of it). */
function thdOf(lines: SpectrumLine[], highest: number, fundamental: number): number {
  let sum = 0;
  for (const { n, value } of lines) if (n >= 2 && n <= highest) sum += value * value;
  return (Math.sqrt(sum) / fundamental) * 100;
}

export const calculator: Calculator = {
  id: "harmonic-limits",
  title: "Harmonic limits check",
  summary: "Checks a harmonic spectrum against IEEE Std 519-2014, IEC 61000-3-2 Class A or (unverified) IEEE Std 1547-2018 limits.",
  description:
    "Compares each harmonic of a spectrum — typed, or taken from another block — with the individual limits of a published " +
    "table, computes the spectrum's THD against the table's total limit where it has one, and gives a pass/fail estimate " +
    "with the standard, edition and table it used.",
  inputs: [standardInput, busVoltageInput, iscIlInput, spectrumInput, listedToInput],
  outputs: [
    { key: "rows", label: "Harmonic by harmonic", kind: "limitRows" },
    { key: "pass", label: "Within limits (estimate)", kind: "boolean", description: "Left out when no verdict can be given (interharmonics, or limits from memory); the notes say why." },
    { key: "thd", label: "THD of the spectrum", kind: "scalar", unit: "%", description: "Harmonic orders 2 to the table's highest; interharmonics and DC excluded." },
    { key: "interharmonics", label: "Interharmonics, root-sum-square", kind: "scalar", unit: "%", description: "Lines at non-integer orders, which the tables do not limit; in % of the fundamental (IEEE) or amperes (IEC)." },
    { key: "thdLimit", label: "Total distortion limit", kind: "scalar", unit: "%" },
    { key: "source", label: "Limit table used", kind: "source" },
  ],
  formulas: [
    { label: "THD", latex: String.raw`\mathrm{THD} = \frac{\sqrt{\sum_{n=2}^{H} V_n^2}}{V_1}\cdot 100\,\%,\quad H = 50\ \text{(IEEE)},\ 40\ \text{(IEC)}` },
    { label: "Margin", latex: String.raw`\text{margin}_n = \text{limit}_n - \text{value}_n` },
    { label: "IEEE 519 even harmonics", latex: String.raw`\text{limit}_{even} = 0.25\cdot\text{limit}_{odd}` },
  ],
  conventions: [
    "IEEE values are in % of the fundamental; IEC Class A values in amperes RMS.",
    "IEEE 519 current limits are defined against the maximum demand current IL (TDD); this check uses the spectrum's fundamental, exact at full load and conservative below it.",
    "Orders above the table's range (50 for IEEE, 40 for IEC) are not checked and not counted in THD.",
    "The spectrum must reach the table's highest order (50 for IEEE, 40 for IEC), else no verdict is given: a referenced spectrum reaches its source's hmax; a typed one its highest listed order, or listedTo.",
    "THD counts harmonic orders 2 and above only (IEEE Std 519-2014 and IEC 61000-3-2 define it so); DC and interharmonics are reported on their own.",
    "Lines at non-integer orders are interharmonics: listed and totalled separately, never given an odd- or even-harmonic limit; no verdict is given while any is present.",
    "IEEE Std 1547 rows are from memory and unverified: they are shown as informative only, with no pass/fail verdict.",
    "A negative margin means the harmonic exceeds its limit.",
  ],
  sources: [
    "IEEE Std 519-2014, Table 1: voltage distortion limits — published.",
    "IEEE Std 519-2014, Table 2: current distortion limits, 120 V–69 kV, Isc/IL < 20 row; even harmonics 25 % of odd — published.",
    "IEC 61000-3-2, Table 1, Class A (table number from memory) — published.",
    "IEEE Std 1547-2018, §7.3: current distortion limits — memory, unverified.",
  ],
  cautions: [VERDICT_NOTE],
  compute(inputs) {
    const standard = readChoice(inputs, standardInput);
    const busVoltage = inputs.busVoltage === undefined ? undefined : readQuantity(inputs, busVoltageInput);
    const iscIl = inputs.iscIl === undefined ? undefined : readQuantity(inputs, iscIlInput);
    const lines = inputs.spectrum;
    if (!Array.isArray(lines) || !lines.every((l) => typeof l === "object" && l !== null && Number.isFinite((l as SpectrumLine).n) && Number.isFinite((l as SpectrumLine).value))) {
      throw fieldError("spectrum", "spectrum must be a list of harmonics {n, value}");
    }
    const sorted = [...(lines as SpectrumLine[])].sort((a, b) => a.n - b.n);
    const spectrum = sorted.filter((l) => isHarmonicOrder(l.n)).map((l) => ({ n: Math.round(l.n), value: l.value }));
    const interharmonics = sorted.filter((l) => !isHarmonicOrder(l.n) && l.value > 0);
    const listedTo = inputs.listedTo === undefined ? undefined : readQuantity(inputs, listedToInput);
    const warnings: string[] = [VERDICT_NOTE];

    let limitAt: (n: number) => number | undefined;
    let highest: number;
    let thdLimit: number | undefined;
    let source: StandardSource;
    let unit: "%" | "A" = "%";

    switch (standard) {
      case "ieee519-voltage": {
        if (busVoltage === undefined) throw fieldError("busVoltage", "busVoltage is needed for IEEE 519 voltage limits, e.g. 400 V");
        const row = ieee519VoltageRow(busVoltage)!;
        limitAt = (n) => (n >= 2 ? row.individual : undefined);
        highest = IEEE519_HIGHEST_ORDER;
        thdLimit = row.thd;
        const band = row.upToVolts === Infinity ? `over ${row.overVolts / 1e3} kV` : row.overVolts === 0 ? `up to ${row.upToVolts / 1e3} kV` : `${row.overVolts / 1e3}–${row.upToVolts / 1e3} kV`;
        source = sourceOf(row, `bus voltage ${band}: individual ${row.individual} %, THD ${row.thd} %`);
        break;
      }
      case "ieee519-current": {
        if (iscIl === undefined) throw fieldError("iscIl", "iscIl is needed for IEEE 519 current limits, e.g. 15");
        if (iscIl >= 20) {
          throw fieldError("iscIl", `only the Isc/IL < 20 row of IEEE Std 519-2014 Table 2 is tabulated here; for Isc/IL = ${iscIl} use the standard's own table`);
        }
        if (busVoltage !== undefined && (busVoltage < IEEE519_TABLE_2_VOLTAGE_RANGE.min || busVoltage > IEEE519_TABLE_2_VOLTAGE_RANGE.max)) {
          throw fieldError("busVoltage", `IEEE Std 519-2014 Table 2 covers 120 V to 69 kV; got ${scalar(busVoltage, "V").display}`);
        }
        limitAt = (n) => tableLimitAt(IEEE519_CURRENT_LIMITS_BELOW_20, n)?.limit;
        highest = IEEE519_HIGHEST_ORDER;
        thdLimit = IEEE519_TDD_BELOW_20;
        source = sourceOf(IEEE519_TABLE_2_ORIGIN, "Isc/IL < 20; even harmonics 25 % of odd; TDD 5.0 %");
        warnings.push("IEEE 519 current limits are relative to the maximum demand current IL (TDD); the spectrum's fundamental is used instead — exact at full load, conservative below it.");
        break;
      }
      case "iec61000-3-2-a": {
        limitAt = (n) => tableLimitAt(IEC61000_3_2_CLASS_A, n)?.limit;
        highest = IEC61000_3_2_HIGHEST_ORDER;
        thdLimit = undefined;
        unit = "A";
        source = sourceOf(IEC61000_3_2_CLASS_A_ORIGIN, "Class A, amperes RMS");
        const fundamental = spectrum.find((l) => l.n === 1)?.value;
        if (fundamental !== undefined && fundamental > IEC61000_3_2_MAX_INPUT_CURRENT) {
          warnings.push(`The fundamental (${scalar(fundamental, "A").display}) exceeds 16 A: IEC 61000-3-2 covers equipment up to 16 A per phase (larger equipment falls under IEC 61000-3-12).`);
        }
        break;
      }
      default: {
        limitAt = (n) => tableLimitAt(IEEE1547_ODD_LIMITS, n)?.limit;
        highest = IEEE1547_HIGHEST_ORDER;
        thdLimit = IEEE1547_TRD;
        source = sourceOf(IEEE1547_ORIGIN, "entered from memory — unverified; informative only, no verdict; odd orders only; TRD 5.0 %");
        warnings.push(
          "Informative only, no verdict: the IEEE Std 1547-2018 limits were entered from memory and are not yet confirmed against the standard. Check the spectrum against the standard's own table.",
        );
        if (spectrum.some((l) => l.n % 2 === 0 && l.n <= highest && l.value > 0)) {
          warnings.push("Even harmonics are not checked against IEEE Std 1547-2018 here: their limits are not tabulated.");
        }
        warnings.push("TRD is relative to the DER's rated current; the spectrum's fundamental is used instead.");
      }
    }

    const reach = listedTo ?? spectrum.reduce((top, l) => Math.max(top, l.n), 1);
    if (reach < highest) {
      throw fieldError(
        "spectrum",
        `the spectrum reaches order ${reach}, but ${source.standard}-${source.edition} limits orders up to ${highest}: a verdict would miss any distortion above order ${reach}. ` +
          `Raise the source block's hmax to ${highest} or more; for a typed spectrum, list the orders to ${highest} (0 where there is none), or set listedTo = ${highest} if the orders not listed are zero.`,
      );
    }

    const rows: LimitRow[] = [];
    const unchecked: number[] = [];
    for (const { n, value } of spectrum) {
      if (n < 2 || n > highest) continue;
      const limit = limitAt(n);
      if (limit === undefined) {
        if (value > 0) unchecked.push(n);
        continue;
      }
      rows.push({ n, value, limit, pass: value <= limit, margin: limit - value, unit });
    }
    if (unchecked.length > 0 && standard !== "ieee1547") {
      warnings.push(`Order(s) ${unchecked.join(", ")} have no limit in this table and are not checked (they count in the THD).`);
    }
    const beyond = spectrum.filter((l) => l.n > highest && l.value > 0);
    if (beyond.length > 0) {
      warnings.push(`${beyond.length} harmonic(s) above order ${highest} are outside the table and not checked.`);
    }
    if (rows.length === 0) warnings.push("No harmonic in the spectrum falls within the table; there is nothing to check.");

    const results: Results = { rows, source };
    let thd: number | undefined;
    if (unit === "%") {
      thd = thdOf(spectrum, highest, 100);
    } else {
      const fundamental = spectrum.find((l) => l.n === 1)?.value;
      if (fundamental !== undefined && fundamental > 0) thd = thdOf(spectrum, highest, fundamental);
      else warnings.push("Give the fundamental (n = 1) in amperes to see the THD.");
    }
    if (thd !== undefined) results.thd = scalar(thd, "%");
    if (thdLimit !== undefined) results.thdLimit = scalar(thdLimit, "%");

    if (interharmonics.length > 0) {
      const total = Math.sqrt(interharmonics.reduce((sum, l) => sum + l.value * l.value, 0));
      results.interharmonics = scalar(total, unit);
      const largest = interharmonics.reduce((top, l) => (l.value > top.value ? l : top));
      const shown = interharmonics.slice(0, 8).map((l) => formatOrder(l.n)).join(", ");
      warnings.push(
        `No verdict: the spectrum has ${interharmonics.length} interharmonic line(s) at non-integer orders (${shown}${interharmonics.length > 8 ? " …" : ""}; largest ${scalar(largest.value, unit).display} at order ${formatOrder(largest.n)}). ` +
          `${source.standard} ${source.table} sets no limits for them: they are not in the rows or the THD (total ${scalar(total, unit).display}). Judge them separately, or use an integer carrier ratio.`,
      );
    }

    const totalPass = thd === undefined || thdLimit === undefined || thd <= thdLimit;
    if (!totalPass) warnings.push(`THD ${scalar(thd!, "%").display} exceeds the limit of ${scalar(thdLimit!, "%").display}.`);
    const informative = source.status === "memory";
    if (!informative && interharmonics.length === 0) results.pass = rows.every((r) => r.pass) && totalPass;
    return { results, warnings };
  },
};
