/**
 * The plots a calculator block shows: one cycle of the output waveform, the
 * harmonic spectrum and the Bode magnitude of a filter.
 *
 * Each chart is drawn at a fixed size (CHART_WIDTH × CHART_HEIGHT) with no
 * animation, so the server already sends the finished SVG: it prints, it reads
 * before JavaScript loads, and hydration finds the same markup. Narrower columns
 * scale the whole picture down in CSS (`.sw-chart` in app.css), which also keeps
 * the tick labels at a readable size. Every plot is a <figure> whose caption
 * carries the facts in words, its text alternative.
 */
import { useId, type ReactNode } from "react";
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
import { CHART_COLUMNS, envelopePoints } from "~/lib/calc/envelope";
import type { BodePoint, Harmonic, WaveformPoint } from "~/lib/calc/types";

/** The drawing size in SVG units; app.css scales it down to the column (keep the two in step). */
export const CHART_WIDTH = CHART_COLUMNS;
export const CHART_HEIGHT = 260;

// Theme tokens from app.css; SVG presentation attributes accept var().
const COPPER = "var(--color-copper)";
const INK_SOFT = "var(--color-ink-soft)";
const INK_FAINT = "var(--color-ink-faint)";
const RULE = "var(--color-rule)";

// 12 units at full width; app.css enlarges the units as the chart shrinks, so text stays about 11 px.
const TICK = { fill: INK_SOFT, fontSize: 12 } as const;
const AXIS_LABEL = { fill: INK_SOFT, fontSize: 12 } as const;

/*
 * The axes leave room for the largest text app.css may set (24 units, on a
 * phone). The axis titles sit close to the tick numbers at 12 units; app.css
 * moves them out as the text grows (keep the offsets here and there in step).
 */
const Y_AXIS_WIDTH = 92;
const X_AXIS_HEIGHT = 34;
const MARGIN = { top: 14, right: 24, bottom: 24, left: 0 } as const;
// Rotated about its anchor, a start-anchored title would run up from the middle of the axis.
const Y_LABEL = { ...AXIS_LABEL, angle: -90, position: "insideLeft", offset: 43, style: { textAnchor: "middle" } } as const;
const X_LABEL = { ...AXIS_LABEL, position: "insideBottom", offset: 2 } as const;
// Every axis sets `interval`: recharts' default thinning of crowded ticks measures text,
// which only the browser can do, so the server and the browser would draw different ticks.
/** One digit of a category label, and the gap between labels, at the largest font, in SVG units. */
const CATEGORY_DIGIT_WIDTH = 13;
const CATEGORY_TICK_GAP = 10;

// Padding in em so the box grows with the font size app.css gives it.
const TOOLTIP_STYLE = {
  contentStyle: { background: "var(--color-sheet)", border: "1px solid var(--color-rule-strong)", borderRadius: 6, padding: "0.4em 0.7em" },
  labelStyle: { color: "var(--color-ink-soft)" },
} as const;

/**
 * A DOM-safe id that is the same on the server and in the browser. Recharts
 * otherwise numbers its clip paths from a module counter, which differs
 * between the two and breaks hydration.
 */
function useChartId(): string {
  return `sw-chart${useId().replace(/[^A-Za-z0-9_-]/g, "")}`;
}

interface ChartFigureProps {
  title: string;
  /** The plot's facts in words: the text alternative for everyone who cannot see it. */
  summary: ReactNode;
  children: ReactNode;
  /** Extra note under the summary, e.g. what was left off the scale. */
  note?: ReactNode;
}

