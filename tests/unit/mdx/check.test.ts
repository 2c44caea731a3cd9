import { describe, expect, it } from "vitest";
import { checkSheetSource, SOURCE_LIMITS } from "~/lib/mdx";
import { elementsOf, problemsOf, REALISTIC_SHEET, textOf } from "./sheet";

function checkedOk(source: string, kind: "sheet" | "document" = "sheet") {
  const checked = checkSheetSource(source, kind);
  if (!checked.ok) throw new Error(`refused: ${JSON.stringify(checked.problems)}`);
  return checked;
}

describe("a realistic sheet", () => {
  const checked = checkedOk(REALISTIC_SHEET);

  it("lists both blocks with their calculators, inputs and places", () => {
    expect(checked.blocks.map(({ id, calculator, component, inputs, line, column }) => ({ id, calculator, component, inputs, line, column }))).toEqual([
      {
        id: "qs1",
        calculator: "quasi-square",
        component: "QuasiSquare",
        inputs: { vdc: "48 V", alpha: "30 deg", f: "50 Hz" },
        line: 9,
        column: 1,
      },
      { id: "fx1", calculator: "formula", component: "Formula", inputs: { expr: "=qs1.v1Rms * 1.1" }, line: 15, column: 1 },
    ]);
    expect(checked.citations).toEqual([]);
  });

  it("gives spans that point at the exact text of each element and each value", () => {
    for (const block of checked.blocks) {
      const element = REALISTIC_SHEET.slice(block.start, block.end);
      expect(element.startsWith(`<${block.component}`)).toBe(true);
      expect(element.endsWith("/>")).toBe(true);
      expect(REALISTIC_SHEET.slice(block.attributes.id!.valueStart, block.attributes.id!.valueEnd)).toBe(block.id);
      for (const [key, value] of Object.entries(block.inputs)) {
        const span = block.attributes[key]!;
        expect(REALISTIC_SHEET.slice(span.valueStart, span.valueEnd)).toBe(value);
        expect(REALISTIC_SHEET.slice(span.start, span.end)).toBe(`${key}="${value}"`);
      }
    }
  });

  it("renders blocks and the caution as named elements carrying the author's strings", () => {
    const elements = elementsOf(checked.tree);
    expect(elements.find((e) => e.tagName === "QuasiSquare")?.properties).toEqual({ id: "qs1", vdc: "48 V", alpha: "30 deg", f: "50 Hz" });
    expect(elements.find((e) => e.tagName === "Formula")?.properties).toEqual({ id: "fx1", expr: "=qs1.v1Rms * 1.1" });
    const caution = elements.find((e) => e.tagName === "Caution")!;
    expect(textOf(caution)).toContain("Discharge it before touching the bridge.");
    expect(elementsOf({ type: "root", children: caution.children }).some((e) => e.tagName === "strong")).toBe(true);
  });

  it("typesets inline and display math with KaTeX, keeping the TeX for screen readers and copying", () => {
    const elements = elementsOf(checked.tree);
    const classes = (e: (typeof elements)[number]) => (Array.isArray(e.properties.className) ? e.properties.className : []);
    expect(elements.filter((e) => classes(e).includes("katex")).length).toBe(3);
    expect(elements.filter((e) => classes(e).includes("katex-display")).length).toBe(1);
    expect(elements.some((e) => e.tagName === "math")).toBe(true);
    const annotations = elements.filter((e) => e.tagName === "annotation").map((e) => textOf(e));
    expect(annotations).toContain("V_{1,\\mathrm{rms}} = \\frac{2\\sqrt{2}}{\\pi} V_{dc} \\cos\\alpha");
    // No raw "$" delimiters are left in the prose.
    expect(textOf(checked.tree)).not.toContain("$");
  });

  it("gives headings ids from their text, and external links rel=noopener noreferrer", () => {
    const elements = elementsOf(checked.tree);
    expect(elements.filter((e) => /^h\d$/.test(e.tagName)).map((e) => e.properties.id)).toEqual([
      "output-stage-of-the-48-v-bench-inverter",
      "margin-on-the-fundamental",
    ]);
    const links = elements.filter((e) => e.tagName === "a");
    expect(links.map((e) => [e.properties.href, e.properties.rel])).toEqual([
      ["https://example.com/notes", ["noopener", "noreferrer"]],
      ["#output-stage-of-the-48-v-bench-inverter", undefined],
    ]);
  });

  it("gives a tree that is plain JSON, without parser positions", () => {
    expect(JSON.parse(JSON.stringify(checked.tree))).toEqual(checked.tree);
    expect(structuredClone(checked.tree)).toEqual(checked.tree);
    expect(JSON.stringify(checked.tree)).not.toContain('"position"');
  });

  it("gives the same result every time", () => {
    expect(JSON.stringify(checkSheetSource(REALISTIC_SHEET))).toBe(JSON.stringify(checked));
  });
});

