/**
 * The render tree of a checked source: a hast root of plain data, never code.
 *
 * - Calculator blocks, `Caution` and `Cite` become elements whose tagName is the
 *   component name and whose properties are the author's attributes, as strings;
 *   the React side maps those tag names to its components.
 * - The few allowed HTML elements become ordinary elements.
 * - Math is typeset by KaTeX here (`math.ts`: `trust: false`, so no links,
 *   classes or styles from TeX), so the page needs only KaTeX's stylesheet; a
 *   formula KaTeX cannot read shows its source in red instead of failing the
 *   sheet. The server typesets in a worker with a deadline instead: it asks for
 *   the tree untypeset, then fills the formulas in (`mathIn`).
 * - Headings get ids from their text so sections can be linked; links that leave
 *   the app get rel="noopener noreferrer".
 * - Positions and other parser data are dropped: the tree is JSON.
 *
 * Only a source that `checkSheetSource` passed reaches this module, so depth is
 * bounded and recursion in the libraries below is safe.
 */
import type { Element, ElementContent, Properties, Root as HastRoot } from "hast";
import type { Heading, Nodes as MdastNodes, Root as MdastRoot } from "mdast";
import { fromHtmlIsomorphic } from "hast-util-from-html-isomorphic";
import remarkRehype, { defaultHandlers, type Options as ToHastOptions } from "remark-rehype";
import { unified } from "unified";
import { VFile } from "vfile";
import { typesetFormula } from "./math";
import { isExternalUrl } from "./urls";

type Handlers = NonNullable<ToHastOptions["handlers"]>;
type Handler = NonNullable<Handlers["paragraph"]>;
type JsxElement = Extract<MdastNodes, { type: "mdxJsxFlowElement" | "mdxJsxTextElement" }>;

const EXTERNAL_LINK_REL = ["noopener", "noreferrer"];

/** A formula's TeX and whether it stands on its own (display) → KaTeX's HTML. */
export type Typesetter = (tex: string, displayMode: boolean) => string;

/** The render tree; with `typeset: null` its formulas stay as TeX, to be typeset later with `mathIn`. */
export function renderTree(root: MdastRoot, typeset: Typesetter | null = typesetFormula): HastRoot {
  const processor = unified().use(remarkRehype, { handlers: handlersForOneTree(), allowDangerousHtml: false });
  const tree = toPlainData(processor.runSync(root, new VFile()) as HastRoot);
  if (typeset) for (const formula of mathIn(tree)) formula.typeset(typeset(formula.tex, formula.displayMode));
  return tree;
}

/** One formula of a tree: its TeX, and how to put its typeset HTML in its place. */
export interface TreeFormula {
  tex: string;
  displayMode: boolean;
  typeset(html: string): void;
}

/**
 * The formulas of a tree in document order, as remark-math leaves them: inline
 * (`math-inline`), display (`math-display`), and fenced ```math blocks (`<pre><code
 * class="language-math">`, shown as display).
 */
export function mathIn(tree: HastRoot): TreeFormula[] {
  type Parent = HastRoot | Element;
  const formulas: TreeFormula[] = [];
  const stack: { node: Parent | ElementContent; parent?: Parent; grandparent?: Parent }[] = [{ node: tree }];
  while (stack.length > 0) {
    const { node, parent, grandparent } = stack.pop()!;
    if (node.type === "element" && parent) {
      const classes = Array.isArray(node.properties.className) ? node.properties.className : [];
      const fenced = classes.includes("language-math") && node.tagName === "code" && parent.type === "element" && parent.tagName === "pre";
      if (fenced || classes.includes("math-inline") || classes.includes("math-display")) {
        // A fenced block replaces its whole <pre>.
        const [replaced, holder] = fenced ? [parent as Element, grandparent] : [node, parent];
        formulas.push({
          tex: textContent(node),
          displayMode: fenced || classes.includes("math-display"),
          typeset(html) {
            if (!holder) return;
            const content = toPlainData(fromHtmlIsomorphic(html, { fragment: true })).children as ElementContent[];
            holder.children.splice(holder.children.indexOf(replaced), 1, ...content);
          },
        });
        continue;
      }
    }
    if ("children" in node) {
      for (let i = node.children.length - 1; i >= 0; i--) stack.push({ node: node.children[i] as ElementContent, parent: node as Parent, grandparent: parent });
    }
  }
  return formulas;
}

