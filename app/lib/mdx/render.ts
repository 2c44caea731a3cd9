/**
 * The render tree of a checked source: a hast root of plain data, never code.
 *
 * - Calculator blocks, `Caution` and `Cite` become elements whose tagName is the
 *   component name and whose properties are the author's attributes, as strings;
 *   the React side maps those tag names to its components.
 * - The few allowed HTML elements become ordinary elements.
 * - Math is typeset by KaTeX here (`trust: false`: no links, classes or styles
 *   from TeX), so the page needs only KaTeX's stylesheet; a formula KaTeX cannot
 *   read shows its source in red instead of failing the sheet.
 * - Headings get ids from their text so sections can be linked; links that leave
 *   the app get rel="noopener noreferrer".
 * - Positions and other parser data are dropped: the tree is JSON.
 *
 * Only a source that `checkSheetSource` passed reaches this module, so depth is
 * bounded and recursion in the libraries below is safe.
 */
import type { Element, ElementContent, Properties, Root as HastRoot } from "hast";
import type { Heading, Nodes as MdastNodes, Root as MdastRoot } from "mdast";
import rehypeKatex from "rehype-katex";
import remarkRehype, { defaultHandlers, type Options as ToHastOptions } from "remark-rehype";
import { unified } from "unified";
import { VFile } from "vfile";
import { isExternalUrl } from "./urls";

type Handlers = NonNullable<ToHastOptions["handlers"]>;
type Handler = NonNullable<Handlers["paragraph"]>;
type JsxElement = Extract<MdastNodes, { type: "mdxJsxFlowElement" | "mdxJsxTextElement" }>;

const EXTERNAL_LINK_REL = ["noopener", "noreferrer"];

const KATEX_OPTIONS = {
  trust: false,
  strict: "ignore",
  output: "htmlAndMathml",
  // Keeps \rule and sizes from covering the page (em).
  maxSize: 20,
  // Bounds macro expansion (\def chains) so a formula cannot blow up.
  maxExpand: 1000,
} as const;

export function renderTree(root: MdastRoot): HastRoot {
  const processor = unified()
    .use(remarkRehype, { handlers: handlersForOneTree(), allowDangerousHtml: false })
    .use(rehypeKatex, KATEX_OPTIONS);
  const tree = processor.runSync(root, new VFile()) as HastRoot;
  return toPlainData(tree);
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