describe("rendering details", () => {
  it("numbers repeated headings so each id is unique", () => {
    const tree = checkedOk("## Results\n\n## Results\n\n## Results\n").tree;
    expect(elementsOf(tree).map((e) => e.properties.id)).toEqual(["results", "results-1", "results-2"]);
  });

  it("drops MDX comments from the page", () => {
    const checked = checkedOk("Before {/* reviewer: recheck the ripple */} after.\n\n{/* a note of its own */}\n");
    expect(textOf(checked.tree)).not.toContain("reviewer");
    expect(textOf(checked.tree)).toContain("Before  after.");
  });

  it("shows a formula KaTeX cannot read in red instead of refusing the sheet", () => {
    const tree = checkedOk("Broken: $\\frac{1}{$ and fine: $x^2$\n").tree;
    const errors = elementsOf(tree).filter((e) => Array.isArray(e.properties.className) && e.properties.className.includes("katex-error"));
    expect(errors).toHaveLength(1);
    expect(textOf(errors[0]!)).toBe("\\frac{1}{");
  });

  it("renders the allowed HTML elements as ordinary elements", () => {
    const tree = checkedOk('Press <kbd>Ctrl</kbd>; V<sub>dc</sub>, f<sup>2</sup>, <abbr title="total harmonic distortion">THD</abbr>, <mark>new</mark>, <small>note</small><br />end\n').tree;
    expect(elementsOf(tree).map((e) => e.tagName)).toEqual(["p", "kbd", "sub", "sup", "abbr", "mark", "small", "br"]);
    expect(elementsOf(tree).find((e) => e.tagName === "abbr")?.properties).toEqual({ title: "total harmonic distortion" });
  });

  it("keeps blocks inside a caution and in running text", () => {
    const checked = checkedOk('<Caution>\n  Check <DcLink id="dc1" p="1 kW" vdc="400 V" rippleVpp="4 V" /> before use.\n</Caution>\n');
    expect(checked.blocks.map((b) => b.id)).toEqual(["dc1"]);
    expect(elementsOf(checked.tree).map((e) => e.tagName)).toEqual(["Caution", "p", "DcLink"]);
  });

  it("makes task-list boxes read-only", () => {
    const input = elementsOf(checkedOk("- [x] ripple checked\n- [ ] losses\n").tree).find((e) => e.tagName === "input");
    expect(input?.properties).toMatchObject({ type: "checkbox", disabled: true, readOnly: true });
  });
});

describe("offsets", () => {
  it("count a byte-order mark and CRLF line ends as the source string does", () => {
    const source = '\uFEFF# Title\r\n\r\n<SixStep id="six1" vdc="600 V" />\r\n';
    const block = checkedOk(source).blocks[0]!;
    expect(source.slice(block.start, block.end)).toBe('<SixStep id="six1" vdc="600 V" />');
    expect(source.slice(block.attributes.vdc!.valueStart, block.attributes.vdc!.valueEnd)).toBe("600 V");
    expect([block.line, block.column]).toEqual([3, 1]);
  });

  it("read single-quoted values and character references as MDX does", () => {
    const source = `<Formula id="fx1" expr='2 * "x"' />\n\n<Formula id="fx2" expr="a &amp; b" />\n`;
    const [first, second] = checkedOk(source).blocks;
    expect(first!.inputs.expr).toBe('2 * "x"');
    expect(source.slice(first!.attributes.expr!.valueStart, first!.attributes.expr!.valueEnd)).toBe('2 * "x"');
    expect(second!.inputs.expr).toBe("a & b");
    expect(source.slice(second!.attributes.expr!.valueStart, second!.attributes.expr!.valueEnd)).toBe("a &amp; b");
  });
});

