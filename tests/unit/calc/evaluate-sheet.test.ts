import { describe, expect, it } from "vitest";
import { evaluateCalculator, evaluateSheet, type SheetBlock } from "~/lib/calc/evaluate-sheet";
import type { ScalarResult } from "~/lib/calc/types";
import { ENGINE_VERSION } from "~/lib/calc/version";
import { expectClose } from "../../support/tolerance";

const value = (sheet: ReturnType<typeof evaluateSheet>, id: string, key: string) => {
  const block = sheet.blocks[id];
  if (!block?.ok) throw new Error(`${id} failed: ${JSON.stringify(block)}`);
  return (block.results[key] as ScalarResult).value;
};

const errorsOf = (sheet: ReturnType<typeof evaluateSheet>, id: string) => {
  const block = sheet.blocks[id];
  if (!block || block.ok) throw new Error(`${id} should have failed`);
  return block.errors;
};

describe("evaluateSheet: references and order", () => {
  // Listed out of order on purpose: the filter's vout refers to the bridge below it.
  const blocks: SheetBlock[] = [
    { id: "filter", calculator: "lc-filter", inputs: { l: "1 mH", c: "10 uF", rLoad: "10 ohm", fsw: "20 kHz", vout: "=hb.v1Rms" } },
    { id: "hb", calculator: "half-bridge", inputs: { vdc: "=link.value * 2" } },
    { id: "link", calculator: "formula", inputs: { expr: "200 V" } },
    { id: "note", calculator: "dc-link", inputs: { p: "1 kW", vdc: "400 V", rippleVpp: "4 V" } },
  ];
  const sheet = evaluateSheet(blocks);

  it("evaluates in dependency order, earliest ready block first", () => {
    expect(sheet.order).toEqual(["link", "hb", "filter", "note"]);
    expect(sheet.engineVersion).toBe(ENGINE_VERSION);
    expect(sheet.errors).toEqual([]);
  });

  it("carries values through references", () => {
    expectClose(value(sheet, "hb", "vrms"), 200, { rel: 1e-12 });
    const v1 = value(sheet, "hb", "v1Rms");
    expectClose(value(sheet, "filter", "icRms"), v1 * 2 * Math.PI * 50 * 10e-6, { rel: 1e-12 });
  });

  it("echoes the parsed SI inputs, JSON-safe", () => {
    const filter = sheet.blocks.filter!;
    expect(filter.ok && filter.inputs.c).toBe(1e-5);
    expect(JSON.parse(JSON.stringify(sheet))).toEqual(sheet);
  });

  it("is deterministic", () => {
    expect(JSON.stringify(evaluateSheet(blocks))).toBe(JSON.stringify(sheet));
  });
});

