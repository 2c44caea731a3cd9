/**
 * The plots a calculator block shows: one cycle of the output waveform, the
 * harmonic spectrum and the Bode magnitude of a filter.
 *
 * Recharts 3 lays a chart out in effects (its store learns the size and the
 * axes after mount), so server rendering yields an empty wrapper. Each plot is
 * therefore a <figure> whose caption carries the facts in words, rendered on the
 * server with a plot area of the final size; the chart itself draws once the
 * page has hydrated, into that same box, so nothing shifts.
 */
import { useSyncExternalStore, type ReactNode } from "react";
import {
  Bar,
  BarChart,
  CartesianGrid,
  Line,
  LineChart,
  ReferenceLine,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts";
import { formatQuantity } from "~/lib/calc/format";
import type { BodePoint, Harmonic, WaveformPoint } from "~/lib/calc/types";

// Theme tokens from app.css; SVG presentation attributes accept var().
const COPPER = "var(--color-copper)";
const INK_SOFT = "var(--color-ink-soft)";
const INK_FAINT = "var(--color-ink-faint)";
const RULE = "var(--color-rule)";

const TICK = { fill: INK_SOFT, fontSize: 11 } as const;
const AXIS_LABEL = { fill: INK_SOFT, fontSize: 11 } as const;
const TOOLTIP_STYLE = {
  contentStyle: { background: "var(--color-sheet)", border: "1px solid var(--color-rule-strong)", borderRadius: 6, fontSize: 12 },
  labelStyle: { color: "var(--color-ink-soft)" },
} as const;

const subscribeNever = () => () => {};

/** False on the server and during hydration, true afterwards: the moment a chart can measure its box. */
export function useHydrated(): boolean {
  return useSyncExternalStore(
    subscribeNever,
    () => true,
    () => false,
  );
}

interface ChartFigureProps {
  title: string;
  /** The plot's facts in words: the text alternative for everyone who cannot see it. */
  summary: ReactNode;
  children: ReactNode;
  /** Extra note under the summary, e.g. what was left off the scale. */
  note?: ReactNode;
}

/** A captioned plot area of fixed height and full width; the chart draws into it after hydration. */
export function ChartFigure({ title, summary, note, children }: ChartFigureProps) {
  const hydrated = useHydrated();
  return (
    <figure className="m-0 min-w-0">
      {/* The chart repeats what the caption says; hidden from assistive technology so it is read once. */}
      <div className={`h-52 w-full sm:h-60 ${hydrated ? "" : "rounded border border-dashed border-rule"}`} aria-hidden="true" data-plot-ready={hydrated ? "true" : "false"}>
        {hydrated ? children : null}
      </div>
      <figcaption className="m-0 mt-1.5 text-xs leading-relaxed text-ink-soft">
        <span className="font-semibold text-ink">{title}.</span> {summary}
        {note ? <span className="block text-ink-faint"> {note}</span> : null}
      </figcaption>
    </figure>
  );
}

/** A round axis bound a little above the peak, so ticks at ±bound/2 and ±bound read cleanly (48 V → 60 V). */
function niceBound(peak: number): number {
  if (!(peak > 0) || !Number.isFinite(peak)) return 1;
  const target = peak * 1.08;
  const decade = 10 ** Math.floor(Math.log10(target));
  const step = [1, 1.2, 1.5, 2, 2.5, 3, 4, 5, 6, 8, 10].find((m) => m * decade >= target)!;
  return step * decade;
}

/** Plain tick numbers; the axis label carries the unit. */
function tickNumber(value: number): string {
  if (value === 0) return "0";
  const magnitude = Math.abs(value);
  if (magnitude >= 1e4 || magnitude < 1e-2) return value.toExponential(0).replace("e+", "e");
  return String(Number(value.toPrecision(3)));
}

/** Frequency ticks in engineering notation without the unit: 10, 100, 1k, 10k. */
function tickFrequency(value: number): string {
  return formatQuantity(value, "Hz", { digits: 3, trimZeros: true }).replace(/\s?Hz$/, "").replace(" ", "");
}

/** The distinct levels of a stepped waveform, or undefined when it has too many to list. */
function stepLevels(points: readonly WaveformPoint[]): number[] | undefined {
  const levels = [...new Set(points.map((p) => Number(p.v.toPrecision(6))))].sort((a, b) => a - b);
  return levels.length <= 7 ? levels : undefined;
}

/** Points that share an angle draw the vertical edges themselves; otherwise hold each value until the next point. */
function lineShapeFor(points: readonly WaveformPoint[]): "linear" | "stepAfter" {
  for (let i = 1; i < points.length; i++) if (points[i]!.theta === points[i - 1]!.theta) return "linear";
  return "stepAfter";
}

export function WaveformChart({ points, title = "Output voltage, one cycle" }: { points: readonly WaveformPoint[]; title?: string }) {
  const bound = niceBound(points.reduce((m, p) => Math.max(m, Math.abs(p.v)), 0));
  const levels = stepLevels(points);
  const summary = levels
    ? `Angle 0–360° against voltage; the output steps between ${levels.map((v) => formatQuantity(v, "V")).join(", ")}.`
    : `Angle 0–360° against voltage; the output swings between ${formatQuantity(Math.min(...points.map((p) => p.v)), "V")} and ${formatQuantity(Math.max(...points.map((p) => p.v)), "V")}.`;
  return (
    <ChartFigure title={title} summary={summary}>
      <LineChart responsive style={{ width: "100%", height: "100%" }} data={points as WaveformPoint[]} margin={{ top: 8, right: 12, bottom: 18, left: 4 }} accessibilityLayer={false}>
        <CartesianGrid stroke={RULE} strokeDasharray="2 3" />
        <XAxis
          dataKey="theta"
          type="number"
          domain={[0, 360]}
          ticks={[0, 90, 180, 270, 360]}
          tick={TICK}
          stroke={INK_FAINT}
          label={{ value: "θ (°)", position: "insideBottom", offset: -12, ...AXIS_LABEL }}
        />
        <YAxis
          type="number"
          domain={[-bound, bound]}
          ticks={[-bound, -bound / 2, 0, bound / 2, bound]}
          tickFormatter={tickNumber}
          tick={TICK}
          stroke={INK_FAINT}
          width={48}
          label={{ value: "v (V)", angle: -90, position: "insideLeft", offset: 10, ...AXIS_LABEL }}
        />
        <ReferenceLine y={0} stroke={INK_FAINT} />
        <Tooltip
          {...TOOLTIP_STYLE}
          labelFormatter={(theta) => `θ = ${formatQuantity(Number(theta), "deg")}`}
          formatter={(v) => [formatQuantity(Number(v), "V"), "v"]}
        />
        <Line type={lineShapeFor(points)} dataKey="v" stroke={COPPER} strokeWidth={2} dot={false} isAnimationActive={false} />
      </LineChart>
    </ChartFigure>
  );
}

export function SpectrumChart({ harmonics, title = "Harmonic spectrum" }: { harmonics: readonly Harmonic[]; title?: string }) {
  // The fundamental is 100 % by definition; left on the scale it would flatten every harmonic into the axis.
  const bars = harmonics.filter((h) => h.n !== 1);
  const largest = bars.reduce<Harmonic | undefined>((best, h) => (best === undefined || h.percent > best.percent ? h : best), undefined);
  const orders = bars.length > 0 ? `orders ${bars[0]!.n}–${bars[bars.length - 1]!.n}` : "no harmonics above the fundamental";
  const summary = largest
    ? `Each harmonic's amplitude in % of the fundamental, ${orders}; the largest is order ${largest.n} at ${formatQuantity(largest.percent, "%")}.`
    : `Each harmonic's amplitude in % of the fundamental: ${orders}.`;
  return (
    <ChartFigure title={title} summary={summary} note="The fundamental (100 %) is left off the bars so the harmonics stay readable.">
      <BarChart responsive style={{ width: "100%", height: "100%" }} data={bars as Harmonic[]} margin={{ top: 8, right: 12, bottom: 18, left: 4 }} accessibilityLayer={false}>
        <CartesianGrid stroke={RULE} strokeDasharray="2 3" vertical={false} />
        <XAxis dataKey="n" tick={TICK} stroke={INK_FAINT} label={{ value: "Harmonic order n", position: "insideBottom", offset: -12, ...AXIS_LABEL }} />
        <YAxis
          tickFormatter={tickNumber}
          tick={TICK}
          stroke={INK_FAINT}
          width={48}
          label={{ value: "% of fund.", angle: -90, position: "insideLeft", offset: 10, ...AXIS_LABEL }}
        />
        <Tooltip
          {...TOOLTIP_STYLE}
          cursor={{ fill: "var(--color-copper-wash)" }}
          labelFormatter={(n) => `Order ${String(n)}`}
          formatter={(v) => [formatQuantity(Number(v), "%"), "of fundamental"]}
        />
        <Bar dataKey="percent" fill={COPPER} isAnimationActive={false} maxBarSize={18} />
      </BarChart>
    </ChartFigure>
  );
}

interface BodeChartProps {
  points: readonly BodePoint[];
  /** Corner (resonant) frequency in Hz, marked on the plot. */
  f0?: number | undefined;
  /** Switching frequency in Hz, marked on the plot. */
  fsw?: number | undefined;
  /** The engine's gain at fsw, quoted in the caption; interpolated from the points when absent. */
  gainAtFswDb?: number | undefined;
  title?: string;
}

/** Decade ticks that fall inside [min, max]. */
function decadeTicks(min: number, max: number): number[] {
  const ticks: number[] = [];
  for (let e = Math.ceil(Math.log10(min)); 10 ** e <= max * (1 + 1e-9); e++) ticks.push(10 ** e);
  return ticks;
}

/** Gain at f, interpolated on the log-frequency axis between the neighbouring points. */
function gainAt(points: readonly BodePoint[], f: number): number | undefined {
  for (let i = 1; i < points.length; i++) {
    const a = points[i - 1]!;
    const b = points[i]!;
    if (a.f <= f && f <= b.f) {
      const t = b.f === a.f ? 0 : Math.log(f / a.f) / Math.log(b.f / a.f);
      return a.gainDb + t * (b.gainDb - a.gainDb);
    }
  }
  return undefined;
}

export function BodeChart({ points, f0, fsw, gainAtFswDb, title = "Magnitude response" }: BodeChartProps) {
  const positive = points.filter((p) => p.f > 0 && Number.isFinite(p.gainDb));
  const fswGain = fsw === undefined ? undefined : (gainAtFswDb ?? gainAt(positive, fsw));
  const fMin = Math.min(...positive.map((p) => p.f), f0 ?? Infinity, fsw ?? Infinity);
  const fMax = Math.max(...positive.map((p) => p.f), f0 ?? 0, fsw ?? 0);
  const marks = [
    f0 !== undefined && Number.isFinite(f0) ? `the corner f0 = ${formatQuantity(f0, "Hz")}` : undefined,
    fsw !== undefined && Number.isFinite(fsw)
      ? `the switching frequency fsw = ${formatQuantity(fsw, "Hz")}${fswGain !== undefined ? `, where the gain is ${formatQuantity(fswGain, "dB")}` : ""}`
      : undefined,
  ].filter(Boolean);
  const summary = `Gain in dB against frequency on a logarithmic axis, ${formatQuantity(fMin, "Hz")} to ${formatQuantity(fMax, "Hz")}${marks.length ? `; marked: ${marks.join("; ")}` : ""}.`;
  return (
    <ChartFigure title={title} summary={summary}>
      <LineChart responsive style={{ width: "100%", height: "100%" }} data={positive as BodePoint[]} margin={{ top: 20, right: 16, bottom: 18, left: 4 }} accessibilityLayer={false}>
        <CartesianGrid stroke={RULE} strokeDasharray="2 3" />
        <XAxis
          dataKey="f"
          type="number"
          scale="log"
          domain={[fMin, fMax]}
          ticks={decadeTicks(fMin, fMax)}
          tickFormatter={tickFrequency}
          tick={TICK}
          stroke={INK_FAINT}
          allowDataOverflow
          label={{ value: "f (Hz)", position: "insideBottom", offset: -12, ...AXIS_LABEL }}
        />
        <YAxis
          type="number"
          domain={["auto", "auto"]}
          tickFormatter={tickNumber}
          tick={TICK}
          stroke={INK_FAINT}
          width={48}
          label={{ value: "Gain (dB)", angle: -90, position: "insideLeft", offset: 10, ...AXIS_LABEL }}
        />
        <ReferenceLine y={0} stroke={INK_FAINT} />
        {f0 !== undefined && Number.isFinite(f0) ? (
          <ReferenceLine x={f0} stroke={INK_SOFT} strokeDasharray="4 3" label={{ value: "f0", position: "top", ...AXIS_LABEL }} />
        ) : null}
        {fsw !== undefined && Number.isFinite(fsw) ? (
          <ReferenceLine x={fsw} stroke={COPPER} strokeDasharray="4 3" label={{ value: "fsw", position: "top", ...AXIS_LABEL, fill: COPPER }} />
        ) : null}
        <Tooltip
          {...TOOLTIP_STYLE}
          labelFormatter={(f) => `f = ${formatQuantity(Number(f), "Hz")}`}
          formatter={(g) => [formatQuantity(Number(g), "dB"), "gain"]}
        />
        <Line type="monotone" dataKey="gainDb" stroke={COPPER} strokeWidth={2} dot={false} isAnimationActive={false} />
      </LineChart>
    </ChartFigure>
  );
}