describe("block problems", () => {
  it("asks for a missing id with an example", () => {
    expect(problemsOf('# A\n\n<LcFilter l="1 mH" />\n')).toEqual([
      { message: expect.stringMatching(/needs an id, e\.g\. <LcFilter id="lc1"/), line: 3, column: 1 },
    ]);
  });

  it("refuses an id that is not a short name", () => {
    for (const id of ["1qs", "qs-1", "", "q".repeat(33), "qs 1"]) {
      expect(problemsOf(`<SixStep id="${id}" />`)).toEqual([
        { message: expect.stringMatching(/starts with a letter and holds only letters, digits and _/), line: 1, column: 1 },
      ]);
    }
  });

  it("names the first use of a duplicate id", () => {
    expect(problemsOf('<SixStep id="a" />\n\n<Spwm id="a" />\n')).toEqual([
      { message: 'The id "a" is already used by the block on line 1. Give this block another id.', line: 3, column: 1 },
    ]);
  });

  it("lists the calculator's inputs for an unknown attribute", () => {
    expect(problemsOf('<QuasiSquare id="qs1" vdc="48 V" voltage="48 V" />')).toEqual([
      { message: 'QuasiSquare has no input "voltage". Its inputs are: vdc, alpha, f, hmax.', line: 1, column: 34 },
    ]);
  });

  it("refuses an attribute given twice, a value-less attribute and text inside a block", () => {
    expect(problemsOf('<SixStep id="a" vdc="1 V" vdc="2 V" />')[0]).toMatchObject({ message: "vdc is given twice; keep one.", column: 27 });
    expect(problemsOf('<SixStep id="a" vdc />')[0]).toMatchObject({ message: 'vdc has no value. Write it as vdc="…".', column: 17 });
    expect(problemsOf('<SixStep id="a">\n  hello\n</SixStep>')[0]?.message).toMatch(/holds no text/);
  });

  it("refuses more than the allowed number of blocks, at the first one too many", () => {
    const blocks = Array.from({ length: SOURCE_LIMITS.maxBlocks + 1 }, (_, i) => `<Formula id="fx${i + 1}" expr="${i}" />`);
    expect(problemsOf(blocks.join("\n\n"))).toEqual([
      { message: "A sheet may hold at most 200 calculator blocks. Split it into several sheets.", line: 2 * SOURCE_LIMITS.maxBlocks + 1, column: 1 },
    ]);
    expect(checkSheetSource(blocks.slice(0, SOURCE_LIMITS.maxBlocks).join("\n\n")).ok).toBe(true);
  });
});

