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

export { VERDICT_NOTE };

const standardInput: ChoiceInputSpec = {
  key: "standard",
  label: "Limit table",
  description: "Which published limits to check against.",
  kind: "choice",
  options: [
    { value: "ieee519-voltage", label: "IEEE Std 519-2014 Table 1 — voltage at the PCC" },
    { value: "ieee519-current", label: "IEEE Std 519-2014 Table 2 — current, 120 V–69 kV" },
    { value: "iec61000-3-2-a", label: "IEC 61000-3-2 Class A — equipment ≤ 16 A per phase" },
    { value: "ieee1547", label: "IEEE Std 1547-2018 §7.3 — DER current (from memory, unverified)" },
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

const spectrumInput: SpectrumInputSpec = {
  key: "spectrum",
  label: "Harmonic spectrum",
  description:
    'Harmonics as [{"n": 3, "value": "2.1 %"}, …] or a reference such as =qs1.harmonics. IEEE tables take % of the fundamental; IEC Class A takes amperes RMS.',
  kind: "spectrum",
  valueUnit: "%",
  valueUnitByChoice: { input: "standard", units: { "iec61000-3-2-a": "A" } },
};

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
  inputs: [standardInput, busVoltageInput, iscIlInput, spectrumInput],
  outputs: [
    { key: "rows", label: "Harmonic by harmonic", kind: "limitRows" },
    { key: "pass", label: "Within limits (estimate)", kind: "boolean" },
    { key: "thd", label: "THD of the spectrum", kind: "scalar", unit: "%" },
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
    const spectrum = [...(lines as SpectrumLine[])].sort((a, b) => a.n - b.n);
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
        source = sourceOf(IEEE1547_ORIGIN, "entered from memory — unverified; odd orders only; TRD 5.0 %");
        warnings.push("UNVERIFIED: the IEEE Std 1547-2018 limits were entered from memory and are not yet confirmed against the standard.");
        if (spectrum.some((l) => l.n % 2 === 0 && l.n <= highest && l.value > 0)) {
          warnings.push("Even harmonics are not checked against IEEE Std 1547-2018 here: their limits are not tabulated.");
        }
        warnings.push("TRD is relative to the DER's rated current; the spectrum's fundamental is used instead.");
      }
    }

    const rows: LimitRow[] = [];
    for (const { n, value } of spectrum) {
      if (n < 2 || n > highest) continue;
      const limit = limitAt(n);
      if (limit === undefined) continue;
      rows.push({ n, value, limit, pass: value <= limit, margin: limit - value, unit });
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

    const totalPass = thd === undefined || thdLimit === undefined || thd <= thdLimit;
    results.pass = rows.every((r) => r.pass) && totalPass;
    if (!totalPass) warnings.push(`THD ${scalar(thd!, "%").display} exceeds the limit of ${scalar(thdLimit!, "%").display}.`);
    return { results, warnings };
  },
};
