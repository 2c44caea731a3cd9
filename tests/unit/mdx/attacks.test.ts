// Authors are not trusted: everything that could run code or smuggle markup is
// refused with a message at the right place, and none of it reaches any output.
import { describe, expect, it } from "vitest";
import { checkSheetSource } from "~/lib/mdx";
import { elementsOf, problemsOf } from "./sheet";

interface Attack {
  name: string;
  source: string;
  /** Where the (first) problem must point. */
  line: number;
  column: number;
  message: RegExp;
  /** Text of the attack that must not appear anywhere in the result. */
  payload: string;
}

const ATTACKS: Attack[] = [
  { name: "an ESM import", source: 'import x from "y"\n\n# Hi', line: 1, column: 1, message: /import and export run code/, payload: '"y"' },
  { name: "an ESM export", source: "# Hi\n\nexport const a = 1\n", line: 3, column: 1, message: /import and export run code/, payload: "const a" },
  { name: "an expression on its own line", source: "# Hi\n\n{alert(1)}\n", line: 3, column: 1, message: /Curly braces run code.*\\\{/, payload: "alert" },
  { name: "an inline expression", source: "Total: {process.exit()} V", line: 1, column: 8, message: /Curly braces run code/, payload: "process" },
  { name: "a script element", source: "Hi\n\n<script>alert(1)</script>", line: 3, column: 1, message: /<script> is not allowed.*Allowed HTML: <a>/, payload: "alert" },
  { name: "an iframe", source: '<iframe src="https://example.org/frame"></iframe>', line: 1, column: 1, message: /<iframe> is not allowed/, payload: "example.org" },
  { name: "an object", source: '<object data="x.swf"></object>', line: 1, column: 1, message: /<object> is not allowed/, payload: "x.swf" },
  { name: "a style element", source: '<style>{"body{display:none}"}</style>', line: 1, column: 1, message: /<style> is not allowed/, payload: "display" },
  { name: "an image with an unquoted source", source: '<img src=x onerror="alert(1)">', line: 1, column: 10, message: /values are written in quotes/, payload: "alert" },
  { name: "an onerror handler", source: '<img src="x" onerror="alert(1)" />', line: 1, column: 1, message: /<img> is not allowed/, payload: "alert" },
  { name: "a javascript: href", source: 'Go <a href="javascript:alert(1)">here</a>', line: 1, column: 7, message: /script or data address/, payload: "alert" },
  { name: "a javascript: Markdown link", source: "[x](javascript:alert(1))", line: 1, column: 1, message: /Links may point only to web addresses/, payload: "alert" },
  { name: "an expression attribute", source: '<QuasiSquare id="a" vdc={48} />', line: 1, column: 21, message: /value of vdc is in curly braces.*vdc="…"/, payload: "48" },
  { name: "a spread attribute", source: "<QuasiSquare {...props} />", line: 1, column: 14, message: /Spread attributes/, payload: "props" },
  { name: "an unknown component", source: "# Hi\n\n<Unknown />", line: 3, column: 1, message: /no component <Unknown>\. A calc sheet can use: QuasiSquare, SteppedWave, .*Formula, MeasuredWaveform, Caution\./, payload: "zzz" },
  { name: "a member name", source: "<QuasiSquare.Inner />", line: 1, column: 1, message: /names with "\." or ":" are not allowed/, payload: "Inner" },
  { name: "a namespaced name", source: "<svg:rect />", line: 1, column: 1, message: /names with "\." or ":" are not allowed/, payload: "rect" },
  { name: "a style attribute", source: 'Hi <sub style="position:fixed">x</sub>', line: 1, column: 9, message: /style attributes are not allowed/, payload: "fixed" },
  { name: "a handler on a component", source: '<Caution onClick="steal()">x</Caution>', line: 1, column: 10, message: /Event handlers such as onClick run code/, payload: "steal" },
  { name: "a data: value on a block", source: '<SixStep id="six1" vdc="data:text/html;base64,PHNjcmlwdD4=" />', line: 1, column: 20, message: /script or data address/, payload: "base64" },
];

describe.each(ATTACKS)("$name", ({ source, line, column, message, payload }) => {
  const checked = checkSheetSource(source);

  it("is refused with a clear message at its line and column", () => {
    expect(checked.ok).toBe(false);
    expect(problemsOf(source)).toContainEqual({ message: expect.stringMatching(message), line, column });
  });

  it("leaves nothing of itself in the result", () => {
    expect(Object.keys(checked).sort()).toEqual(["ok", "problems"]);
    expect(JSON.stringify(checked)).not.toContain(payload);
  });
});

describe("sources too large or too deep", () => {
  it("refuses 5 MB without reading it", () => {
    const problems = problemsOf("x".repeat(5_000_000));
    expect(problems).toEqual([{ message: "The source is 5.0 MB; a sheet may be at most 200 KB. Split it into several sheets.", line: 1, column: 1 }]);
    expect(problemsOf("x".repeat(200_001), "document")[0]?.message).toBe(
      "The source is 201 KB; a project document may be at most 200 KB. Split it into several documents.",
    );
    expect(checkSheetSource("x".repeat(200_000)).ok).toBe(true);
  });

  it("refuses 10,000 nested spans before parsing, without a stack overflow", () => {
    const problems = problemsOf("<span>".repeat(10_000) + "deep" + "</span>".repeat(10_000));
    // Found by the text scan, where the estimate first passes four times the limit.
    expect(problems).toEqual([{ message: expect.stringMatching(/nested more than 64 levels deep here/), line: 1, column: 1 + 6 * 256 }]);
  });

  it("refuses 10,000 nested divs, quotes and lists", () => {
    expect(problemsOf("<div>\n".repeat(10_000) + "x\n" + "</div>\n".repeat(10_000))[0]?.message).toMatch(/nested more than 64 levels/);
    expect(problemsOf("> ".repeat(10_000) + "deep\n")[0]?.message).toMatch(/Lists and quotes are nested more than 64 levels/);
    expect(problemsOf("- ".repeat(10_000) + "deep\n")[0]?.message).toMatch(/Lists and quotes are nested more than 64 levels/);
    const indented = Array.from({ length: 300 }, (_, level) => `${"  ".repeat(level)}- level ${level}`).join("\n");
    expect(problemsOf(indented)[0]).toMatchObject({ message: expect.stringMatching(/Lists and quotes are nested/), line: 33 });
  });

  it("refuses nesting past the limit that the text scan lets through, on the parsed tree", () => {
    const nested = (depth: number) => "<sub>".repeat(depth) + "x" + "</sub>".repeat(depth);
    // The paragraph is one level, so 63 subs reach depth 64 exactly; the text inside nests nothing.
    expect(checkSheetSource(nested(63)).ok).toBe(true);
    expect(problemsOf(nested(64))).toEqual([{ message: expect.stringMatching(/nested more than 64 levels deep/), line: 1, column: 1 + 5 * 63 }]);
  });

  it("refuses shapes that make the parser quadratic", () => {
    expect(problemsOf("a* ".repeat(60_000))[0]?.message).toMatch(/more than 1,000 emphasis marks/);
    expect(problemsOf("a] ".repeat(60_000))[0]?.message).toMatch(/more than 1,000 square brackets/);
    expect(problemsOf("> quote\n\n".repeat(5_000))[0]?.message).toMatch(/more than 1,000 list items and quotes/);
    expect(problemsOf("*a _".repeat(2_000) + "b_ c* ".repeat(2_000))[0]?.message).toMatch(/Emphasis .* nested more than 16 levels/);
    expect(problemsOf("![".repeat(10_000) + "x" + "](y)".repeat(10_000))[0]?.message).toMatch(/Square brackets are nested/);
    expect(problemsOf("{".repeat(10_000) + "}".repeat(10_000))[0]?.message).toMatch(/Curly braces are nested/);
    expect(problemsOf("x\n\n".repeat(20_000))[0]).toEqual({ message: "The source has more than 10,000 lines. Split it into several sheets.", line: 10_001, column: 1 });
  });

  it("refuses formulas too long to typeset", () => {
    const formula = `$$\n${"x+".repeat(5_000)}x\n$$\n\n`;
    expect(problemsOf(formula.repeat(3))[0]).toMatchObject({ message: expect.stringMatching(/more than 20,000 characters of TeX/), line: 5 });
  });

  it("still reads long ordinary sheets: many paragraphs, list items and links", () => {
    const paragraph = "The *ripple* on the **DC link** stays under [the limit](https://example.com) for $f_{sw} = 20$ kHz.\n\n";
    const list = Array.from({ length: 300 }, (_, i) => `- item ${i}`).join("\n") + "\n\n";
    expect(checkSheetSource(paragraph.repeat(400) + list).ok).toBe(true);
    const exactlyAtTheLineLimit = "x\n".repeat(10_000);
    expect(checkSheetSource(exactlyAtTheLineLimit).ok).toBe(true);
  });
});

describe("what reaches the render tree", () => {
  // Everything allowed, pushed to its edges.
  const EDGY_SHEET = [
    "# Edges",
    "",
    'An <a href="https://example.com" title="ok">outside link</a>, <abbr title="pulse-width modulation">PWM</abbr>, [inside](/sheets/CS-0001).',
    "",
    "TeX cannot link or style: $\\href{javascript:alert(1)}{x}$, $\\htmlStyle{color:red}{y}$, $\\url{javascript:alert(2)}$, $\\rule{10em}{10em}$.",
    "",
    "<Caution>",
    "  Unicode and entities stay text: &lt;script&gt; &#x3C;iframe&#x3E; <kbd>{'{'}</kbd>",
    "</Caution>",
    "",
    "```html",
    '<script>alert("in a code block")</script>',
    "```",
  ].join("\n");

  it("holds no scripts, frames, styles, handlers or script addresses", () => {
    // The {'{'} above is an expression, so take it out for this check.
    const checked = checkSheetSource(EDGY_SHEET.replace("<kbd>{'{'}</kbd>", "<kbd>\\{</kbd>"));
    if (!checked.ok) throw new Error(JSON.stringify(checked.problems));
    const elements = elementsOf(checked.tree);
    const forbidden = new Set(["script", "iframe", "style", "object", "embed", "link", "meta", "form", "img", "base", "frame"]);
    expect(elements.filter((e) => forbidden.has(e.tagName))).toEqual([]);
    for (const element of elements) {
      for (const [name, value] of Object.entries(element.properties)) {
        expect(name, `${element.tagName} has ${name}`).not.toMatch(/^on/i);
        const text = (Array.isArray(value) ? value.join(" ") : String(value)).replace(/\s/g, "").toLowerCase();
        expect(text, `${element.tagName}.${name}`).not.toMatch(/javascript:|vbscript:|data:/);
      }
    }
    expect(elements.filter((e) => e.tagName === "a").map((e) => e.properties.href)).toEqual(["https://example.com", "/sheets/CS-0001"]);
    // The largest rule a formula may draw is typeset at its size (larger ones are refused by the check).
    const sizes = elements.flatMap((e) => Object.values(e.properties).map(String)).filter((value) => /\d+em/.test(value));
    expect(sizes.some((value) => value.includes("10em"))).toBe(true);
  });

  it("refuses the brace the same sheet writes as an expression", () => {
    expect(problemsOf(EDGY_SHEET)[0]).toMatchObject({ message: expect.stringMatching(/Curly braces run code/), line: 8 });
  });
});

// A formula may not define or re-expand macros: `\def\a{…100 characters…}` used 199 times
// takes KaTeX over 3 s even with its expansion limit, and the cost grows with the square.
const bomb = (define: string, use: string, times: number) => `${define}${use.repeat(times)}`;
const MACRO_BOMBS: { name: string; source: string; command: string; line: number; column: number }[] = [
  { name: "\\def with a long body", source: `Ripple: $${bomb(`\\def\\a{${"x+".repeat(50)}}`, "\\a", 400)}$`, command: "\\def", line: 1, column: 10 },
  { name: "\\gdef doubling its argument", source: `$$\n${bomb("\\gdef\\b#1{#1#1}", "\\b{", 30)}x${"}".repeat(30)}\n$$`, command: "\\gdef", line: 2, column: 1 },
  { name: "\\edef", source: "# Bomb\n\n$\\edef\\c{\\c\\c}\\c$", command: "\\edef", line: 3, column: 2 },
  { name: "\\xdef", source: "$\\xdef\\d{ddd}\\d$", command: "\\xdef", line: 1, column: 2 },
  { name: "\\let to a long macro", source: "Text $x$ and $\\let\\e\\frac \\e12$", command: "\\let", line: 1, column: 15 },
  { name: "\\futurelet", source: "$\\futurelet\\f\\g\\h$", command: "\\futurelet", line: 1, column: 2 },
  { name: "\\newcommand", source: `$\\newcommand{\\n}[1]{#1#1#1#1}${"\\n{".repeat(12)}x${"}".repeat(12)}$`, command: "\\newcommand", line: 1, column: 2 },
  { name: "\\renewcommand of a built-in", source: "$\\renewcommand{\\sqrt}[1]{#1#1}\\sqrt{\\sqrt{\\sqrt{x}}}$", command: "\\renewcommand", line: 1, column: 2 },
  { name: "\\providecommand", source: "$\\providecommand{\\p}{ppp}\\p\\p$", command: "\\providecommand", line: 1, column: 2 },
  { name: "\\expandafter chains", source: `$${"\\expandafter".repeat(50)}x$`, command: "\\expandafter", line: 1, column: 2 },
  { name: "\\global before a definition", source: "$\\global\\def\\g{ggg}\\g$", command: "\\global", line: 1, column: 2 },
  { name: "\\char by number", source: 'Fine $x^2$.\n\nThen $\\char"2713$ forged', command: "\\char", line: 3, column: 7 },
  { name: "KaTeX's internal \\@ifnextchar", source: "$\\@ifnextchar x{a}{b}x$", command: "\\@ifnextchar", line: 1, column: 2 },
  { name: "\\TextOrMath", source: "$\\TextOrMath{a}{b}$", command: "\\TextOrMath", line: 1, column: 2 },
  { name: "a definition deep in a display formula", source: "# Sheet\n\n$$\n\\begin{aligned}\nv &= 1 \\\\\n\\def\\z{zz} w &= \\z\n\\end{aligned}\n$$", command: "\\def", line: 6, column: 1 },
  { name: "a definition in a fenced math block", source: "```math\nx = 1 \\newcommand\\q{q}\\q\n```", command: "\\newcommand", line: 2, column: 7 },
  { name: "a definition hidden in \\text", source: "$\\text{a \\def\\t{tt}\\t}$", command: "\\def", line: 1, column: 10 },
];

describe.each(MACRO_BOMBS)("a macro bomb: $name", ({ source, command, line, column }) => {
  it("is refused with a message naming the command, at its line and column, and nothing is typeset", () => {
    const checked = checkSheetSource(source);
    expect(checked.ok).toBe(false);
    expect(problemsOf(source)).toContainEqual({ message: expect.stringMatching(new RegExp(`^${command.replace(/[\\@]/g, "\\$&")} `)), line, column });
    expect(Object.keys(checked).sort()).toEqual(["ok", "problems"]);
  });
});

// Sizes that would move a formula over the page around it: the title block, the state, the stamp.
const OVERLAYS: { name: string; tex: string; message: RegExp }[] = [
  { name: "a kern far back", tex: "\\kern-500em \\textsf{VERIFIED}", message: /^\\kern moves by -500em; a formula may move back or down by at most 3 em/ },
  { name: "a math kern far back", tex: "\\mkern-9000mu \\checkmark", message: /^\\mkern moves by -9000mu/ },
  { name: "a math skip far back", tex: "\\mskip-100mu x", message: /^\\mskip moves by -100mu/ },
  { name: "\\hspace far back", tex: "\\hspace{-400em}\\text{Checked}", message: /^\\hspace moves by -400em/ },
  { name: "\\hspace* far back in points", tex: "\\hspace*{ -4000pt }x", message: /^\\hspace moves by -4000pt/ },
  { name: "a raise far down", tex: "\\raisebox{-300em}{\\text{Verified}}", message: /^\\raisebox moves by -300em/ },
  { name: "a raise far up", tex: "\\raisebox{300em}{\\text{Verified}}", message: /^\\raisebox gives the size 300em; sizes in a formula may be at most 10 em/ },
  { name: "a huge rule", tex: "\\rule{500em}{500em}", message: /^\\rule gives the size 500em/ },
  { name: "a rule in inches", tex: "\\rule[-2in]{1em}{1em}", message: /^\\rule moves by -2in/ },
  { name: "a line break far up", tex: "\\begin{aligned}a\\\\[-300em] b\\end{aligned}", message: /^\\\\ moves by -300em/ },
  { name: "many small kerns back", tex: "\\kern-2.9em\\kern-2.9em\\kern-2.9em x", message: /moves back or down by more than 6 em in all/ },
  { name: "a coloured box", tex: "\\colorbox{green}{\\text{VERIFIED}}", message: /^\\colorbox paints a background/ },
  { name: "a framed coloured box", tex: "\\fcolorbox{red}{green}{OK}", message: /^\\fcolorbox paints a background/ },
];

describe.each(OVERLAYS)("an overlay attempt: $name", ({ tex, message }) => {
  it("is refused with a message saying the bound", () => {
    const source = `# Title\n\nResult: $${tex}$`;
    expect(problemsOf(source)).toContainEqual({ message: expect.stringMatching(message), line: 3, column: expect.any(Number) });
  });
});

describe("ordinary formulas with spacing, raises, rules and overlaps", () => {
  it("are typeset as before", () => {
    const ordinary = [
      "$a\\kern-0.2em b$, $\\mkern-18mu x$, $\\hspace{2em}y$, $\\raisebox{0.5ex}{z}$, $\\rule{5em}{0.4pt}$, $\\mathllap{=}x$, $\\color{red}{x}$",
      "",
      "$$\n\\begin{aligned}\nv &= L\\frac{di}{dt} \\\\[4pt]\n\\hat I &= \\sqrt{2}\\,\\frac{P}{pf\\,V_{out}}\n\\end{aligned}\n$$",
      "",
      "$\\operatorname{THD} = \\frac{\\sqrt{\\sum_{h=2}^{\\infty} V_h^2}}{V_1} \\neq 0 \\dots$",
    ].join("\n");
    const checked = checkSheetSource(ordinary);
    if (!checked.ok) throw new Error(JSON.stringify(checked.problems));
    expect(elementsOf(checked.tree).some((e) => String(e.properties.className).includes("katex-error"))).toBe(false);
    expect(elementsOf(checked.tree).filter((e) => Array.isArray(e.properties.className) && e.properties.className.includes("katex")).length).toBe(9);
  });
});
