/**
 * The plots a block shows: one cycle of a waveform, a harmonic spectrum and the Bode
 * magnitude of a filter, as plain SVG drawn from `~/lib/charts/geometry` — no chart
 * library, nothing measured in the browser, so the server sends the finished picture,
 * it prints, and hydration finds the same markup.
 *
 * Each chart is drawn at CHART_WIDTH × CHART_HEIGHT and scales with the column; app.css
 * (`.sw-chart`) keeps text and lines at a readable screen size as it shrinks. Every plot
 * is a <figure> whose caption carries the facts in words: its text alternative. The
 * drawing is hidden from assistive technology so those facts are read once.
 */
import type { ReactNode } from "react";
import { formatQuantity } from "~/lib/calc/format";
import type { BodePoint, Harmonic, WaveformPoint } from "~/lib/calc/types";
import { bodeGeometry, CHART_HEIGHT, CHART_WIDTH, gainAt, spectrumGeometry, waveformGeometry, type PlotArea, type Tick } from "~/lib/charts/geometry";

interface ChartFigureProps {
  title: string;
  /** The plot's facts in words: the text alternative for everyone who cannot see it. */
  summary: ReactNode;
  children: ReactNode;
  /** Extra note under the summary, e.g. what was left off the scale. */
  note?: ReactNode;
}

/** A captioned plot. */
export function ChartFigure({ title, summary, note, children }: ChartFigureProps) {
  return (
    <figure className="m-0 min-w-0">
      <div className="sw-chart" aria-hidden="true">
        <svg viewBox={`0 0 ${CHART_WIDTH} ${CHART_HEIGHT}`} width={CHART_WIDTH} height={CHART_HEIGHT} role="presentation">
          {children}
        </svg>
      </div>
      <figcaption className="m-0 mt-1.5 text-xs leading-relaxed text-ink-soft">
        <span className="font-semibold text-ink">{title}.</span> {summary}
        {note ? <span className="block text-ink-faint"> {note}</span> : null}
      </figcaption>
    </figure>
  );
}

/** Grid, axis lines, tick labels and axis titles around a plot area. */
function Axes({ plot, xTicks, yTicks, xTitle, yTitle, verticalGrid = true }: { plot: PlotArea; xTicks: Tick[]; yTicks: Tick[]; xTitle: string; yTitle: string; verticalGrid?: boolean }) {
  const bottom = plot.y + plot.height;
  const right = plot.x + plot.width;
  return (
    <g className="sw-chart-axes">
      <g className="sw-chart-grid">
        {yTicks.map((t) => (
          <line key={`y${t.value}`} x1={plot.x} x2={right} y1={t.at} y2={t.at} />
        ))}
        {verticalGrid ? xTicks.map((t) => <line key={`x${t.value}`} x1={t.at} x2={t.at} y1={plot.y} y2={bottom} />) : null}
      </g>
      <path className="sw-chart-axis" d={`M${plot.x},${plot.y}V${bottom}H${right}`} />
      <g className="sw-chart-xticks">
        {xTicks.map((t) => (
          <g key={t.value}>
            <line className="sw-chart-axis" x1={t.at} x2={t.at} y1={bottom} y2={bottom + 5} />
            <text x={t.at} y={bottom + 8} textAnchor="middle" dominantBaseline="hanging">
              {t.label}
            </text>
          </g>
        ))}
      </g>
      <g className="sw-chart-yticks">
        {yTicks.map((t) => (
          <g key={t.value}>
            <line className="sw-chart-axis" x1={plot.x - 5} x2={plot.x} y1={t.at} y2={t.at} />
            <text x={plot.x - 8} y={t.at} textAnchor="end" dominantBaseline="central">
              {t.label}
            </text>
          </g>
        ))}
      </g>
      {/* Both titles sit close to the tick numbers at 12 units; app.css moves them out as the text grows. */}
      <text className="sw-chart-title-x" x={plot.x + plot.width / 2} y={bottom + 36} textAnchor="middle">
        {xTitle}
      </text>
      {/* Turned a quarter anticlockwise, its top towards the left edge. */}
      <text className="sw-chart-title-y" transform={`translate(40 ${plot.y + plot.height / 2}) rotate(-90)`} textAnchor="middle" dominantBaseline="hanging">
        {yTitle}
      </text>
    </g>
  );
}

/** The distinct levels of a stepped waveform, or undefined when it has too many to list. */
function stepLevels(points: readonly WaveformPoint[]): number[] | undefined {
  const levels = [...new Set(points.map((p) => Number(p.v.toPrecision(6))))].sort((a, b) => a - b);
  return levels.length <= 7 ? levels : undefined;
}

