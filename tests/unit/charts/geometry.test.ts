import { describe, expect, it } from "vitest";
import { CHART_COLUMNS } from "~/lib/calc/envelope";
import type { Harmonic, WaveformPoint } from "~/lib/calc/types";
import { bodeGeometry, CHART_HEIGHT, CHART_WIDTH, linearScale, niceBound, niceDomain, niceStep, polylinePath, spectrumGeometry, tickFrequency, tickNumber, waveformGeometry } from "~/lib/charts/geometry";

/** Vertices of an M/L path. */
const vertices = (d: string) => [...d.matchAll(/[ML](-?[\d.]+),(-?[\d.]+)/g)].map((m) => ({ x: Number(m[1]), y: Number(m[2]) }));

describe("scales and ticks", () => {
  it("maps a domain onto a range, either way up", () => {
    const y = linearScale([-60, 60], [200, 20]);
    expect(y(-60)).toBe(200);
    expect(y(60)).toBe(20);
    expect(y(0)).toBe(110);
  });

  it("rounds a peak up to a bound whose halves read cleanly", () => {
    expect(niceBound(48)).toBe(60);
    expect(niceBound(325)).toBe(400);
    expect(niceBound(0)).toBe(1);
  });

  it("steps by 1, 2 or 5 of a decade and widens a domain to whole steps", () => {
    expect(niceStep(50, 10)).toBe(5);
    expect(niceStep(1000, 8)).toBe(200);
    expect(niceStep(0.3, 5)).toBe(0.1);
    const { domain, ticks } = niceDomain(-50.8, 3.2, 5);
    expect(domain).toEqual([-60, 20]);
    expect(ticks).toEqual([-60, -40, -20, 0, 20]);
    // A bound that is already round stays put.
    expect(niceDomain(0, 37.8, 4)).toEqual({ domain: [0, 40], ticks: [0, 10, 20, 30, 40] });
  });

  it("writes tick numbers plainly and frequencies in engineering notation without the unit", () => {
    expect(tickNumber(-30)).toBe("-30");
    expect(tickNumber(0.5)).toBe("0.5");
    expect(tickNumber(20000)).toBe("2e4");
    expect([10, 100, 1000, 10000, 100000].map(tickFrequency)).toEqual(["10", "100", "1k", "10k", "100k"]);
  });

  it("holds a value until the next point when asked, and prints hundredths", () => {
    expect(polylinePath([{ x: 0, y: 10 }, { x: 5.123, y: 2.456 }], true)).toBe("M0,10L5.12,10L5.12,2.46");
    expect(polylinePath([{ x: 0, y: 10 }, { x: 5, y: 2 }])).toBe("M0,10L5,2");
  });
});

describe("a waveform", () => {
  // A quasi-square wave of ±48 V with α = 30°: 0 until 30°, +48 V to 150°, 0 to 210°, −48 V to 330°, 0 to 360°.
  const quasiSquare: WaveformPoint[] = [
    { theta: 0, v: 0 },
    { theta: 30, v: 48 },
    { theta: 150, v: 0 },
    { theta: 210, v: -48 },
    { theta: 330, v: 0 },
    { theta: 360, v: 0 },
  ];
  const chart = waveformGeometry(quasiSquare);
  const { plot } = chart;

  it("fits the drawing, with room for the axes", () => {
    expect(plot.x).toBeGreaterThan(0);
    expect(plot.x + plot.width).toBeLessThan(CHART_WIDTH);
    expect(plot.y + plot.height).toBeLessThan(CHART_HEIGHT);
  });

  it("steps between three levels, +48 V as far above zero as −48 V is below, edges at the switching angles", () => {
    const points = vertices(chart.path);
    const levels = [...new Set(points.map((p) => p.y))].sort((a, b) => a - b);
    expect(levels).toHaveLength(3);
    expect(levels[1]).toBe(chart.zeroY);
    expect(levels[1]! - levels[0]!).toBeCloseTo(levels[2]! - levels[1]!, 2);
    const rise = points.find((p) => p.y === levels[0])!;
    expect(rise.x).toBeCloseTo(plot.x + (30 / 360) * plot.width, 1);
    const fall = points.find((p) => p.y === levels[2])!;
    expect(fall.x).toBeCloseTo(plot.x + (210 / 360) * plot.width, 1);
  });

  it("labels θ every 90° and v at the bound, its half and zero", () => {
    expect(chart.xTicks.map((t) => t.label)).toEqual(["0", "90", "180", "270", "360"]);
    expect(chart.yTicks.map((t) => t.label)).toEqual(["-60", "-30", "0", "30", "60"]);
  });

  it("draws a long capture with at most four points per pixel column", () => {
    const samples: WaveformPoint[] = Array.from({ length: 100_000 }, (_, i) => ({ theta: (i / 99_999) * 360, v: 325 * Math.sin((i / 99_999) * 2 * Math.PI) }));
    expect(vertices(waveformGeometry(samples).path).length).toBeLessThanOrEqual(2 * 4 * CHART_COLUMNS);
  });
});