describe("evaluateSheet: failures stay local", () => {
  const sheet = evaluateSheet([
    { id: "a", calculator: "formula", inputs: { expr: "b.value + 1 V" } },
    { id: "b", calculator: "formula", inputs: { expr: "c.value" } },
    { id: "c", calculator: "formula", inputs: { expr: "a.value" } },
    { id: "d", calculator: "formula", inputs: { expr: "a.value * 2" } },
    { id: "self", calculator: "formula", inputs: { expr: "self.value" } },
    { id: "bad", calculator: "half-bridge", inputs: { vdc: "48 A" } },
    { id: "user", calculator: "formula", inputs: { expr: "bad.vrms" } },
    { id: "lost", calculator: "formula", inputs: { expr: "ghost.v1Rms" } },
    { id: "typo", calculator: "formula", inputs: { expr: "ok.nothing" } },
    { id: "ok", calculator: "half-bridge", inputs: { vdc: "48 V" } },
    { id: "mystery", calculator: "flux-capacitor", inputs: {} },
  ]);

  it("names a cycle on each block in it", () => {
    expect(errorsOf(sheet, "a")).toEqual([{ field: "expr", message: "cycle: a → b → c → a" }]);
    expect(errorsOf(sheet, "b")).toEqual([{ field: "expr", message: "cycle: b → c → a → b" }]);
    expect(errorsOf(sheet, "c")).toEqual([{ field: "expr", message: "cycle: c → a → b → c" }]);
    expect(errorsOf(sheet, "self")).toEqual([{ field: "expr", message: "cycle: self → self" }]);
  });

  it("says a block waits on a cycle", () => {
    expect(errorsOf(sheet, "d")).toEqual([{ field: "expr", message: 'depends on "a", which is caught in a cycle' }]);
  });

  it("names the failed dependency", () => {
    expect(errorsOf(sheet, "bad")[0]!.message).toBe("vdc must be a voltage; got 48 A");
    expect(errorsOf(sheet, "user")).toEqual([{ field: "expr", message: 'depends on "bad", which has errors' }]);
  });

  it("names an unknown block and an unknown output", () => {
    expect(errorsOf(sheet, "lost")).toEqual([{ field: "expr", message: 'there is no block "ghost" on this sheet' }]);
    expect(errorsOf(sheet, "typo")[0]!.message).toMatch(/block "ok" has no output "nothing"; it has vrms, v1Peak, v1Rms, vBlock/);
  });

  it("names an unknown calculator", () => {
    expect(errorsOf(sheet, "mystery")[0]).toMatchObject({ field: "calculator", message: expect.stringMatching(/^unknown calculator "flux-capacitor"; available: /) });
  });

  it("still computes the healthy block", () => {
    expectClose(value(sheet, "ok", "vrms"), 24, { rel: 1e-12 });
  });

  it("settles every block exactly once", () => {
    expect([...sheet.order].sort()).toEqual(Object.keys(sheet.blocks).sort());
    expect(sheet.order.slice(-5)).toEqual(["a", "b", "c", "d", "self"]);
  });
});

describe("evaluateSheet: malformed sheets", () => {
  it("makes duplicate ids an error, and refers to them as such", () => {
    const sheet = evaluateSheet([
      { id: "x", calculator: "half-bridge", inputs: { vdc: "48 V" } },
      { id: "x", calculator: "half-bridge", inputs: { vdc: "24 V" } },
      { id: "y", calculator: "formula", inputs: { expr: "x.vrms" } },
    ]);
    expect(errorsOf(sheet, "x")).toEqual([{ field: "id", message: 'duplicate block id "x": 2 blocks use it; ids must be unique' }]);
    expect(errorsOf(sheet, "y")).toEqual([{ field: "expr", message: 'refers to "x", but several blocks use that id' }]);
  });

  it("reports unusable ids at sheet level without dropping the other blocks", () => {
    const sheet = evaluateSheet([{ id: "__proto__", calculator: "formula", inputs: { expr: "1" } }, { id: 7 }, null, { id: "fine", calculator: "formula", inputs: { expr: "2 V" } }]);
    expect(sheet.errors.map((e) => e.field)).toEqual(["blocks[0].id", "blocks[1].id", "blocks[2].id"]);
    expect(Object.keys(sheet.blocks)).toEqual(["fine"]);
    expect(Object.getPrototypeOf(sheet.blocks)).toBe(Object.prototype);
  });

  it("refuses a sheet that is not a list", () => {
    expect(evaluateSheet({ blocks: [] }).errors).toEqual([{ field: "blocks", message: "a sheet must be a list of blocks {id, calculator, inputs}" }]);
  });
});

describe("evaluateCalculator", () => {
  it("returns results with the engine version", () => {
    const outcome = evaluateCalculator("half-bridge", { vdc: "48 V" });
    expect(outcome.ok && outcome.engineVersion).toBe(ENGINE_VERSION);
  });

  it("refuses an unknown calculator", () => {
    const outcome = evaluateCalculator("nope", {});
    expect(!outcome.ok && outcome.errors[0]!.field).toBe("calculator");
  });
});
