/** Shared fixtures for the sheet-source tests: an invented calc sheet and tree helpers. */
import type { ElementContent, Root } from "hast";
import { expect } from "vitest";
import { checkSheetSource, type SourceKind, type SourceProblem } from "~/lib/mdx";

/** An invented sheet: prose, headings, inline and display math, two blocks (one refers to the other), a caution. */
export const REALISTIC_SHEET = `# Output stage of the 48 V bench inverter

The bridge makes a quasi-square wave with a zero interval $\\alpha$ at each edge. Its fundamental is

$$
V_{1,\\mathrm{rms}} = \\frac{2\\sqrt{2}}{\\pi} V_{dc} \\cos\\alpha
$$

<QuasiSquare id="qs1" vdc="48 V" alpha="30 deg" f="50 Hz" />

## Margin on the fundamental

Ten percent above $V_1$ covers the transformer's drop:

<Formula
  id="fx1"
  expr="=qs1.v1Rms * 1.1"
/>

<Caution>
The DC link holds **48 V** after switch-off. Discharge it before touching the bridge.
</Caution>

See [the filter notes](https://example.com/notes) and [method](#output-stage-of-the-48-v-bench-inverter).
`;

/** Checks a source that must be refused and hands back its problems. */
export function problemsOf(source: string, kind: SourceKind = "sheet"): SourceProblem[] {
  const checked = checkSheetSource(source, kind);
  expect(checked.ok, `expected the source to be refused:\n${source.slice(0, 200)}`).toBe(false);
  if (checked.ok) return [];
  return checked.problems;
}

/** Every element of a tree, in document order. */
export function elementsOf(tree: Root): Extract<ElementContent, { type: "element" }>[] {
  const found: Extract<ElementContent, { type: "element" }>[] = [];
  const stack: (Root | ElementContent)[] = [tree];
  while (stack.length > 0) {
    const node = stack.pop()!;
    if (node.type === "element") found.push(node);
    if ("children" in node) for (let i = node.children.length - 1; i >= 0; i--) stack.push(node.children[i] as ElementContent);
  }
  return found;
}

/** The text of a tree, as a reader would see it. */
export function textOf(node: Root | ElementContent): string {
  if (node.type === "text") return node.value;
  return "children" in node ? node.children.map((child) => textOf(child as ElementContent)).join("") : "";
}