describe("a spectrum", () => {
  const line = (n: number, percent: number): Harmonic => ({ n, percent, peak: percent, rms: percent / Math.SQRT2 });

  it("leaves the fundamental off and stands each bar over its order", () => {
    const chart = spectrumGeometry([line(1, 100), line(3, 33.3), line(5, 20), line(7, 14.3)]);
    expect(chart.bars.map((b) => b.n)).toEqual([3, 5, 7]);
    const centre = (n: number) => chart.bars.find((b) => b.n === n)!;
    const x = (n: number) => centre(n).x + centre(n).width / 2;
    expect(x(5) - x(3)).toBeCloseTo(x(7) - x(5), 1);
    // Taller for a larger harmonic; all standing on the same baseline.
    expect(centre(3).height).toBeGreaterThan(centre(5).height);
    expect(centre(3).y + centre(3).height).toBeCloseTo(centre(7).y + centre(7).height, 2);
    // Percent from zero up.
    expect(chart.yTicks[0]!.value).toBe(0);
  });

  it("keeps three-digit order labels apart at the largest text a phone gets (24 units, about 0.6 em a digit)", () => {
    const sidebands = [1, 197, 199, 201, 203, 397, 399, 401, 403, 797, 799, 801, 803, 997, 999].map((n) => line(n, n === 1 ? 100 : 10));
    const ticks = spectrumGeometry(sidebands).xTicks;
    expect(ticks.length).toBeGreaterThanOrEqual(3);
    const widest = Math.max(...ticks.map((t) => t.label.length)) * 0.6 * 24;
    for (let i = 1; i < ticks.length; i++) expect(ticks[i]!.at - ticks[i - 1]!.at).toBeGreaterThan(widest);
    // Labels at round orders.
    for (const t of ticks) expect(t.value % 100).toBe(0);
  });
});

describe("a Bode plot", () => {
  // A second-order low-pass with f0 = 1 kHz: 0 dB well below, −40 dB a decade above.
  const points = Array.from({ length: 121 }, (_, i) => {
    const f = 10 ** (1 + i / 30);
    const r = f / 1000;
    return { f, gainDb: -20 * Math.log10(Math.abs(1 - r * r) || 1e-3) };
  });
  const chart = bodeGeometry(points, { f0: 1000, fsw: 20000 });

  it("spaces whole decades evenly and places f0 and fsw on the log axis", () => {
    const at = (label: string) => chart.xTicks.find((t) => t.label === label)!.at;
    expect(chart.xTicks.map((t) => t.label)).toEqual(["10", "100", "1k", "10k", "100k"]);
    expect(at("10k") - at("1k")).toBeCloseTo(at("1k") - at("100"), 1);
    const marker = Object.fromEntries(chart.markers.map((m) => [m.label, m.x]));
    expect(marker.f0).toBeCloseTo(at("1k"), 1);
    expect(marker.fsw).toBeCloseTo(at("10k") + Math.log10(2) * (at("100k") - at("10k")), 1);
  });

  it("labels the gain axis at round steps that cover every point", () => {
    const values = chart.yTicks.map((t) => t.value);
    const gains = points.map((p) => p.gainDb);
    expect(Math.min(...values)).toBeLessThanOrEqual(Math.min(...gains));
    expect(Math.max(...values)).toBeGreaterThanOrEqual(Math.max(...gains));
    expect(chart.zeroY).toBeDefined();
  });
});
