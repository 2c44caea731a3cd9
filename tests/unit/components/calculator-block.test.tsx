import { describe, expect, it } from "vitest";
import { CalculatorBlock } from "~/components/calc/calculator-block";
import { evaluateSheet, type BlockOutcome } from "~/lib/calc/evaluate-sheet";
import { calculators, getCalculator } from "~/lib/calc/registry";
import type { ScalarResult } from "~/lib/calc/types";
import {
  attribute,
  bars,
  controlLabelled,
  descriptionOf,
  drawnCharts,
  labels,
  markers,
  render,
  selectedOption,
  tagById,
  textOf,
  traceData,
  tracePoints,
  xTicks,
} from "./markup";

interface Block {
  id: string;
  calculator: string;
  inputs: Record<string, string>;
}

/** Evaluates the blocks as a sheet and renders one of them, as the sheet page would. */
function renderBlock(blocks: Block[], id: string, editable: boolean): string {
  const evaluation = evaluateSheet(blocks);
  const block = blocks.find((b) => b.id === id)!;
  return render(<CalculatorBlock blockId={block.id} calculatorId={block.calculator} inputs={block.inputs} outcome={evaluation.blocks[id]} editable={editable} />);
}

const quasiSquare: Block = { id: "qs1", calculator: "quasi-square", inputs: { vdc: "48 V", alpha: "30 deg", f: "50 Hz" } };