describe("cautions and citations", () => {
  it("takes no attributes on a caution", () => {
    expect(problemsOf('<Caution kind="high">x</Caution>')[0]?.message).toMatch(/Caution takes no attributes/);
  });

  it("reads citations in project documents", () => {
    const checked = checkedOk('# Design review\n\nThe link is sized in <Cite sheet="CS-0003" rev="B" />.\n', "document");
    const source = '# Design review\n\nThe link is sized in <Cite sheet="CS-0003" rev="B" />.\n';
    expect(checked.citations).toEqual([{ sheet: "CS-0003", rev: "B", line: 3, column: 22, revSpan: expect.any(Object) }]);
    const span = checked.citations[0]!.revSpan;
    expect(source.slice(span.valueStart, span.valueEnd)).toBe("B");
    expect(source.slice(span.start, span.end)).toBe('rev="B"');
    expect(elementsOf(checked.tree).find((e) => e.tagName === "Cite")?.properties).toEqual({ sheet: "CS-0003", rev: "B" });
  });

  it("refuses calculators in project documents: calculations are checked in sheets and cited", () => {
    expect(problemsOf('Ripple:\n\n<DcLink id="dc1" />\n', "document")).toEqual([
      { message: expect.stringMatching(/Calculations belong in calc sheets.*cite its revision/), line: 3, column: 1 },
    ]);
  });

  it("refuses citations in calc sheets, and incomplete ones in documents", () => {
    expect(problemsOf('See <Cite sheet="CS-0003" rev="B" />.')).toEqual([
      { message: expect.stringMatching(/Citations belong in project documents/), line: 1, column: 5 },
    ]);
    expect(problemsOf('See <Cite sheet="CS-0003" />.', "document")[0]?.message).toMatch(/names a sheet and its revision/);
    expect(problemsOf('See <Cite sheet="CS-0003" rev="B" page="4" />.', "document")[0]?.message).toMatch(/Cite has no attribute "page"/);
  });
});

describe("syntax mistakes, in plain words at the right place", () => {
  it("points at a tag that is never closed", () => {
    expect(problemsOf("# Notes\n\n<Caution>\nDischarge first.\n")).toEqual([
      { message: "The tag <Caution> is never closed. Close it with </Caution>, or write <Caution /> if it holds nothing.", line: 3, column: 1 },
    ]);
  });

  it("points at a closing tag that does not match", () => {
    expect(problemsOf("Text <sub>x</sup> more")).toEqual([
      { message: "The closing tag </sup> does not match <sub>, opened on line 1. Close <sub> first.", line: 1, column: 12 },
    ]);
  });

  it("explains HTML comments, a bare less-than sign and unquoted values", () => {
    expect(problemsOf("<!-- draft -->")[0]).toMatchObject({ message: expect.stringMatching(/HTML comments .* not supported.*\{\/\* note \*\/\}/), line: 1, column: 2 });
    expect(problemsOf("Keep a <5 % ripple.")[0]).toMatchObject({ message: expect.stringMatching(/write \\< or use math/), line: 1, column: 9 });
    expect(problemsOf("<SixStep id=six1 />")[0]).toMatchObject({ message: 'Attribute values are written in quotes, e.g. vdc="48 V".', line: 1, column: 13 });
  });

  it("suggests the right case for a component written in lower case", () => {
    expect(problemsOf('<sixStep id="a" />')[0]?.message).toBe("There is no element <sixStep>; did you mean <SixStep>? Component names are case-sensitive.");
  });
});

describe("links", () => {
  it("allows web, mail and in-app addresses", () => {
    const checked = checkedOk("[a](https://example.com) [b](http://example.com) [c](mailto:lab@example.com) [d](/sheets/CS-0001) [e](#method) [f](notes)\n");
    expect(elementsOf(checked.tree).filter((e) => e.tagName === "a")).toHaveLength(6);
  });

  it("puts rel on reference-style and HTML links that leave the app", () => {
    const checked = checkedOk('[notes][ref] and <a href="//example.com/x">there</a>\n\n[ref]: https://example.com/notes\n');
    expect(elementsOf(checked.tree).filter((e) => e.tagName === "a").map((e) => e.properties.rel)).toEqual([
      ["noopener", "noreferrer"],
      ["noopener", "noreferrer"],
    ]);
  });

  it("refuses other schemes, however they are spelled or defined", () => {
    for (const source of ["[x](JavaScript:alert(1))", "[x](vbscript:msgbox)", "[x](data:text/html,hi)", "[x](file:///etc/passwd)", "[x][r]\n\n[r]: javascript:alert(1)"]) {
      expect(problemsOf(source)[0]?.message).toMatch(/Links may point only to web addresses/);
    }
  });

  it("refuses images until attachments exist", () => {
    expect(problemsOf("![scope](https://example.com/trace.png)")[0]).toMatchObject({ message: expect.stringMatching(/Images are not supported/), line: 1, column: 1 });
  });
});
