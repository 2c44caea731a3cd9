/**
 * The arithmetic behind the app's plots: scales, round ticks, the trace of one cycle, the
 * bars of a spectrum and the Bode curve, in SVG units of a fixed drawing. Pure, so the
 * server and the browser draw the same markup with no chart library, and the picture is
 * tested here rather than through a browser.
 *
 * Conventions: the drawing is CHART_WIDTH × CHART_HEIGHT units; y grows downwards, as in
 * SVG; every coordinate is printed in hundredths of a unit (finer than any screen shows).
 */
import { CHART_COLUMNS, envelopePoints } from "../calc/envelope";
import { formatQuantity } from "../calc/format";
import type { BodePoint, Harmonic, WaveformPoint } from "../calc/types";

/** The drawing size in SVG units; app.css scales it down to the column (keep the two in step). */
export const CHART_WIDTH = CHART_COLUMNS;
export const CHART_HEIGHT = 260;

/**
 * Room around the plot for the axes. It fits the largest text app.css may set (24 units,
 * on a phone): tick numbers and the axis title on the left and below.
 */
const ROOM = { left: 92, right: 24, top: 14, bottom: 58 } as const;
/** A Bode plot labels its f0 and fsw markers above the plot. */
const MARKER_ROOM_TOP = 34;
/** Width of one digit and the least gap between two tick labels, at the largest font, in SVG units. */
const DIGIT_WIDTH = 15;
const LABEL_GAP = 12;

export interface PlotArea {
  x: number;
  y: number;
  width: number;
  height: number;
}

export interface Tick {
  value: number;
  label: string;
  /** Where the tick stands along its axis, in SVG units. */
  at: number;
}

export interface Marker {
  label: string;
  x: number;
}

/** Hundredths of an SVG unit. */
export const hundredths = (value: number) => Math.round(value * 100) / 100;

/**
 * A value cut to ten significant digits: a result computed on the server and in the
 * browser may differ in the last bit, and the geometry should not.
 */
const steady = (value: number) => Number(value.toPrecision(10));

export function plotArea(top: number = ROOM.top): PlotArea {
  return { x: ROOM.left, y: top, width: CHART_WIDTH - ROOM.left - ROOM.right, height: CHART_HEIGHT - top - ROOM.bottom };
}

/** Maps [d0, d1] onto [r0, r1] linearly, rounded to hundredths. */
export function linearScale([d0, d1]: readonly [number, number], [r0, r1]: readonly [number, number]): (value: number) => number {
  const span = d1 - d0 || 1;
  return (value) => hundredths(r0 + ((value - d0) / span) * (r1 - r0));
}

/** A round axis bound a little above the peak, so ticks at ±bound/2 and ±bound read cleanly (48 V → 60 V). */
export function niceBound(peak: number): number {
  if (!(peak > 0) || !Number.isFinite(peak)) return 1;
  const target = peak * 1.08;
  const decade = 10 ** Math.floor(Math.log10(target));
  const step = [1, 1.2, 1.5, 2, 2.5, 3, 4, 5, 6, 8, 10].find((m) => m * decade >= target)!;
  return step * decade;
}

/** The smallest step of 1, 2 or 5 × 10ⁿ that covers `span` in at most `maxSteps` steps. */
export function niceStep(span: number, maxSteps: number): number {
  if (!(span > 0) || !Number.isFinite(span)) return 1;
  const rough = span / Math.max(1, maxSteps);
  const decade = 10 ** Math.floor(Math.log10(rough));
  const step = [1, 2, 5, 10].find((m) => m * decade >= rough * (1 - 1e-9))! * decade;
  return steady(step);
}