describe("a quasi-square block, editable", () => {
  const html = renderBlock([quasiSquare], "qs1", true);
  const text = textOf(html);

  it("is headed by its block id and calculator and says it computed", () => {
    expect(text).toContain("qs1 · Quasi-square wave");
    expect(text).toContain("Computed");
  });

  it("labels one field per input, showing what was typed and the unit a bare number is read in", () => {
    const specs = getCalculator("quasi-square")!.inputs;
    for (const spec of specs) expect(controlLabelled(html, spec.label), spec.label).toBeDefined();
    const vdc = controlLabelled(html, "DC-link voltage")!;
    expect(attribute(vdc, "value")).toBe("48 V");
    expect(descriptionOf(html, vdc)).toBe("Unit: V");
    // hmax was not typed: empty, with the engine's default shown as the placeholder.
    const hmax = controlLabelled(html, specs.find((s) => s.key === "hmax")!.label)!;
    expect(attribute(hmax, "value")).toBe("");
    expect(attribute(hmax, "placeholder")).toBe("49");
  });

  it("shows the results in engineering notation beside their labels", () => {
    // Derived from V_n = (4·Vdc/nπ)·cos nα (Rashid, Power Electronics, 3rd ed., §6.6 — published; section from memory):
    // 48 V, α = 30°: V1 = 4·48/π·cos 30° = 52.9 V peak, 37.4 V RMS; THD = √(π²/9 − 1) = 31.1 % (derived: Vrms² = ⅔·Vdc²).
    expect(text).toMatch(/Fundamental peak v1Peak 52\.9 V/);
    expect(text).toMatch(/Fundamental RMS v1Rms 37\.4 V/);
    expect(text).toMatch(/THD, all harmonics thd 31\.1 %/);
    // Least THD where (π − 2α)·tan α = 1: 23.218° (derived; the engine's computed result).
    expect(text).toMatch(/α for least THD alphaMinThd 23\.2°/);
  });

  it("captions the waveform and the spectrum with their facts", () => {
    expect(text).toContain("Output voltage, one cycle. Angle 0–360° against voltage; the output steps between -48.0 V, 0 V, 48.0 V.");
    expect(text).toMatch(/Harmonic spectrum\. Each harmonic's amplitude in % of the fundamental, orders 3–49; the largest is order 5 at 20\.0 %\./);
    expect(text).toContain("The fundamental (100 %) is left off the bars");
  });

  it("sends the waveform already drawn: one cycle stepping 0, +48 V, 0, −48 V, leaving zero at α = 30°", () => {
    const charts = drawnCharts(html);
    expect(charts).toHaveLength(2);
    const [waveform] = charts;
    const { plot } = waveform!;
    const trace = tracePoints(waveform!);
    // Three levels, +48 V drawn above the zero line and −48 V the same distance below it.
    const levels = [...new Set(trace.map((p) => p.y))].sort((a, b) => a - b);
    expect(levels).toHaveLength(3);
    const [high, zero, low] = levels as [number, number, number];
    expect(zero - high).toBeCloseTo(low - zero, 1);
    expect(trace[0]).toEqual({ x: plot.x, y: zero });
    expect(trace[trace.length - 1]!.x).toBeCloseTo(plot.x + plot.width, 1);
    const firstRise = trace.find((p) => p.y === high)!;
    expect(firstRise.x).toBeCloseTo(plot.x + (30 / 360) * plot.width, 1);
    const firstFall = trace.find((p) => p.y === low)!;
    expect(firstFall.x).toBeCloseTo(plot.x + ((180 + 30) / 360) * plot.width, 1);
  });

  it("prints the trace in hundredths, so the browser reproduces the server's path and hydration matches", () => {
    const numbers = traceData(drawnCharts(html)[0]!).match(/-?[\d.]+/g)!;
    expect(numbers.length).toBeGreaterThan(10);
    for (const n of numbers) expect(n, n).toMatch(/^-?\d+(\.\d{1,2})?$/);
  });

  it("sends the spectrum already drawn: a bar per harmonic present on an axis of n, the tallest over order 5", () => {
    const spectrum = drawnCharts(html)[1]!;
    const drawn = bars(spectrum);
    // Orders 3, 5, …, 49 without the fundamental, less the eight that α = 30° removes (3, 9, …, 45: cos 3kα = 0, derived).
    expect(drawn).toHaveLength(24 - 8);
    const tallest = drawn.reduce((a, b) => (b.height > a.height ? b : a));
    const at = (label: string) => xTicks(spectrum).find((t) => t.label === label)!.x;
    // At α = 30° the 3rd is gone and order 5 is the largest (|cos 5α|/5 > |cos 7α|/7, derived): it stands on the "5" tick.
    expect(tallest.x + tallest.width / 2).toBeCloseTo(at("5"), 0);
  });

  it("folds the full harmonics list into a table with peak, RMS and percent", () => {
    expect(html).toMatch(/<details[^>]*>\s*<summary[^>]*>Harmonics table/);
    expect(text).toContain("n Frequency Peak RMS % of fundamental");
    // Order 7: (4·48/7π)·|cos 210°| = 7.56 V peak, 5.35 V RMS, 1/7 = 14.3 % of the fundamental (derived).
    expect(text).toMatch(/7 350 Hz 7\.56 V 5\.35 V 14\.3 %/);
  });

  it("carries the lethal-voltage caution", () => {
    expect(text).toContain("Lethal voltages.");
  });
});

describe("an LC filter block", () => {
  const html = renderBlock([{ id: "lc1", calculator: "lc-filter", inputs: { l: "2.2 mH", c: "10 uF", fsw: "20 kHz", rLoad: "10 ohm" } }], "lc1", true);
  const text = textOf(html);

  it("captions the Bode plot with the corner and the switching frequency it marks", () => {
    // f0 = 1/(2π√(2.2 mH · 10 µF)) = 1.07 kHz; a 40 dB/decade roll-off gives about −51 dB at 20 kHz.
    expect(text).toContain("Magnitude response. Gain in dB against frequency on a logarithmic axis");
    expect(text).toContain("marked: the corner f0 = 1.07 kHz; the switching frequency fsw = 20.0 kHz, where the gain is -50.8 dB.");
    expect(text).toMatch(/Corner frequency f0 1\.07 kHz/);
  });

  it("sends the Bode plot already drawn on a log frequency axis, with f0 and fsw marked and labelled", () => {
    const charts = drawnCharts(html);
    expect(charts).toHaveLength(1);
    const bode = charts[0]!;
    expect(tracePoints(bode).length).toBeGreaterThan(100);
    const at = (label: string) => xTicks(bode).find((t) => t.label === label)!.x;
    // Decades are evenly spaced.
    expect(at("10k") - at("1k")).toBeCloseTo(at("1k") - at("100"), 1);
    const marked = Object.fromEntries(markers(bode).map((m) => [m.label, m.x]));
    expect(Object.keys(marked).sort()).toEqual(["f0", "fsw"]);
    // 20 kHz stands log10(2) of a decade past 10k; f0 = 1.07 kHz just past 1k.
    expect(marked.fsw!).toBeCloseTo(at("10k") + Math.log10(2) * (at("100k") - at("10k")), 0);
    expect(marked.f0!).toBeCloseTo(at("1k") + Math.log10(1.073) * (at("10k") - at("1k")), 0);
  });

  it("shows the filter's own caution about ringing", () => {
    expect(text).toContain("A lightly loaded LC filter rings at f0");
  });
});

describe("a block that fails", () => {
  const blocks: Block[] = [quasiSquare, { id: "dc1", calculator: "dc-link", inputs: { p: "1.5 kg", vdc: "400 V", f: "-50 Hz", rippleVpp: "4 V" } }];
  const html = renderBlock(blocks, "dc1", true);
  const text = textOf(html);

  it("puts each field error under the input it belongs to, tied with aria-describedby", () => {
    const power = controlLabelled(html, "Output power")!;
    expect(attribute(power, "value")).toBe("1.5 kg");
    expect(attribute(power, "aria-invalid")).toBe("true");
    expect(descriptionOf(html, power)).toMatch(/^Unit: W p must be a power; got 1\.5 kg/);

    const frequency = controlLabelled(html, "Output frequency")!;
    expect(attribute(frequency, "aria-invalid")).toBe("true");
    expect(descriptionOf(html, frequency)).toMatch(/^Unit: Hz f must be/);
    // The inputs that are fine carry no error.
    const ripple = controlLabelled(html, "Allowed ripple")!;
    expect(attribute(ripple, "aria-invalid")).toBeUndefined();
    expect(descriptionOf(html, ripple)).toBe("Unit: V");
  });

  it("says inside the block that it did not compute, naming the fields, and shows no results", () => {
    expect(text).toContain("2 problems");
    expect(text).toContain("dc1 did not compute. Fix these inputs:");
    expect(text).toMatch(/Output power \(p\): p must be a power/);
    expect(text).toMatch(/Output frequency \(f\): f must be/);
    expect(text).toContain("No results until the inputs are fixed.");
    expect(drawnCharts(html)).toHaveLength(0);
  });

  it("links each problem in the summary to its field", () => {
    const label = labels(html).find((l) => l.text.startsWith("Output power"))!;
    expect(html).toContain(`href="#${label.for}"`);
  });

  it("names a reference to a block that is not on the sheet, and leaves the other blocks computing", () => {
    const sheet: Block[] = [quasiSquare, { id: "dc2", calculator: "dc-link", inputs: { p: "1 kW", vdc: "=qs9.v1Rms", rippleVpp: "4 V" } }];
    const broken = textOf(renderBlock(sheet, "dc2", true));
    expect(broken).toMatch(/DC-link voltage \(vdc\): there is no block "qs9" on this sheet/);
    expect(textOf(renderBlock(sheet, "qs1", true))).toMatch(/Fundamental RMS v1Rms 37\.4 V/);
  });
});

describe("a harmonic-limits block", () => {
  it("over the IEEE 519 voltage limits: says Over in words, row by row, and names its source", () => {
    const html = renderBlock(
      [quasiSquare, { id: "hl1", calculator: "harmonic-limits", inputs: { standard: "ieee519-voltage", busVoltage: "480 V", spectrum: "=qs1.harmonics" } }],
      "hl1",
      true,
    );
    const text = textOf(html);
    expect(text).toMatch(/Verdict \(estimate\): Over — 6 of 24 orders over the limit; THD over its limit\./);
    // THD to order 50 of the 30° wave: 30.0 % (derived from the series); limit 8.0 % (IEEE Std 519-2014, Table 1, ≤ 1 kV — published).
    expect(text).toContain("THD 30.0 % against a limit of 8.00 %.");
    // The 5th of the 30° wave is 1/5 = 20.0 % (derived) against the 5.0 % individual limit (IEEE Std 519-2014, Table 1 — published);
    // the 3rd is gone (cos 90° = 0) and passes.
    expect(text).toMatch(/5 Over 20\.0 % 5\.00 % -15\.0 %/);
    expect(text).toMatch(/3 Pass 0 % 5\.00 % 5\.00 %/);
    expect(text).toContain("Limits from IEEE Std 519, 2014, Table 1");
    expect(text).toContain("Engineering estimate — compliance is established by accredited testing and the utility's interconnection rules.");
    expect(text).not.toContain("Unverified");
    // The verdict note is printed once, with the verdict, not again as a warning.
    expect(text.split("Engineering estimate").length - 1).toBe(1);
    expect(selectedOption(html, attribute(controlLabelled(html, "Limit table")!, "id")!)).toMatch(/IEEE Std 519-2014 Table 1/);
  });

  // The 4.0 % limit for the 3rd is Sinewright's IEEE Std 1547-2018 §7.3 row: from memory, unverified.
  it("within limits of a table entered from memory: gives no verdict, and the rows are informative only (issue #13)", () => {
    const html = renderBlock(
      [{ id: "hl2", calculator: "harmonic-limits", inputs: { standard: "ieee1547", listedTo: "50", spectrum: '[{"n":3,"value":2}]' } }],
      "hl2",
      false,
    );
    const text = textOf(html);
    expect(text).toMatch(/No verdict — these limits were entered from memory and are unverified: the comparison below is informative only\./);
    expect(text).not.toMatch(/Verdict \(estimate\): Pass/);
    expect(text).toMatch(/3 within \(informative\) 2\.00 % 4\.00 % 2\.00 %/);
    expect(text).toContain("Unverified: entered from memory");
  });
});

describe("read-only", () => {
  const html = renderBlock([quasiSquare], "qs1", false);
  const text = textOf(html);

  it("lists the inputs as text, with no form controls", () => {
    expect(html).not.toMatch(/<(input|select|textarea)\b/);
    expect(text).toMatch(/DC-link voltage vdc 48 V/);
    expect(text).toMatch(/hmax 49 \(default\)/);
    expect(text).toMatch(/Fundamental RMS v1Rms 37\.4 V/);
  });

  it("shows a referenced input with the value it resolved to", () => {
    const blocks: Block[] = [quasiSquare, { id: "qs2", calculator: "quasi-square", inputs: { vdc: "=qs1.v1Peak", alpha: "30 deg" } }];
    const readOnly = textOf(renderBlock(blocks, "qs2", false));
    expect(readOnly).toMatch(/DC-link voltage vdc =qs1\.v1Peak → 52\.9 V/);
  });
});

describe("edge cases", () => {
  it("a block not yet evaluated says so instead of showing stale or empty results", () => {
    const text = textOf(render(<CalculatorBlock blockId="qs1" calculatorId="quasi-square" inputs={{ vdc: "48 V" }} editable />));
    expect(text).toContain("Not computed yet");
    expect(text).toContain("Results appear once the sheet is computed.");
  });

  it("an unknown calculator is an error inside the block, not a crash", () => {
    const outcome: BlockOutcome = { ok: false, calculator: "boost", errors: [{ field: "calculator", message: 'unknown calculator "boost"' }] };
    const text = textOf(render(<CalculatorBlock blockId="b1" calculatorId="boost" inputs={{}} outcome={outcome} editable />));
    expect(text).toContain("b1 · Unknown calculator");
    expect(text).toContain('calculator: unknown calculator "boost"');
    expect(text).toContain("1 problem");
  });

  it("a choice typed outside its options stays visible in the select", () => {
    const html = renderBlock([{ id: "sp1", calculator: "spwm", inputs: { scheme: "tri-level" } }], "sp1", true);
    const scheme = controlLabelled(html, getCalculator("spwm")!.inputs.find((s) => s.key === "scheme")!.label)!;
    expect(selectedOption(html, attribute(scheme, "id")!)).toBe("tri-level");
    expect(attribute(scheme, "aria-invalid")).toBe("true");
  });

  it("input ids are unique when two blocks share the page", () => {
    const evaluation = evaluateSheet([quasiSquare, { ...quasiSquare, id: "qs2" }]);
    const html = render(
      <>
        <CalculatorBlock blockId="qs1" calculatorId="quasi-square" inputs={quasiSquare.inputs} outcome={evaluation.blocks.qs1} editable />
        <CalculatorBlock blockId="qs2" calculatorId="quasi-square" inputs={quasiSquare.inputs} outcome={evaluation.blocks.qs2} editable />
      </>,
    );
    const ids = [...html.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]);
    expect(new Set(ids).size).toBe(ids.length);
    expect(tagById(html, labels(html)[0]!.for)).toBeDefined();
  });
});

