import { describe, expect, it } from "vitest";
import { CHART_COLUMNS, envelopePoints } from "~/lib/calc/envelope";
import { evaluateSheet } from "~/lib/calc/evaluate-sheet";
import type { WaveformPoint } from "~/lib/calc/types";

/** A unipolar SPWM cycle at mf = 400 from the engine itself: thousands of edge points. */
function pwmCycle(): WaveformPoint[] {
  const evaluation = evaluateSheet([{ id: "pwm", calculator: "spwm", inputs: { vdc: "400 V", ma: "0.813", mf: "400", f: "50 Hz", scheme: "unipolar" } }]);
  const outcome = evaluation.blocks.pwm!;
  if (!outcome.ok) throw new Error(JSON.stringify(outcome.errors));
  return outcome.results.waveform as WaveformPoint[];
}

describe("thinning a waveform for its chart", () => {
  const points = pwmCycle();
  const thinned = envelopePoints(points, CHART_COLUMNS);

  it("keeps at most four points per chart column, in angle order", () => {
    expect(points.length).toBeGreaterThan(CHART_COLUMNS * 4);
    expect(thinned.length).toBeLessThanOrEqual(CHART_COLUMNS * 4);
    for (let i = 1; i < thinned.length; i++) expect(thinned[i]!.theta).toBeGreaterThanOrEqual(thinned[i - 1]!.theta);
  });

  it("draws the same picture: each column's lowest and highest value, and the cycle's ends, are kept", () => {
    const column = (p: WaveformPoint) => Math.min(CHART_COLUMNS - 1, Math.floor(((p.theta - points[0]!.theta) / (points.at(-1)!.theta - points[0]!.theta)) * CHART_COLUMNS));
    const extremes = (list: WaveformPoint[]) => {
      const byColumn = new Map<number, [number, number]>();
      for (const p of list) {
        const [low, high] = byColumn.get(column(p)) ?? [Infinity, -Infinity];
        byColumn.set(column(p), [Math.min(low, p.v), Math.max(high, p.v)]);
      }
      return byColumn;
    };
    expect(extremes(thinned)).toEqual(extremes(points));
    expect(thinned[0]).toEqual(points[0]);
    expect(thinned.at(-1)).toEqual(points.at(-1));
  });

  it("leaves a waveform that already fits the chart as it is", () => {
    const square: WaveformPoint[] = [
      { theta: 0, v: 48 },
      { theta: 180, v: 48 },
      { theta: 180, v: -48 },
      { theta: 360, v: -48 },
    ];
    expect(envelopePoints(square, CHART_COLUMNS)).toEqual(square);
  });
});