function textContent(node: ElementContent): string {
  if (node.type === "text") return node.value;
  return "children" in node ? node.children.map((child) => textContent(child as ElementContent)).join("") : "";
}

/** Handlers hold the heading ids already given, so each tree gets its own. */
function handlersForOneTree(): Handlers {
  const usedIds = new Map<string, number>();

  const element: Handler = (state, node: JsxElement) => {
    const properties: Properties = {};
    for (const attribute of node.attributes) {
      if (attribute.type === "mdxJsxAttribute" && typeof attribute.value === "string") {
        properties[attribute.name] = attribute.value;
      }
    }
    if (node.name === "a" && typeof properties.href === "string" && isExternalUrl(properties.href)) {
      properties.rel = [...EXTERNAL_LINK_REL];
    }
    const result: Element = { type: "element", tagName: node.name ?? "span", properties, children: state.all(node) };
    state.patch(node, result);
    return state.applyData(node, result);
  };

  const headingId = (node: Heading): string => {
    const base = slug(textOf(node)) || "section";
    const seen = usedIds.get(base) ?? 0;
    usedIds.set(base, seen + 1);
    return seen === 0 ? base : `${base}-${seen}`;
  };

  const withExternalRel = (result: ElementContent | ElementContent[] | undefined, url: string) => {
    if (result && !Array.isArray(result) && result.type === "element" && isExternalUrl(url)) {
      result.properties.rel = [...EXTERNAL_LINK_REL];
    }
    return result;
  };

  return {
    mdxJsxFlowElement: element,
    mdxJsxTextElement: element,
    // Only comments reach here ({/* … */}); they render as nothing.
    mdxFlowExpression: () => undefined,
    mdxTextExpression: () => undefined,
    mdxjsEsm: () => undefined,
    heading(state, node: Heading) {
      const result = defaultHandlers.heading(state, node);
      result.properties.id = headingId(node);
      return result;
    },
    link(state, node) {
      return withExternalRel(defaultHandlers.link(state, node), node.url);
    },
    linkReference(state, node) {
      const definition = state.definitionById.get(node.identifier.toUpperCase());
      const result = defaultHandlers.linkReference(state, node);
      return definition ? withExternalRel(result, definition.url) : result;
    },
  };
}

function textOf(node: MdastNodes): string {
  if ("value" in node && typeof node.value === "string" && node.type !== "mdxFlowExpression" && node.type !== "mdxTextExpression") {
    return node.value;
  }
  return "children" in node ? node.children.map((child: MdastNodes) => textOf(child)).join("") : "";
}

/** "Output filter: L and C" → "output-filter-l-and-c". */
function slug(text: string): string {
  return text
    .toLowerCase()
    .replace(/[^\p{L}\p{N}\s-]/gu, "")
    .trim()
    .replace(/[\s-]+/g, "-");
}

/** Drops positions and parser data, and makes task-list boxes read-only, in place. */
function toPlainData(tree: HastRoot): HastRoot {
  const stack: { position?: unknown; data?: unknown; children?: unknown[] }[] = [tree];
  while (stack.length > 0) {
    const node = stack.pop()!;
    delete node.position;
    delete node.data;
    const element = node as Partial<Element>;
    if (element.type === "element" && element.tagName === "input" && element.properties?.type === "checkbox") {
      element.properties.readOnly = true;
    }
    if (Array.isArray(node.children)) for (const child of node.children) stack.push(child as (typeof stack)[number]);
  }
  return tree;
}