describe("every calculator in the catalogue", () => {
  // Inputs without a default get a typical value, so each calculator computes.
  const typical: Record<string, Record<string, string>> = {
    "lc-filter": { l: "2.2 mH", c: "10 uF", fsw: "20 kHz" },
    "dc-link": { p: "1.5 kW", vdc: "400 V", rippleVpp: "8 V" },
    "switch-stress": { vdc: "400 V", p: "3 kW", fsw: "20 kHz", rdsOn: "40 mohm", tr: "20 ns", tf: "20 ns", rthJa: "20 K/W", vRated: "650 V" },
    "harmonic-limits": { busVoltage: "400 V", listedTo: "50", spectrum: '[{"n":3,"value":2}]' },
    formula: { expr: "2 * 3" },
  };
  for (const calculator of calculators) {
    it(`${calculator.id}: computes and shows every scalar result it returns`, () => {
      const inputs = typical[calculator.id] ?? {};
      const evaluation = evaluateSheet([{ id: "b1", calculator: calculator.id, inputs }]);
      const outcome = evaluation.blocks.b1!;
      expect(outcome.ok, JSON.stringify(!outcome.ok && outcome.errors)).toBe(true);
      const text = textOf(render(<CalculatorBlock blockId="b1" calculatorId={calculator.id} inputs={inputs} outcome={outcome} editable />));
      expect(text).toContain(`b1 · ${calculator.title} Computed`);
      if (!outcome.ok) return;
      for (const spec of calculator.outputs.filter((o) => o.kind === "scalar" && o.key in outcome.results)) {
        expect(text, spec.key).toContain(`${spec.label} ${spec.key} ${(outcome.results[spec.key] as ScalarResult).display}`);
      }
    });
  }
});
