import type { ElementContent, Root } from "hast";
import rehypeKatex from "rehype-katex";
import { unified } from "unified";
import { describe, expect, it } from "vitest";
import { componentNameFor, SheetView } from "~/components/sheet-view";
import { evaluateSheet } from "~/lib/calc/evaluate-sheet";
import { attribute, controlLabelled, render, textOf } from "./markup";

const text = (value: string): ElementContent => ({ type: "text", value });
const element = (tagName: string, properties: Record<string, string | string[]> = {}, children: ElementContent[] = []): ElementContent => ({
  type: "element",
  tagName,
  properties,
  children,
});

/** A render tree as lib/mdx hands it over: prose, math already turned into KaTeX, blocks as named elements. */
function sheetTree(): Root {
  const tree: Root = {
    type: "root",
    children: [
      element("h2", {}, [text("Output stage")]),
      element("p", {}, [text("The fundamental is "), element("span", { className: ["math-inline"] }, [text("V_1 = \\frac{4 V_{dc}}{\\pi}\\cos\\alpha")]), text(".")]),
      element("QuasiSquare", { id: "qs1", vdc: "48 V", alpha: "30 deg" }),
      element("div", { className: ["math-display"] }, [text("\\mathrm{THD} = \\frac{\\sqrt{V_{rms}^2 - V_{1,rms}^2}}{V_{1,rms}}")]),
      element("p", {}, [text("The DC link is sized in "), element("Cite", { sheet: "CS-0001", rev: "B" }), text(".")]),
      element("Caution", {}, [element("p", {}, [text("Discharge the DC link before touching the bridge.")])]),
      element("DcLink", { id: "dc1", p: "1.5 kg", vdc: "400 V", rippleVpp: "4 V" }),
      element("LcFilter", { id: "lc1", l: "2.2 mH", c: "10 uF", fsw: "20 kHz" }),
    ],
  };
  return unified().use(rehypeKatex).runSync(tree) as Root;
}

const inputsById = {
  qs1: { vdc: "48 V", alpha: "30 deg" },
  dc1: { p: "1.5 kg", vdc: "400 V", rippleVpp: "4 V" },
  lc1: { l: "2.2 mH", c: "10 uF", fsw: "20 kHz" },
};
const evaluation = evaluateSheet([
  { id: "qs1", calculator: "quasi-square", inputs: inputsById.qs1 },
  { id: "dc1", calculator: "dc-link", inputs: inputsById.dc1 },
  { id: "lc1", calculator: "lc-filter", inputs: inputsById.lc1 },
]);

describe("the sheet view", () => {
  const html = render(<SheetView tree={sheetTree()} inputsById={inputsById} evaluation={evaluation} editable />);
  const page = textOf(html);

  it("sets the author's prose in the sheet face, with the math typeset by KaTeX (visible HTML and MathML)", () => {
    expect(html).toMatch(/<div class="prose-sheet[^"]*">\s*<h2>Output stage<\/h2>/);
    expect(html).toContain('<span class="katex">');
    expect(html).toMatch(/<math xmlns="http:\/\/www.w3.org\/1998\/Math\/MathML">/);
    expect(html).toContain('<annotation encoding="application/x-tex">V_1 = \\frac{4 V_{dc}}{\\pi}\\cos\\alpha</annotation>');
    // A display equation may scroll sideways on a phone, so it can take the keyboard focus.
    expect(html).toMatch(/<span class="katex-display" tabindex="0">/);
    // KaTeX's inline styles survive as style attributes.
    expect(html).toMatch(/<span class="strut" style="height:[\d.]+em;?(vertical-align:-?[\d.]+em)?;?"><\/span>/);
  });

  it("renders each calculator element as its block, wired to its inputs and results", () => {
    expect(page).toContain("qs1 · Quasi-square wave");
    // 4·48/π·cos 30°/√2 = 37.4 V (derived from V_n = (4·Vdc/nπ)·cos nα, Rashid, 3rd ed., §6.6 — published).
    expect(page).toMatch(/Fundamental RMS v1Rms 37\.4 V/);
    expect(attribute(controlLabelled(html, "DC-link voltage")!, "value")).toBe("48 V");
    expect(page).toContain("lc1 · LC output filter");
    expect(page).toContain("the switching frequency fsw = 20.0 kHz");
  });

  it("keeps computing every other block when one fails", () => {
    expect(page).toContain("dc1 did not compute.");
    expect(page).toMatch(/Output power \(p\): p must be a power/);
    expect(page).toMatch(/Corner frequency f0 1\.07 kHz/);
  });

  it("renders Caution as a callout that keeps the author's words", () => {
    expect(html).toMatch(/<div role="note"[^>]*>[\s\S]*Caution[\s\S]*Discharge the DC link before touching the bridge\./);
  });

  it("shows a citation as plain text until citation targets are given", () => {
    expect(page).toContain("The DC link is sized in CS-0001 rev B.");
    expect(html).not.toContain("/sheets/CS-0001");
  });

  it("links a citation to its revision, numbers it, and shows its state when the page knows it", () => {
    const cited = render(
      <SheetView
        tree={sheetTree()}
        inputsById={inputsById}
        evaluation={evaluation}
        citations={{ "CS-0001@B": { title: "DC-link sizing", state: "superseded", words: "superseded by revision C (verified)", href: "/sheets/CS-0001/revisions/B", reference: 2 } }}
      />,
    );
    const link = cited.match(/<a href="\/sheets\/CS-0001\/revisions\/B"[^>]*>[\s\S]*?<\/a>/)?.[0] ?? "";
    expect(textOf(link)).toBe("CS-0001 rev B");
    expect(link).toContain('title="DC-link sizing: superseded by revision C (verified)"');
    expect(textOf(cited)).toMatch(/CS-0001 rev B\s*\[2\]\s*⇡\s*Superseded/);
    expect(cited).toContain('href="#ref-2"');
    const missing = render(<SheetView tree={sheetTree()} inputsById={inputsById} evaluation={evaluation} citations={{}} />);
    expect(textOf(missing)).toContain("CS-0001 rev B (not found)");
  });

  it("read-only, it shows no form controls at all", () => {
    const readOnly = render(<SheetView tree={sheetTree()} inputsById={inputsById} evaluation={evaluation} editable={false} />);
    expect(readOnly).not.toMatch(/<(input|select|textarea)\b/);
    expect(textOf(readOnly)).toMatch(/DC-link voltage vdc 48 V/);
  });

  it("falls back to the element's own attributes for a block the page did not list", () => {
    const tree: Root = { type: "root", children: [element("QuasiSquare", { id: "qs7", vdc: "24 V" })] };
    const lone = render(<SheetView tree={tree} inputsById={{}} evaluation={undefined} editable />);
    expect(attribute(controlLabelled(lone, "DC-link voltage")!, "value")).toBe("24 V");
    expect(textOf(lone)).toContain("Not computed yet");
  });

  it("names calculator components as the MDX source does", () => {
    expect(["quasi-square", "stepped-wave", "lc-filter", "spwm", "harmonic-limits", "dc-link"].map(componentNameFor)).toEqual([
      "QuasiSquare",
      "SteppedWave",
      "LcFilter",
      "Spwm",
      "HarmonicLimits",
      "DcLink",
    ]);
  });
});
