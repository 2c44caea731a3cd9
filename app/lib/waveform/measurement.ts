/**
 * The measured-waveform block: one channel of an attached capture, its analysis,
 * and (when the author links a calculator block) measured against calculated —
 * fundamental RMS, THD and chosen harmonics, each within the author's tolerance.
 *
 * Written in a sheet as
 *   <MeasuredWaveform id="m1" file="bench-capture.csv" channel="Vout" compare="qs1"
 *     harmonics="3, 5, 7" fundamentalTol="3 %" thdTol="2 %" harmonicTol="1.5 %" thd="all" />
 *
 * Tolerances: the fundamental's is relative (percent of the calculated value); THD's
 * and each harmonic's are in percentage points of the fundamental, the unit both
 * sides are stated in. Pure: the caller passes the stored analysis of the capture
 * (the server loads it; the browser has it from the page), never the samples.
 */
import type { SheetEvaluation } from "../calc/evaluate-sheet";
import type { FieldError, Harmonic, Results, ScalarResult } from "../calc/types";
import type { CaptureAnalysis, ChannelAnalysis } from "./analyse";

export const MEASUREMENT_COMPONENT = "MeasuredWaveform";

/** The attributes a measured-waveform block takes besides `id`, with their defaults. */
export const MEASUREMENT_ATTRIBUTES = {
  file: "",
  channel: "",
  compare: "",
  harmonics: "3, 5, 7",
  fundamentalTol: "3 %",
  thdTol: "2 %",
  harmonicTol: "1.5 %",
  thd: "all",
} as const;
export type MeasurementAttribute = keyof typeof MEASUREMENT_ATTRIBUTES;
export const MEASUREMENT_ATTRIBUTE_NAMES = Object.keys(MEASUREMENT_ATTRIBUTES) as MeasurementAttribute[];

/** A measured-waveform block as written in the source. */
export interface MeasurementBlock {
  id: string;
  attributes: Partial<Record<MeasurementAttribute, string>>;
}

/** An attachment's stored analysis, as the server hands it to the pipeline. */
export interface StoredCapture {
  attachmentId: string;
  fileName: string;
  sha256: string;
  analysis: CaptureAnalysis;
}

export type ThdRange = "all" | "40" | "50";

export interface ComparisonRow {
  /** "fundamental", "thd" or "h5" … */
  key: string;
  label: string;
  /** Unit of measured and calculated: "V", "A" or "%" (of the fundamental). */
  unit: string;
  measured: number;
  calculated: number;
  /** Relative difference in percent for the fundamental; percentage points otherwise. */
  difference: number;
  tolerance: number;
  toleranceKind: "relative" | "points";
  pass: boolean;
}

export interface MeasurementComparison {
  block: string;
  calculator: string;
  thdRange: ThdRange;
  rows: ComparisonRow[];
  pass: boolean;
}

export type MeasurementOutcome =
  | {
      ok: true;
      attachment: { id: string; fileName: string; sha256: string };
      sampleRate: number;
      sampleCount: number;
      analysis: ChannelAnalysis;
      comparison: MeasurementComparison | null;
    }
  | { ok: false; errors: FieldError[] };

const MAX_CHOSEN_HARMONICS = 20;

/** Evaluates every measured-waveform block against the captures and the sheet's calculated results. */
export function evaluateMeasurements(
  blocks: readonly MeasurementBlock[],
  evaluation: SheetEvaluation,
  captures: Readonly<Record<string, StoredCapture>>,
): Record<string, MeasurementOutcome> {
  const outcomes: Record<string, MeasurementOutcome> = {};
  for (const block of blocks) outcomes[block.id] = evaluateMeasurement(block, evaluation, captures);
  return outcomes;
}