/** A captioned plot; the chart inside is drawn at its fixed size and scales down with the column. */
export function ChartFigure({ title, summary, note, children }: ChartFigureProps) {
  return (
    <figure className="m-0 min-w-0">
      {/* The chart repeats what the caption says; hidden from assistive technology so it is read once. */}
      <div className="sw-chart" aria-hidden="true">
        {children}
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

/**
 * A plotted value cut to ten significant digits. The server and the browser may
 * compute a result (or a logarithm) a last bit apart; the chart geometry prints
 * every digit, so it is drawn from values both sides agree on.
 */
const steady = (value: number) => Number(value.toPrecision(10));

/** Hundredths of an SVG unit: finer than any screen or printer shows. */
const hundredths = (value: number) => Math.round(value * 100) / 100;

/**
 * A d3 curve of straight segments (held flat until the next point when `step`)
 * that rounds its coordinates before they reach the path. The server runs
 * recharts' CommonJS build, whose bundled d3 prints every digit, while the
 * browser's d3 rounds to three decimals; rounded here, both print the same `d`
 * and hydration finds the markup it expects.
 */
function roundedCurve(step: boolean) {
  return (context: { moveTo(x: number, y: number): void; lineTo(x: number, y: number): void }) => {
    let started = false;
    let lastY = 0;
    return {
      areaStart() {},
      areaEnd() {},
      lineStart() {
        started = false;
      },
      lineEnd() {},
      point(x: number, y: number) {
        const px = hundredths(x);
        const py = hundredths(y);
        if (!started) context.moveTo(px, py);
        else {
          if (step) context.lineTo(px, lastY);
          context.lineTo(px, py);
        }
        started = true;
        lastY = py;
      },
    };
  };
}
const LINEAR = roundedCurve(false);
const STEP_AFTER = roundedCurve(true);

/** Points that share an angle draw the vertical edges themselves; otherwise hold each value until the next point. */
function lineShapeFor(points: readonly WaveformPoint[]) {
  for (let i = 1; i < points.length; i++) if (points[i]!.theta === points[i - 1]!.theta) return LINEAR;
  return STEP_AFTER;
}

/** Every n-th category is labelled, so the labels never crowd even at the largest font (three-digit orders need more room than two). */
function categoryInterval(count: number, widestLabel: number): number {
  const band = (CHART_WIDTH - MARGIN.left - MARGIN.right - Y_AXIS_WIDTH) / Math.max(count, 1);
  const room = String(widestLabel).length * CATEGORY_DIGIT_WIDTH + CATEGORY_TICK_GAP;
  return Math.max(0, Math.ceil(room / band) - 1);
}

export function WaveformChart({ points, title = "Output voltage, one cycle" }: { points: readonly WaveformPoint[]; title?: string }) {
  const id = useChartId();
  const bound = niceBound(points.reduce((m, p) => Math.max(m, Math.abs(p.v)), 0));
  const levels = stepLevels(points);
  const plotted = envelopePoints(points, CHART_WIDTH).map((p) => ({ theta: steady(p.theta), v: steady(p.v) }));
  const summary = levels
    ? `Angle 0–360° against voltage; the output steps between ${levels.map((v) => formatQuantity(v, "V")).join(", ")}.`
    : `Angle 0–360° against voltage; the output swings between ${formatQuantity(Math.min(...points.map((p) => p.v)), "V")} and ${formatQuantity(Math.max(...points.map((p) => p.v)), "V")}.`;
  return (
    <ChartFigure title={title} summary={summary}>
      <LineChart id={id} width={CHART_WIDTH} height={CHART_HEIGHT} data={plotted} margin={MARGIN}>
        <CartesianGrid stroke={RULE} strokeDasharray="2 3" />
        <XAxis
          dataKey="theta"
          type="number"
          domain={[0, 360]}
          ticks={[0, 90, 180, 270, 360]}
          interval={0}
          height={X_AXIS_HEIGHT}
          tick={TICK}
          stroke={INK_FAINT}
          label={{ value: "θ (°)", ...X_LABEL }}
        />
        <YAxis
          type="number"
          domain={[-bound, bound]}
          ticks={[-bound, -bound / 2, 0, bound / 2, bound]}
          interval={0}
          tickFormatter={tickNumber}
          tick={TICK}
          stroke={INK_FAINT}
          width={Y_AXIS_WIDTH}
          label={{ value: "v (V)", ...Y_LABEL }}
        />
        <ReferenceLine y={0} stroke={INK_FAINT} />
        <Tooltip
          {...TOOLTIP_STYLE}
          isAnimationActive={false}
          labelFormatter={(theta) => `θ = ${formatQuantity(Number(theta), "deg")}`}
          formatter={(v) => [formatQuantity(Number(v), "V"), "v"]}
        />
        <Line type={lineShapeFor(plotted)} dataKey="v" stroke={COPPER} strokeWidth={2} dot={false} isAnimationActive={false} />
      </LineChart>
    </ChartFigure>
  );
}

export function SpectrumChart({ harmonics, title = "Harmonic spectrum" }: { harmonics: readonly Harmonic[]; title?: string }) {
  const id = useChartId();
  // The fundamental is 100 % by definition; left on the scale it would flatten every harmonic into the axis.
  const bars = harmonics.filter((h) => h.n !== 1);
  const plotted = bars.map((h) => ({ n: h.n, percent: steady(h.percent) }));
  const largest = bars.reduce<Harmonic | undefined>((best, h) => (best === undefined || h.percent > best.percent ? h : best), undefined);
  const orders = bars.length > 0 ? `orders ${bars[0]!.n}–${bars[bars.length - 1]!.n}` : "no harmonics above the fundamental";
  const summary = largest
    ? `Each harmonic's amplitude in % of the fundamental, ${orders}; the largest is order ${largest.n} at ${formatQuantity(largest.percent, "%")}.`
    : `Each harmonic's amplitude in % of the fundamental: ${orders}.`;
  return (
    <ChartFigure title={title} summary={summary} note="The fundamental (100 %) is left off the bars so the harmonics stay readable.">
      <BarChart id={id} width={CHART_WIDTH} height={CHART_HEIGHT} data={plotted} margin={MARGIN}>
        <CartesianGrid stroke={RULE} strokeDasharray="2 3" vertical={false} />
        <XAxis
          dataKey="n"
          interval={categoryInterval(bars.length, bars.at(-1)?.n ?? 0)}
          height={X_AXIS_HEIGHT}
          tick={TICK}
          stroke={INK_FAINT}
          label={{ value: "Harmonic order n", ...X_LABEL }}
        />
        <YAxis tickFormatter={tickNumber} interval={0} tick={TICK} stroke={INK_FAINT} width={Y_AXIS_WIDTH} label={{ value: "% of fund.", ...Y_LABEL }} />
        <Tooltip
          {...TOOLTIP_STYLE}
          isAnimationActive={false}
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

/** log10 of a frequency: the x axis is linear in it, which is a logarithmic frequency axis. */
const decade = (f: number) => steady(Math.log10(f));

/** Whole decades within [min, max] Hz, as exponents: 1 for 10 Hz, 4 for 10 kHz. */
function decadeTicks(min: number, max: number): number[] {
  const ticks: number[] = [];
  for (let e = Math.ceil(decade(min)); e <= decade(max); e++) ticks.push(e);
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
  const id = useChartId();
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
  // Plotted against log10 f rather than through a log scale, so the positions come from plain arithmetic on agreed values.
  const plotted = positive.map((p) => ({ x: decade(p.f), gainDb: steady(p.gainDb) }));
  const summary = `Gain in dB against frequency on a logarithmic axis, ${formatQuantity(fMin, "Hz")} to ${formatQuantity(fMax, "Hz")}${marks.length ? `; marked: ${marks.join("; ")}` : ""}.`;
  return (
    <ChartFigure title={title} summary={summary}>
      {/* The taller top margin holds the f0 and fsw labels above the plot. */}
      <LineChart id={id} width={CHART_WIDTH} height={CHART_HEIGHT} data={plotted} margin={{ ...MARGIN, top: 30 }}>
        <CartesianGrid stroke={RULE} strokeDasharray="2 3" />
        <XAxis
          dataKey="x"
          type="number"
          domain={[decade(fMin), decade(fMax)]}
          ticks={decadeTicks(fMin, fMax)}
          interval={0}
          tickFormatter={(x: number) => tickFrequency(10 ** x)}
          height={X_AXIS_HEIGHT}
          tick={TICK}
          stroke={INK_FAINT}
          allowDataOverflow
          label={{ value: "f (Hz)", ...X_LABEL }}
        />
        <YAxis
          type="number"
          domain={["auto", "auto"]}
          interval={0}
          tickFormatter={tickNumber}
          tick={TICK}
          stroke={INK_FAINT}
          width={Y_AXIS_WIDTH}
          label={{ value: "Gain (dB)", ...Y_LABEL }}
        />
        <ReferenceLine y={0} stroke={INK_FAINT} />
        {f0 !== undefined && Number.isFinite(f0) ? (
          <ReferenceLine x={decade(f0)} stroke={INK_SOFT} strokeDasharray="4 3" label={{ value: "f0", position: "top", ...AXIS_LABEL }} />
        ) : null}
        {fsw !== undefined && Number.isFinite(fsw) ? (
          <ReferenceLine x={decade(fsw)} stroke={COPPER} strokeDasharray="4 3" label={{ value: "fsw", position: "top", ...AXIS_LABEL, fill: COPPER }} />
        ) : null}
        <Tooltip
          {...TOOLTIP_STYLE}
          isAnimationActive={false}
          labelFormatter={(x) => `f = ${formatQuantity(10 ** Number(x), "Hz")}`}
          formatter={(g) => [formatQuantity(Number(g), "dB"), "gain"]}
        />
        {/* Named: its clip path (the x axis lets data overflow) would otherwise take recharts' counter id. Dense points, so straight segments read as a smooth curve. */}
        <Line id={`${id}-gain`} type={LINEAR} dataKey="gainDb" stroke={COPPER} strokeWidth={2} dot={false} isAnimationActive={false} />
      </LineChart>
    </ChartFigure>
  );
}
