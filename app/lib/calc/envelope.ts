/**
 * Thinning a one-cycle waveform for display. A PWM cycle at a high frequency ratio has
 * thousands of samples, more than a chart has pixel columns; keeping, per column, the
 * first, lowest, highest and last sample (in angle order) draws the same picture —
 * every edge and every extreme stays — with a fraction of the points.
 */
import type { WaveformPoint } from "./types";

/** Pixel columns of the app's waveform chart: more points than this per cycle cannot be seen. */
export const CHART_COLUMNS = 640;

export function envelopePoints(points: readonly WaveformPoint[], columns: number): WaveformPoint[] {
  if (points.length <= columns * 4 || points.length < 2) return [...points];
  const start = points[0]!.theta;
  const span = points.at(-1)!.theta - start || 1;
  const kept: WaveformPoint[] = [];
  let column = -1;
  let bucket: { first: number; low: number; high: number; last: number } | undefined;
  const flush = () => {
    if (!bucket) return;
    for (const index of [...new Set([bucket.first, bucket.low, bucket.high, bucket.last])].sort((a, b) => a - b)) kept.push(points[index]!);
  };
  points.forEach((p, i) => {
    const c = Math.min(columns - 1, Math.floor(((p.theta - start) / span) * columns));
    if (c !== column) {
      flush();
      column = c;
      bucket = { first: i, low: i, high: i, last: i };
      return;
    }
    const b = bucket!;
    if (p.v < points[b.low]!.v) b.low = i;
    if (p.v > points[b.high]!.v) b.high = i;
    b.last = i;
  });
  flush();
  return kept;
}