function evaluateMeasurement(block: MeasurementBlock, evaluation: SheetEvaluation, captures: Readonly<Record<string, StoredCapture>>): MeasurementOutcome {
  const errors: FieldError[] = [];
  const value = (name: MeasurementAttribute) => (block.attributes[name] ?? MEASUREMENT_ATTRIBUTES[name]).trim();

  const fileName = value("file");
  const capture = fileName ? captures[fileName] : undefined;
  if (!fileName) errors.push({ field: "file", message: 'name the attached capture, e.g. file="bench-capture.csv"' });
  else if (!capture) {
    const known = Object.keys(captures);
    errors.push({
      field: "file",
      message: `no capture "${fileName.slice(0, 80)}" is attached to this sheet; ${known.length > 0 ? `attached: ${known.slice(0, 10).join(", ")}` : "attach a CSV capture first (Attachments)"}`,
    });
  }

  const harmonics = parseOrders(value("harmonics"), errors);
  const fundamentalTol = parsePercent("fundamentalTol", value("fundamentalTol"), errors);
  const thdTol = parsePercent("thdTol", value("thdTol"), errors);
  const harmonicTol = parsePercent("harmonicTol", value("harmonicTol"), errors);
  const thdRange = value("thd");
  if (thdRange !== "all" && thdRange !== "40" && thdRange !== "50") {
    errors.push({ field: "thd", message: `which THD to compare: "all", "40" or "50"; got "${thdRange.slice(0, 20)}"` });
  }

  let channel: ChannelAnalysis | undefined;
  if (capture) {
    const wanted = value("channel");
    const channels = capture.analysis.channels;
    channel = wanted === "" ? channels[0] : (channels.find((c) => c.channel === wanted) ?? (/^\d+$/.test(wanted) ? channels[Number(wanted) - 1] : undefined));
    if (!channel) {
      const skipped = capture.analysis.skipped.find((s) => s.channel === wanted);
      errors.push({
        field: "channel",
        message: skipped
          ? `channel "${wanted}" could not be analysed: ${skipped.reason}`
          : `"${capture.fileName}" has no analysed channel "${wanted.slice(0, 40)}"; its channels: ${channels.map((c) => c.channel).join(", ")}`,
      });
    }
  }

  let calculated: { calculator: string; results: Results } | undefined;
  const compare = value("compare");
  if (compare) {
    const outcome = evaluation.blocks[compare];
    if (!outcome) errors.push({ field: "compare", message: `there is no calculator block "${compare.slice(0, 40)}" on this sheet` });
    else if (!outcome.ok) errors.push({ field: "compare", message: `block "${compare}" has errors; fix it to compare with it` });
    else calculated = { calculator: outcome.calculator, results: outcome.results };
  }

  if (errors.length > 0 || !capture || !channel) return { ok: false, errors };

  let comparison: MeasurementComparison | null = null;
  if (calculated) {
    const built = compareWithCalculation(channel, calculated, compare, {
      harmonics: harmonics!,
      fundamentalTol: fundamentalTol!,
      thdTol: thdTol!,
      harmonicTol: harmonicTol!,
      thdRange: thdRange as ThdRange,
    });
    if (!built.ok) return { ok: false, errors: [built.error] };
    comparison = built.comparison;
  }
  return {
    ok: true,
    attachment: { id: capture.attachmentId, fileName: capture.fileName, sha256: capture.sha256 },
    sampleRate: capture.analysis.sampleRate,
    sampleCount: capture.analysis.sampleCount,
    analysis: channel,
    comparison,
  };
}

export interface ComparisonSettings {
  harmonics: number[];
  /** Percent of the calculated fundamental. */
  fundamentalTol: number;
  /** Percentage points. */
  thdTol: number;
  harmonicTol: number;
  thdRange: ThdRange;
}