export function WaveformChart({ points, title = "Output voltage, one cycle" }: { points: readonly WaveformPoint[]; title?: string }) {
  const chart = waveformGeometry(points);
  const levels = stepLevels(points);
  const summary = levels
    ? `Angle 0–360° against voltage; the output steps between ${levels.map((v) => formatQuantity(v, "V")).join(", ")}.`
    : `Angle 0–360° against voltage; the output swings between ${formatQuantity(Math.min(...points.map((p) => p.v)), "V")} and ${formatQuantity(Math.max(...points.map((p) => p.v)), "V")}.`;
  return (
    <ChartFigure title={title} summary={summary}>
      <Axes plot={chart.plot} xTicks={chart.xTicks} yTicks={chart.yTicks} xTitle="θ (°)" yTitle="v (V)" />
      <line className="sw-chart-zero" x1={chart.plot.x} x2={chart.plot.x + chart.plot.width} y1={chart.zeroY} y2={chart.zeroY} />
      <path className="sw-chart-trace" d={chart.path} />
    </ChartFigure>
  );
}

export function SpectrumChart({ harmonics, title = "Harmonic spectrum" }: { harmonics: readonly Harmonic[]; title?: string }) {
  const chart = spectrumGeometry(harmonics);
  const bars = harmonics.filter((h) => h.n !== 1);
  const largest = bars.reduce<Harmonic | undefined>((best, h) => (best === undefined || h.percent > best.percent ? h : best), undefined);
  const orders = bars.length > 0 ? `orders ${bars[0]!.n}–${bars[bars.length - 1]!.n}` : "no harmonics above the fundamental";
  const summary = largest
    ? `Each harmonic's amplitude in % of the fundamental, ${orders}; the largest is order ${largest.n} at ${formatQuantity(largest.percent, "%")}.`
    : `Each harmonic's amplitude in % of the fundamental: ${orders}.`;
  return (
    <ChartFigure title={title} summary={summary} note="The fundamental (100 %) is left off the bars so the harmonics stay readable.">
      <Axes plot={chart.plot} xTicks={chart.xTicks} yTicks={chart.yTicks} xTitle="Harmonic order n" yTitle="% of fund." verticalGrid={false} />
      <g className="sw-chart-bars">
        {chart.bars.map((bar) => (
          <rect key={bar.n} x={bar.x} y={bar.y} width={bar.width} height={bar.height}>
            {/* A pointer's readout; the caption and the harmonics table carry the same facts. */}
            <title>{`Order ${bar.n}: ${formatQuantity(bar.percent, "%")} of fundamental`}</title>
          </rect>
        ))}
      </g>
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

export function BodeChart({ points, f0, fsw, gainAtFswDb, title = "Magnitude response" }: BodeChartProps) {
  const chart = bodeGeometry(points, { f0, fsw });
  const fswGain = fsw === undefined ? undefined : (gainAtFswDb ?? gainAt(points.filter((p) => p.f > 0 && Number.isFinite(p.gainDb)), fsw));
  const marks = [
    f0 !== undefined && Number.isFinite(f0) ? `the corner f0 = ${formatQuantity(f0, "Hz")}` : undefined,
    fsw !== undefined && Number.isFinite(fsw)
      ? `the switching frequency fsw = ${formatQuantity(fsw, "Hz")}${fswGain !== undefined ? `, where the gain is ${formatQuantity(fswGain, "dB")}` : ""}`
      : undefined,
  ].filter(Boolean);
  const summary = `Gain in dB against frequency on a logarithmic axis, ${formatQuantity(chart.fMin, "Hz")} to ${formatQuantity(chart.fMax, "Hz")}${marks.length ? `; marked: ${marks.join("; ")}` : ""}.`;
  const { plot } = chart;
  return (
    <ChartFigure title={title} summary={summary}>
      <Axes plot={plot} xTicks={chart.xTicks} yTicks={chart.yTicks} xTitle="f (Hz)" yTitle="Gain (dB)" />
      {chart.zeroY !== undefined ? <line className="sw-chart-zero" x1={plot.x} x2={plot.x + plot.width} y1={chart.zeroY} y2={chart.zeroY} /> : null}
      {chart.markers.map((m) => (
        <g key={m.label} className={`sw-chart-marker sw-chart-marker-${m.label}`}>
          <line x1={m.x} x2={m.x} y1={plot.y} y2={plot.y + plot.height} />
          <text x={m.x} y={plot.y - 6} textAnchor="middle">
            {m.label}
          </text>
        </g>
      ))}
      <path className="sw-chart-trace" d={chart.path} />
    </ChartFigure>
  );
}
