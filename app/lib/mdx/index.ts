/**
 * The untrusted-MDX pipeline: parse with @mdx-js/mdx's own parser (parse only —
 * nothing is ever compiled or run), refuse everything that could execute or smuggle
 * markup, extract calculator blocks with their source spans, and produce a render
 * tree that is plain data. See ./types.ts for the contract.
 */
import { createProcessor } from "@mdx-js/mdx";
import type { Element, ElementContent, Properties, Root as HastRoot } from "hast";
import type { Nodes as MdastNodes, Root as MdastRoot } from "mdast";
import type { MdxJsxAttribute, MdxJsxExpressionAttribute, MdxJsxFlowElement, MdxJsxTextElement } from "mdast-util-mdx-jsx";
import rehypeKatex from "rehype-katex";
import remarkGfm from "remark-gfm";
import remarkMath from "remark-math";
import remarkRehype from "remark-rehype";
import { unified } from "unified";
import { VFile } from "vfile";
import { calculators, getCalculator } from "../calc/registry";
import { SOURCE_LIMITS, type AttributeSpan, type CheckedSource, type SourceBlock, type SourceCitation, type SourceKind, type SourceProblem } from "./types";

export * from "./types";

/** Our component names: one per calculator (quasi-square → QuasiSquare). */
export function componentNameOf(calculatorId: string): string {
  return calculatorId
    .split("-")
    .map((part) => part.charAt(0).toUpperCase() + part.slice(1))
    .join("");
}

const CALCULATOR_BY_COMPONENT = new Map(calculators.map((c) => [componentNameOf(c.id), c.id]));

export function calculatorIdOf(componentName: string): string | undefined {
  return CALCULATOR_BY_COMPONENT.get(componentName);
}

export const CALCULATOR_COMPONENTS: { component: string; calculator: string }[] = calculators.map((c) => ({ component: componentNameOf(c.id), calculator: c.id }));