/** A domain widened to whole steps around [min, max], and the ticks at each step. */
export function niceDomain(min: number, max: number, maxSteps = 5): { domain: [number, number]; ticks: number[] } {
  if (!(max > min)) {
    const pad = Math.abs(min) > 0 ? Math.abs(min) * 0.1 : 1;
    return niceDomain(min - pad, max + pad, maxSteps);
  }
  const step = niceStep(max - min, maxSteps);
  // The slack keeps a bound that is already a whole step (0, say) from widening by one more.
  const low = Math.floor(min / step + 1e-9) * step;
  const high = Math.ceil(max / step - 1e-9) * step;
  const ticks: number[] = [];
  for (let k = Math.round(low / step); k * step <= high + step * 1e-9; k++) ticks.push(steady(k * step));
  return { domain: [steady(low), steady(high)], ticks };
}

/** Plain tick numbers; the axis title carries the unit. */
export function tickNumber(value: number): string {
  if (value === 0) return "0";
  const magnitude = Math.abs(value);
  if (magnitude >= 1e4 || magnitude < 1e-2) return value.toExponential(0).replace("e+", "e");
  return String(Number(value.toPrecision(3)));
}

/** Frequency ticks in engineering notation without the unit: 10, 100, 1k, 10k. */
export function tickFrequency(value: number): string {
  return formatQuantity(value, "Hz", { digits: 3, trimZeros: true }).replace(/\s?Hz$/, "").replace(" ", "");
}

/** An SVG path through the points: straight segments, or held flat until the next point when `step`. */
export function polylinePath(points: readonly { x: number; y: number }[], step = false): string {
  let d = "";
  let lastY = 0;
  points.forEach((p, i) => {
    const x = hundredths(p.x);
    const y = hundredths(p.y);
    if (i === 0) d += `M${x},${y}`;
    else {
      if (step && y !== lastY) d += `L${x},${lastY}`;
      d += `L${x},${y}`;
    }
    lastY = y;
  });
  return d;
}

function ticksAt(values: readonly number[], scale: (v: number) => number, label: (v: number) => string): Tick[] {
  return values.map((value) => ({ value, label: label(value), at: scale(value) }));
}

export interface WaveformGeometry {
  plot: PlotArea;
  /** The trace's `d`. */
  path: string;
  xTicks: Tick[];
  yTicks: Tick[];
  /** The y of v = 0. */
  zeroY: number;
}

/**
 * One cycle against angle (0–360°). A waveform sampled at the same angle twice draws its
 * own vertical edges; otherwise each value is held until the next sample (a switched
 * waveform is piecewise flat). Thinned to four points per pixel column first.
 */
export function waveformGeometry(points: readonly WaveformPoint[]): WaveformGeometry {
  const plot = plotArea();
  const bound = niceBound(points.reduce((m, p) => Math.max(m, Math.abs(p.v)), 0));
  const x = linearScale([0, 360], [plot.x, plot.x + plot.width]);
  const y = linearScale([-bound, bound], [plot.y + plot.height, plot.y]);
  const thinned = envelopePoints(points, CHART_COLUMNS);
  const sharesAngles = thinned.some((p, i) => i > 0 && p.theta === thinned[i - 1]!.theta);
  return {
    plot,
    path: polylinePath(
      thinned.map((p) => ({ x: x(steady(p.theta)), y: y(steady(p.v)) })),
      !sharesAngles,
    ),
    xTicks: ticksAt([0, 90, 180, 270, 360], x, String),
    yTicks: ticksAt([-bound, -bound / 2, 0, bound / 2, bound], y, tickNumber),
    zeroY: y(0),
  };
}

export interface SpectrumBar {
  n: number;
  percent: number;
  x: number;
  y: number;
  width: number;
  height: number;
}

export interface SpectrumGeometry {
  plot: PlotArea;
  bars: SpectrumBar[];
  xTicks: Tick[];
  yTicks: Tick[];
}

/**
 * A bar per harmonic order on a linear axis of n, the fundamental left off (at 100 % it
 * would flatten every harmonic into the axis). The order axis is labelled at round steps
 * far enough apart that the widest label never touches the next at the largest font, so
 * three-digit orders do not run together on a phone.
 */
