import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { calculators, getCalculator } from "~/lib/calc/registry";
import {
  blockSnippet,
  CALCULATOR_COMPONENTS,
  calculatorIdOf,
  checkSheetSource,
  componentNameOf,
  nextBlockId,
  setBlockInput,
  type SourceBlock,
} from "~/lib/mdx";
import { quoteAttributeValue } from "~/lib/mdx/components";

function blocksOf(source: string): SourceBlock[] {
  const checked = checkSheetSource(source);
  if (!checked.ok) throw new Error(`refused: ${JSON.stringify(checked.problems)}\n${source}`);
  return checked.blocks;
}

describe("setBlockInput", () => {
  const SHEET = '# Bridge\n\n<QuasiSquare id="qs1" vdc="48 V" alpha="30 deg" />\n\nText.\n\n<DcLink\n  id="dc1"\n  p="1 kW"\n/>\n';

  it("replaces a value in place and leaves the rest of the source as it was", () => {
    const [qs1] = blocksOf(SHEET);
    expect(setBlockInput(SHEET, qs1!, "vdc", "60 V")).toBe(SHEET.replace('vdc="48 V"', 'vdc="60 V"'));
  });

  it("adds a missing input after the last attribute of a one-line block", () => {
    const [qs1] = blocksOf(SHEET);
    expect(setBlockInput(SHEET, qs1!, "f", "60 Hz")).toBe(SHEET.replace('alpha="30 deg" />', 'alpha="30 deg" f="60 Hz" />'));
  });

  it("adds a missing input on a line of its own in a block written one attribute per line", () => {
    const [, dc1] = blocksOf(SHEET);
    expect(setBlockInput(SHEET, dc1!, "vdc", "400 V")).toBe(SHEET.replace('  p="1 kW"\n', '  p="1 kW"\n  vdc="400 V"\n'));
  });

  it("writes quotes and ampersands so that MDX reads back the same value", () => {
    const source = '<Formula id="fx1" expr="1" />\n';
    const [fx1] = blocksOf(source);
    const cases: [string, string][] = [
      ['2 * "x"', `expr='2 * "x"'`],
      [`it's "x"`, `expr="it's &quot;x&quot;"`],
      ["a &amp; b", 'expr="a &amp;amp; b"'],
      ["a & b", 'expr="a & b"'],
    ];
    for (const [value, written] of cases) {
      const edited = setBlockInput(source, fx1!, "expr", value);
      expect(edited).toBe(`<Formula id="fx1" ${written} />\n`);
      expect(blocksOf(edited)[0]!.inputs.expr).toBe(value);
    }
  });

  it("refuses, with words the editor can show, an unknown input, a line break and a stale block", () => {
    const [qs1] = blocksOf(SHEET);
    expect(() => setBlockInput(SHEET, qs1!, "voltage", "1 V")).toThrow('QuasiSquare has no input "voltage". Its inputs are: vdc, alpha, f, hmax.');
    expect(() => setBlockInput(SHEET, qs1!, "id", "qs2")).toThrow(/has no input "id"/);
    expect(() => setBlockInput(SHEET, qs1!, "vdc", "48\n\nV")).toThrow("A value must fit on one line.");
    expect(() => setBlockInput(SHEET, qs1!, "vdc", "48\u0000V")).toThrow(/control characters/);
    expect(() => setBlockInput(`Intro.\n${SHEET}`, qs1!, "vdc", "60 V")).toThrow(/The sheet changed since this block was read/);
  });

  // Values an author might type, and characters that matter to MDX.
  const valueText = fc.oneof(
    fc.string({ unit: fc.constantFrom('"', "'", "&", "amp;", "&#34;", "<", ">", "/>", "{", "}", " ", "\t", "a", "5", "=", "\\", "`", "*", "$", "µ", "Ω", "°", "😀"), maxLength: 12 }),
    fc.string({ unit: "grapheme", maxLength: 12 }).filter((text) => !/[\u0000-\u001f\u007f]/.test(text)),
  );
  const blockShape = fc.record({
    calculator: fc.constantFrom(...calculators.map((c) => c.id)),
    multiline: fc.boolean(),
    inputCount: fc.nat({ max: 4 }),
    values: fc.array(valueText, { minLength: 4, maxLength: 4 }),
  });

  type BlockShape = typeof blockShape extends fc.Arbitrary<infer Shape> ? Shape : never;

  function sheetOf(shapes: BlockShape[]): string {
    return shapes
      .map((shape, index) => {
        const component = componentNameOf(shape.calculator);
        const inputs = getCalculator(shape.calculator)!.inputs.slice(0, shape.inputCount);
        const attributes = [`id="b${index}"`, ...inputs.map((input, i) => `${input.key}=${quoteAttributeValue(shape.values[i]!)}`)];
        const tag = shape.multiline ? `<${component}\n${attributes.map((a) => `  ${a}\n`).join("")}/>` : `<${component} ${attributes.join(" ")} />`;
        return `## Part ${index}\n\nSome prose with $x_${index}$ in it.\n\n${tag}\n`;
      })
      .join("\n");
  }

  it("round-trips any value: the edited block reads back the new value and every other block is unchanged", () => {
    fc.assert(
      fc.property(
        fc.array(blockShape, { minLength: 1, maxLength: 4 }),
        fc.nat(),
        fc.nat(),
        valueText,
        (shapes, blockPick, keyPick, value) => {
          const source = sheetOf(shapes);
          const before = blocksOf(source);
          const target = before[blockPick % before.length]!;
          const keys = getCalculator(target.calculator)!.inputs.map((input) => input.key);
          const key = keys[keyPick % keys.length]!;

          const edited = setBlockInput(source, target, key, value);
          const after = blocksOf(edited);

          expect(after.map((b) => b.id)).toEqual(before.map((b) => b.id));
          const index = before.indexOf(target);
          expect(after[index]!.inputs).toEqual({ ...target.inputs, [key]: value });
          const delta = edited.length - source.length;
          // A new attribute in a block written one per line takes a line of its own.
          const lineDelta = edited.split("\n").length - source.split("\n").length;
          before.forEach((block, i) => {
            if (i < index) expect(after[i]).toEqual(block);
            if (i > index) {
              expect({ ...after[i]!, attributes: undefined }).toEqual({
                ...block,
                line: block.line + lineDelta,
                start: block.start + delta,
                end: block.end + delta,
                attributes: undefined,
              });
              expect(edited.slice(after[i]!.start, after[i]!.end)).toBe(source.slice(block.start, block.end));
            }
          });
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe("component names", () => {
  it("turn registry ids into component names and back", () => {
    const pairs: [string, string][] = [
      ["quasi-square", "QuasiSquare"],
      ["stepped-wave", "SteppedWave"],
      ["half-bridge", "HalfBridge"],
      ["six-step", "SixStep"],
      ["spwm", "Spwm"],
      ["lc-filter", "LcFilter"],
      ["harmonic-limits", "HarmonicLimits"],
      ["dc-link", "DcLink"],
      ["switch-stress", "SwitchStress"],
      ["formula", "Formula"],
    ];
    for (const [id, component] of pairs) {
      expect(componentNameOf(id)).toBe(component);
      expect(calculatorIdOf(component)).toBe(id);
    }
    expect(calculatorIdOf("Caution")).toBeUndefined();
    expect(calculatorIdOf("constructor")).toBeUndefined();
  });

  it("list every calculator once for the help page, with its prefix and inputs", () => {
    expect(CALCULATOR_COMPONENTS.map((c) => c.calculator)).toEqual(calculators.map((c) => c.id));
    expect(new Set(CALCULATOR_COMPONENTS.map((c) => c.idPrefix)).size).toBe(calculators.length);
    expect(CALCULATOR_COMPONENTS.find((c) => c.component === "QuasiSquare")).toMatchObject({ idPrefix: "qs", inputKeys: ["vdc", "alpha", "f", "hmax"] });
  });
});

describe("new blocks for the palette", () => {
  it("number ids per calculator, taking the lowest free number", () => {
    expect(nextBlockId("quasi-square", [])).toBe("qs1");
    expect(nextBlockId("quasi-square", ["qs1", "qs2", "sw1"])).toBe("qs3");
    expect(nextBlockId("quasi-square", ["qs2"])).toBe("qs1");
    expect(nextBlockId("switch-stress", ["sw1"])).toBe("sws1");
    expect(["stepped-wave", "half-bridge", "six-step", "spwm", "lc-filter", "harmonic-limits", "dc-link", "formula"].map((id) => nextBlockId(id, []))).toEqual([
      "sw1",
      "hb1",
      "six1",
      "pwm1",
      "lc1",
      "lim1",
      "dc1",
      "fx1",
    ]);
    expect(() => nextBlockId("nope", [])).toThrow(/no calculator "nope"/);
  });

  it("write a block with each default, required inputs empty and optional ones left out", () => {
    expect(blockSnippet("quasi-square", "qs1")).toBe('<QuasiSquare id="qs1" vdc="48 V" alpha="30 deg" f="50 Hz" hmax="49" />');
    expect(blockSnippet("half-bridge", "hb2")).toBe('<HalfBridge id="hb2" vdc="48 V" mode="split-capacitor" />');
    expect(blockSnippet("dc-link", "dc1")).toBe('<DcLink id="dc1" p="" pf="1" vdc="" f="50 Hz" rippleVpp="" />');
    expect(() => blockSnippet("quasi-square", "1x")).toThrow(/starts with a letter/);
  });

  it("write every calculator's block so that the sheet check reads it back with those inputs", () => {
    for (const calculator of calculators) {
      const id = nextBlockId(calculator.id, []);
      const snippet = blockSnippet(calculator.id, id);
      const [block] = blocksOf(`# New\n\n${snippet}\n`);
      expect(block).toMatchObject({ id, calculator: calculator.id });
      for (const input of calculator.inputs) {
        if (input.default !== undefined) expect(block!.inputs[input.key]).toBe(input.default);
      }
    }
  });

  it("lay out long blocks one attribute per line", () => {
    const snippet = blockSnippet("switch-stress", "sws1");
    expect(snippet.split("\n")[0]).toBe("<SwitchStress");
    expect(snippet.split("\n")[1]).toBe('  id="sws1"');
    expect(snippet.endsWith("\n/>")).toBe(true);
  });
});