/** Plain HTML an author may use: inline typography only. */
export const SAFE_HTML_ELEMENTS = new Set(["sub", "sup", "br", "kbd", "abbr", "mark", "small"]);
const BLOCK_ID = /^[A-Za-z][A-Za-z0-9_]{0,31}$/;
const SAFE_URL = /^(https?:|mailto:|#|\/(?!\/)|\.{0,2}\/|[^:]*$)/i;

const processor = createProcessor({ format: "mdx", remarkPlugins: [remarkMath, remarkGfm] });

interface Walk {
  source: string;
  kind: SourceKind;
  problems: SourceProblem[];
  blocks: SourceBlock[];
  citations: SourceCitation[];
}

function at(node: { position?: { start: { line: number; column: number } } } | undefined) {
  return { line: node?.position?.start.line ?? 1, column: node?.position?.start.column ?? 1 };
}

function problem(walk: Walk, node: Parameters<typeof at>[0], message: string) {
  walk.problems.push({ message, ...at(node) });
}

/** Cheap scan for absurd nesting before the parser sees it (10,000 nested tags must fail fast, not overflow). */
function nestingDepth(source: string): { depth: number; line: number } {
  let depth = 0;
  let max = 0;
  let line = 1;
  let maxLine = 1;
  const tag = /<(\/?)([A-Za-z][\w.:-]*)[^<>]*?(\/?)>|\n/g;
  for (let m = tag.exec(source); m; m = tag.exec(source)) {
    if (m[0] === "\n") {
      line++;
      continue;
    }
    if (m[1]) depth = Math.max(0, depth - 1);
    else if (!m[3]) {
      depth++;
      if (depth > max) {
        max = depth;
        maxLine = line;
      }
    }
  }
  // Blockquote and list nesting, line by line.
  let quoteLine = 0;
  source.split("\n").forEach((text, i) => {
    const quotes = /^(\s*>)+/.exec(text)?.[0].split(">").length ?? 1;
    if (quotes - 1 > max) {
      max = quotes - 1;
      quoteLine = i + 1;
    }
  });
  return { depth: max, line: quoteLine || maxLine };
}

function attributeSpan(source: string, attribute: MdxJsxAttribute): AttributeSpan | undefined {
  const start = attribute.position?.start.offset;
  const end = attribute.position?.end.offset;
  if (start === undefined || end === undefined) return undefined;
  const text = source.slice(start, end);
  const eq = text.indexOf("=");
  if (eq < 0) return undefined;
  const quote = text.slice(eq + 1).search(/["']/);
  if (quote < 0) return undefined;
  return { valueStart: start + eq + 1 + quote + 1, valueEnd: end - 1 };
}

function checkJsx(walk: Walk, node: MdxJsxFlowElement | MdxJsxTextElement) {
  const name = node.name;
  if (name === null) return problem(walk, node, "Fragments (<>…</>) are not allowed: write the content without them.");
  if (/[.:]/.test(name)) return problem(walk, node, `<${name}> is not allowed: use one of our components or plain Markdown.`);
  const calculatorId = calculatorIdOf(name);
  const known = calculatorId || name === "Caution" || name === "Cite" || SAFE_HTML_ELEMENTS.has(name);
  if (!known) {
    const lower = name.toLowerCase();
    const hint = /^[a-z]/.test(name)
      ? `HTML element <${lower}> is not allowed here; only ${[...SAFE_HTML_ELEMENTS].map((t) => `<${t}>`).join(", ")} are.`
      : `unknown component <${name}>. Components are: ${CALCULATOR_COMPONENTS.map((c) => c.component).join(", ")}, Caution${walk.kind === "document" ? ", Cite" : ""}.`;
    return problem(walk, node, hint);
  }
  if (name === "Cite" && walk.kind !== "document") return problem(walk, node, "<Cite> belongs in project documents, not in calc sheets.");
  const values: Record<string, string> = {};
  const spans: Record<string, AttributeSpan> = {};
  const problemsBefore = walk.problems.length;
  for (const attribute of node.attributes as (MdxJsxAttribute | MdxJsxExpressionAttribute)[]) {
    if (attribute.type === "mdxJsxExpressionAttribute") {
      problem(walk, attribute.position ? attribute : node, `spread attributes ({…}) run code and are not allowed on <${name}>: write each attribute as name="value".`);
      continue;
    }
    const key = attribute.name;
    if (/^on/i.test(key)) {
      problem(walk, attribute, `event-handler attribute ${key} is not allowed: sheets never run scripts.`);
      continue;
    }
    if (key === "style" || key === "class" || key === "className") {
      problem(walk, attribute, `the ${key} attribute is not allowed: the sheet's look is set by Sinewright.`);
      continue;
    }
    if (attribute.value !== null && typeof attribute.value === "object") {
      problem(walk, attribute, `${key}={…} is an expression, which runs code; write ${key}="…" with the value in quotes.`);
      continue;
    }
    const value = attribute.value ?? "";
    if (/^\s*(javascript|vbscript|data):/i.test(value)) {
      problem(walk, attribute, `${key} holds a ${value.split(":")[0]}: URL, which is not allowed.`);
      continue;
    }
    values[key] = value;
    const span = attributeSpan(walk.source, attribute);
    if (span) spans[key] = span;
  }
  // An element with a refused attribute is reported once, for that attribute.
  if (walk.problems.length > problemsBefore) return;
  if (calculatorId) {
    const calculator = getCalculator(calculatorId)!;
    const { id, ...inputs } = values;
    if (!id) return problem(walk, node, `<${name}> needs an id, e.g. id="${nextBlockId(calculatorId, walk.blocks.map((b) => b.id))}", so other blocks can refer to it.`);
    if (!BLOCK_ID.test(id)) return problem(walk, node, `block id "${id}" must start with a letter and use only letters, digits and _ (at most 32).`);
    if (walk.blocks.some((b) => b.id === id)) return problem(walk, node, `block id "${id}" is used twice; each block needs its own.`);
    const keys = new Set(calculator.inputs.map((i) => i.key));
    for (const key of Object.keys(inputs)) {
      if (!keys.has(key)) problem(walk, node, `<${name}> has no input "${key}"; its inputs are ${[...keys].join(", ")}.`);
    }
    const start = node.position?.start.offset ?? 0;
    const end = node.position?.end.offset ?? start;
    const { id: _idSpan, ...inputSpans } = spans;
    walk.blocks.push({ id, calculator: calculatorId, component: name, inputs, ...at(node), start, end, attributes: inputSpans });
    if (walk.blocks.length > SOURCE_LIMITS.maxBlocks) problem(walk, node, `a sheet may hold at most ${SOURCE_LIMITS.maxBlocks} blocks; split it into several sheets.`);
  }
  if (name === "Cite") {
    if (!values.sheet || !values.rev) return problem(walk, node, `<Cite> needs sheet="CS-0001" and rev="A".`);
    walk.citations.push({ sheet: values.sheet, rev: values.rev, ...at(node) });
  }
}

function walkTree(walk: Walk, node: MdastNodes, depth: number) {
  if (depth > SOURCE_LIMITS.maxDepth) {
    problem(walk, node, `elements are nested more than ${SOURCE_LIMITS.maxDepth} deep; flatten the structure.`);
    return;
  }
  switch (node.type) {
    case "mdxjsEsm":
      problem(walk, node, "import and export statements are not allowed: sheets never run code. Use our components directly.");
      return;
    case "mdxFlowExpression":
    case "mdxTextExpression":
      problem(walk, node, "curly braces {…} run code in MDX and are not allowed; write \\{ for a literal brace, or use $…$ for math.");
      return;
    case "html":
      problem(walk, node, "raw HTML is not allowed here; use Markdown or our components.");
      return;
    case "mdxJsxFlowElement":
    case "mdxJsxTextElement":
      checkJsx(walk, node);
      break;
    case "link":
    case "definition":
      if (!SAFE_URL.test(node.url.trim())) problem(walk, node, `the link to "${node.url.slice(0, 40)}" is not allowed: use http(s), mailto or a path within Sinewright.`);
      break;
    case "image":
    case "imageReference":
      problem(walk, node, "images are not supported in sheets yet; describe the figure in words or attach it to the sheet.");
      return;
  }
  if ("children" in node) for (const child of node.children as MdastNodes[]) walkTree(walk, child, depth + 1);
}

function slug(text: string): string {
  return text.toLowerCase().normalize("NFKD").replace(/[^a-z0-9]+/g, "-").replace(/^-+|-+$/g, "").slice(0, 60) || "section";
}

function textOf(node: ElementContent | HastRoot): string {
  if (node.type === "text") return node.value;
  if ("children" in node) return (node.children as ElementContent[]).map(textOf).join("");
  return "";
}

function jsxToHast(state: { all: (node: MdastNodes) => ElementContent[] }, node: MdxJsxFlowElement | MdxJsxTextElement): Element {
  const properties: Properties = {};
  for (const attribute of node.attributes) if (attribute.type === "mdxJsxAttribute" && typeof attribute.value === "string") properties[attribute.name] = attribute.value;
  return { type: "element", tagName: node.name ?? "span", properties, children: state.all(node as MdastNodes) };
}

const toHtmlTree = unified()
  .use(remarkRehype, {
    handlers: { mdxJsxFlowElement: jsxToHast, mdxJsxTextElement: jsxToHast } as never,
  })
  .use(rehypeKatex, { throwOnError: false, strict: "ignore", trust: false, output: "htmlAndMathml" } as never);

function finishTree(tree: HastRoot): HastRoot {
  const seen = new Map<string, number>();
  const visit = (node: HastRoot | ElementContent) => {
    if (node.type === "element") {
      if (/^h[1-6]$/.test(node.tagName)) {
        const base = slug(textOf(node));
        const n = seen.get(base) ?? 0;
        seen.set(base, n + 1);
        node.properties = { ...node.properties, id: n ? `${base}-${n}` : base };
      }
      if (node.tagName === "a" && typeof node.properties.href === "string" && /^https?:/i.test(node.properties.href)) {
        node.properties = { ...node.properties, rel: ["noopener", "noreferrer"] };
      }
    }
    if ("children" in node) for (const child of node.children) visit(child as ElementContent);
  };
  visit(tree);
  // Plain data: positions dropped, everything JSON-safe.
  return JSON.parse(JSON.stringify(tree, (key, value) => (key === "position" ? undefined : value))) as HastRoot;
}

export function checkSheetSource(source: string, kind: SourceKind = "sheet"): CheckedSource {
  if (source.length > SOURCE_LIMITS.maxLength) {
    const size = source.length >= 1_000_000 ? `${(source.length / 1_000_000).toFixed(1)} MB` : `${Math.round(source.length / 1000)} KB`;
    return { ok: false, problems: [{ message: `The source is ${size}; a ${kind} may be at most 200 KB. Split it into several.`, line: 1, column: 1 }] };
  }
  const nesting = nestingDepth(source);
  if (nesting.depth > SOURCE_LIMITS.maxDepth) {
    return { ok: false, problems: [{ message: `elements are nested ${nesting.depth} deep; at most ${SOURCE_LIMITS.maxDepth} levels of nesting are allowed. Flatten the structure.`, line: nesting.line, column: 1 }] };
  }
  let mdast: MdastRoot;
  try {
    mdast = processor.parse(new VFile(source)) as MdastRoot;
  } catch (error) {
    const e = error as { line?: number; column?: number; reason?: string; message?: string; place?: { line?: number; column?: number; start?: { line: number; column: number } } };
    const place = e.place && "start" in e.place ? e.place.start : e.place;
    return { ok: false, problems: [{ message: `The MDX could not be read: ${e.reason ?? e.message ?? "syntax error"}.`, line: place?.line ?? e.line ?? 1, column: place?.column ?? e.column ?? 1 }] };
  }
  const walk: Walk = { source, kind, problems: [], blocks: [], citations: [] };
  walkTree(walk, mdast, 0);
  if (walk.problems.length > 0) return { ok: false, problems: walk.problems.sort((a, b) => a.line - b.line || a.column - b.column) };
  const tree = toHtmlTree.runSync(mdast as never) as HastRoot;
  return { ok: true, blocks: walk.blocks, citations: walk.citations, tree: finishTree(tree) };
}

/** Writes an edited input back into the source: replaces the attribute's value, or adds the attribute. */
export function setBlockInput(source: string, block: SourceBlock, key: string, value: string): string {
  if (value.includes('"')) throw new Error('A value cannot contain a double quote (").');
  const span = block.attributes[key];
  if (span) return source.slice(0, span.valueStart) + value + source.slice(span.valueEnd);
  const element = source.slice(block.start, block.end);
  const close = element.endsWith("/>") ? element.length - 2 : element.indexOf(">");
  const insertAt = block.start + close;
  const before = source.slice(0, insertAt).replace(/\s+$/, "");
  return `${before} ${key}="${value}" ${source.slice(insertAt)}`;
}

const ID_PREFIX: Record<string, string> = {
  "quasi-square": "qs",
  "stepped-wave": "sw",
  "half-bridge": "hb",
  "six-step": "six",
  spwm: "pwm",
  "lc-filter": "lc",
  "harmonic-limits": "lim",
  "dc-link": "dc",
  "switch-stress": "sws",
  formula: "fx",
};

export function nextBlockId(calculatorId: string, existingIds: string[]): string {
  const prefix = ID_PREFIX[calculatorId] ?? "b";
  const taken = new Set(existingIds);
  let n = 1;
  while (taken.has(`${prefix}${n}`)) n++;
  return `${prefix}${n}`;
}

/** A new block with every input at its default, for the editor's palette. */
export function blockSnippet(calculatorId: string, id: string): string {
  const calculator = getCalculator(calculatorId);
  if (!calculator) throw new Error(`unknown calculator ${calculatorId}`);
  // Required inputs without a default appear empty, so the block asks for them by name.
  const attributes = calculator.inputs
    .filter((input) => (input.default !== undefined && !input.default.includes('"')) || !input.optional)
    .map((input) => `${input.key}="${input.default ?? ""}"`);
  return `<${componentNameOf(calculatorId)} id="${id}" ${attributes.join(" ")} />`;
}