export function spectrumGeometry(harmonics: readonly Harmonic[]): SpectrumGeometry {
  const plot = plotArea();
  const shown = harmonics.filter((h) => h.n !== 1 && Number.isFinite(h.percent));
  const highest = shown.reduce((m, h) => Math.max(m, h.n), 1);
  const top = shown.reduce((m, h) => Math.max(m, h.percent), 0);
  const nSpan: [number, number] = [0, highest + 1];
  const x = linearScale(nSpan, [plot.x, plot.x + plot.width]);
  const labelRoom = String(highest).length * DIGIT_WIDTH + LABEL_GAP;
  const nStep = niceStep(nSpan[1], Math.floor(plot.width / labelRoom));
  const orders: number[] = [];
  for (let n = nStep; n <= nSpan[1]; n += nStep) orders.push(n);
  const { domain, ticks } = niceDomain(0, top > 0 ? top : 1, 4);
  const y = linearScale(domain, [plot.y + plot.height, plot.y]);
  const band = plot.width / nSpan[1];
  const width = hundredths(Math.min(18, Math.max(1.5, band * 0.7)));
  return {
    plot,
    bars: shown.map((h) => {
      const percent = steady(h.percent);
      const barTop = y(Math.max(0, percent));
      return { n: h.n, percent, x: hundredths(x(h.n) - width / 2), y: barTop, width, height: hundredths(y(0) - barTop) };
    })
      // A line that rounds to nothing (an order the scheme removes, e.g. the 3rd at α = 30°) draws no bar.
      .filter((bar) => bar.height > 0),
    xTicks: ticksAt(orders, x, String),
    yTicks: ticksAt(ticks, y, tickNumber),
  };
}

export interface BodeGeometry {
  plot: PlotArea;
  path: string;
  xTicks: Tick[];
  yTicks: Tick[];
  /** The y of 0 dB, when the gain axis includes it. */
  zeroY: number | undefined;
  markers: Marker[];
  /** The frequency span drawn, in Hz. */
  fMin: number;
  fMax: number;
}

/** Gain at f, interpolated on the log-frequency axis between the neighbouring points. */
export function gainAt(points: readonly BodePoint[], f: number): number | undefined {
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

/** Gain in dB against frequency on a logarithmic axis labelled at whole decades, with f0 and fsw marked. */
export function bodeGeometry(points: readonly BodePoint[], marks: { f0?: number | undefined; fsw?: number | undefined } = {}): BodeGeometry {
  const plot = plotArea(MARKER_ROOM_TOP);
  const positive = points.filter((p) => p.f > 0 && Number.isFinite(p.gainDb));
  const marked = (["f0", "fsw"] as const).flatMap((label) => {
    const f = marks[label];
    return f !== undefined && f > 0 && Number.isFinite(f) ? [{ label, f }] : [];
  });
  const frequencies = [...positive.map((p) => p.f), ...marked.map((m) => m.f)];
  const fMin = frequencies.length ? Math.min(...frequencies) : 1;
  const fMax = frequencies.length ? Math.max(...frequencies) : 10;
  const decade = (f: number) => steady(Math.log10(f));
  const x = linearScale([decade(fMin), decade(fMax)], [plot.x, plot.x + plot.width]);
  const decades: number[] = [];
  for (let e = Math.ceil(decade(fMin)); e <= decade(fMax); e++) decades.push(e);
  const gains = positive.map((p) => steady(p.gainDb));
  const { domain, ticks } = niceDomain(gains.length ? Math.min(...gains) : -1, gains.length ? Math.max(...gains) : 1, 5);
  const y = linearScale(domain, [plot.y + plot.height, plot.y]);
  return {
    plot,
    path: polylinePath(positive.map((p) => ({ x: x(decade(p.f)), y: y(steady(p.gainDb)) }))),
    xTicks: decades.map((e) => ({ value: 10 ** e, label: tickFrequency(10 ** e), at: x(e) })),
    yTicks: ticksAt(ticks, y, tickNumber),
    zeroY: domain[0] <= 0 && 0 <= domain[1] ? y(0) : undefined,
    markers: marked.map((m) => ({ label: m.label, x: x(decade(m.f)) })),
    fMin,
    fMax,
  };
}