/** Measured against calculated, row by row. Fails only when the calculator gives nothing to compare with. */
export function compareWithCalculation(
  measured: ChannelAnalysis,
  calculated: { calculator: string; results: Results },
  blockId: string,
  settings: ComparisonSettings,
): { ok: true; comparison: MeasurementComparison } | { ok: false; error: FieldError } {
  const table = harmonicsOf(calculated.results);
  const thdKey = settings.thdRange === "all" ? "thd" : `thd${settings.thdRange}`;
  const thd = calculated.results[thdKey];
  if (!table || !isScalar(thd)) {
    return {
      ok: false,
      error: { field: "compare", message: `block "${blockId}" (${calculated.calculator}) gives no harmonics and THD to compare with; link a waveform calculator such as quasi-square or six-step` },
    };
  }
  const fundamental = table.find((h) => h.n === 1)!;
  const rows: ComparisonRow[] = [];
  const unit = measured.unit || "V";
  const relative = (100 * (measured.fundamentalRms - fundamental.rms)) / fundamental.rms;
  rows.push({
    key: "fundamental",
    label: "Fundamental RMS",
    unit,
    measured: measured.fundamentalRms,
    calculated: fundamental.rms,
    difference: relative,
    tolerance: settings.fundamentalTol,
    toleranceKind: "relative",
    pass: Math.abs(relative) <= settings.fundamentalTol,
  });
  const measuredThd = settings.thdRange === "all" ? measured.thd : settings.thdRange === "40" ? measured.thd40 : measured.thd50;
  rows.push(pointsRow("thd", settings.thdRange === "all" ? "THD, all components" : `THD, orders 2–${settings.thdRange}`, measuredThd, thd.value, settings.thdTol));
  for (const order of settings.harmonics) {
    const measuredLine = measured.harmonics.find((h) => h.n === order);
    // A calculator lists only the orders its waveform has: an absent order is calculated as zero.
    const calculatedPercent = table.find((h) => h.n === order)?.percent ?? 0;
    rows.push(pointsRow(`h${order}`, `Harmonic ${order}`, measuredLine?.percent ?? Number.NaN, calculatedPercent, settings.harmonicTol));
  }
  return { ok: true, comparison: { block: blockId, calculator: calculated.calculator, thdRange: settings.thdRange, rows, pass: rows.every((row) => row.pass) } };
}

function pointsRow(key: string, label: string, measured: number, calculated: number, tolerance: number): ComparisonRow {
  const difference = measured - calculated;
  return { key, label, unit: "%", measured, calculated, difference, tolerance, toleranceKind: "points", pass: Number.isFinite(difference) && Math.abs(difference) <= tolerance };
}

function isScalar(value: unknown): value is ScalarResult {
  return typeof value === "object" && value !== null && !Array.isArray(value) && typeof (value as ScalarResult).value === "number";
}

function harmonicsOf(results: Results): Harmonic[] | undefined {
  const table = results.harmonics;
  if (!Array.isArray(table) || table.length === 0) return undefined;
  const first = table[0] as Harmonic;
  return typeof first.n === "number" && typeof first.percent === "number" && first.n === 1 ? (table as Harmonic[]) : undefined;
}

function parseOrders(text: string, errors: FieldError[]): number[] | undefined {
  if (text === "") return [];
  const parts = text.split(/[\s,;]+/).filter(Boolean);
  const orders: number[] = [];
  for (const part of parts) {
    const order = Number(part);
    if (!Number.isInteger(order) || order < 2 || order > 50) {
      errors.push({ field: "harmonics", message: `"${part.slice(0, 12)}" is not a harmonic order from 2 to 50; write them like "3, 5, 7"` });
      return undefined;
    }
    if (!orders.includes(order)) orders.push(order);
  }
  if (orders.length > MAX_CHOSEN_HARMONICS) {
    errors.push({ field: "harmonics", message: `at most ${MAX_CHOSEN_HARMONICS} harmonics; choose the ones the design depends on` });
    return undefined;
  }
  return orders;
}

function parsePercent(field: string, text: string, errors: FieldError[]): number | undefined {
  const match = /^(\d+(?:\.\d+)?|\.\d+)\s*%?$/.exec(text);
  const value = match ? Number(match[1]) : Number.NaN;
  if (!match || !(value > 0) || value > 100) {
    errors.push({ field, message: `a tolerance in percent greater than 0 and at most 100, e.g. "2 %"; got "${text.slice(0, 20)}"` });
    return undefined;
  }
  return value;
}
