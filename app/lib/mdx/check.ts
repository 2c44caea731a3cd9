/**
 * `checkSheetSource`: read an author's MDX without running any of it.
 *
 * The text passes the cheap limits in `prescan.ts`, then @mdx-js/mdx's own parser
 * turns it into an mdast tree (parse only: nothing is compiled or evaluated). One
 * walk over that tree refuses whatever could run code or smuggle markup and lists
 * the calculator blocks and citations with their positions in the original text.
 * Only a source with no problems gets a render tree (see `render.ts`).
 */
import { createProcessor } from "@mdx-js/mdx";
import type { Nodes as MdastNodes, Root as MdastRoot } from "mdast";
import remarkGfm from "remark-gfm";
import remarkMath from "remark-math";
import { VFile } from "vfile";
import { getCalculator } from "../calc/registry";
import {
  allowedComponentNames,
  CAUTION_COMPONENT,
  CITE_COMPONENT,
  calculatorIdOf,
  nextBlockId,
  SAFE_HTML_ELEMENTS,
  SOURCE_BLOCK_ID_PATTERN,
  VOID_HTML_ELEMENTS,
} from "./components";
import { MEASUREMENT_ATTRIBUTE_NAMES, MEASUREMENT_COMPONENT } from "../waveform/measurement";
import { checkSourceLength, prescanSource } from "./prescan";
import { mathProblem } from "./math";
import { renderTree, type Typesetter } from "./render";
import {
  SOURCE_LIMITS,
  type AttributeSpan,
  type CheckedSource,
  type SourceBlock,
  type SourceCitation,
  type SourceKind,
  type SourceMeasurement,
  type SourceProblem,
} from "./types";
import { urlProblem } from "./urls";

type JsxElement = Extract<MdastNodes, { type: "mdxJsxFlowElement" | "mdxJsxTextElement" }>;
type JsxAttribute = JsxElement["attributes"][number];
type Expression = Extract<MdastNodes, { type: "mdxFlowExpression" | "mdxTextExpression" }>;

/** Problems beyond this many add nothing the author can act on at once. */
const MAX_PROBLEMS = 100;

const parser = createProcessor({ format: "mdx", remarkPlugins: [remarkMath, remarkGfm] });

const BRACE_ADVICE = "Curly braces run code in MDX, which sheets do not allow. Write \\{ for a literal brace, or put a formula in $…$.";
const ESM_ADVICE = "import and export run code, which sheets do not allow. Remove this line: the calculators are available without importing them.";

/**
 * Check an author's source and, when it is sound, list its blocks and build its render tree.
 * `typeset: null` leaves the tree's formulas as TeX (the server typesets them in a worker).
 */
export function checkSheetSource(source: string, kind: SourceKind = "sheet", typeset?: Typesetter | null): CheckedSource {
  const tooLong = checkSourceLength(source, kind);
  if (tooLong) return { ok: false, problems: [tooLong] };
  const unsafeShape = prescanSource(source);
  if (unsafeShape) return { ok: false, problems: [unsafeShape] };

  let root: MdastRoot;
  try {
    root = parser.parse(new VFile(source));
  } catch (error) {
    return { ok: false, problems: [describeParseError(error)] };
  }

  const walk = new SourceWalk(source, kind);
  walk.run(root);
  if (walk.problems.length > 0) {
    const problems = walk.problems.sort((a, b) => a.line - b.line || a.column - b.column).slice(0, MAX_PROBLEMS);
    return { ok: false, problems };
  }
  return { ok: true, blocks: walk.blocks, citations: walk.citations, measurements: walk.measurements, tree: renderTree(root, typeset) };
}

class SourceWalk {
  readonly problems: SourceProblem[] = [];
  readonly blocks: SourceBlock[] = [];
  readonly citations: SourceCitation[] = [];
  readonly measurements: SourceMeasurement[] = [];
  private readonly blockLines = new Map<string, number>();
  private mathLength = 0;
  /** The parser drops a leading byte-order mark, so its offsets are one short of the source's. */
  private readonly offsetShift: number;

  constructor(
    private readonly source: string,
    private readonly kind: SourceKind,
  ) {
    this.offsetShift = source.charCodeAt(0) === 0xfeff ? 1 : 0;
  }

  run(root: MdastRoot): void {
    // Iterative, so that depth is measured before anything recurses over the tree.
    const stack: { node: MdastNodes; depth: number }[] = [{ node: root, depth: 0 }];
    let tooDeep = false;
    while (stack.length > 0) {
      const { node, depth } = stack.pop()!;
      // Leaves (text, math, code) nest nothing, so only parents count towards the depth.
      if (depth > SOURCE_LIMITS.maxDepth && "children" in node) {
        if (!tooDeep) this.problem(node, `Elements are nested more than ${SOURCE_LIMITS.maxDepth} levels deep here. Flatten the structure.`);
        tooDeep = true;
        continue;
      }
      const descend = this.check(node);
      if (descend && "children" in node) {
        for (let index = node.children.length - 1; index >= 0; index--) {
          stack.push({ node: node.children[index]!, depth: depth + 1 });
        }
      }
    }
  }

  /** Checks one node; answers whether its children still need checking. */
  private check(node: MdastNodes): boolean {
    switch (node.type) {
      case "mdxjsEsm":
        this.problem(node, ESM_ADVICE);
        return false;
      case "mdxFlowExpression":
      case "mdxTextExpression":
        if (!isCommentOnly(node)) this.problem(node, BRACE_ADVICE);
        return false;
      case "mdxJsxFlowElement":
      case "mdxJsxTextElement":
        return this.checkElement(node);
      case "html":
        this.problem(node, "Raw HTML is not allowed in a sheet. Use Markdown, or one of the allowed elements.");
        return false;
      case "image":
      case "imageReference":
        this.problem(node, "Images are not supported in sheets yet. Describe the figure in words, or link to it.");
        return false;
      case "link":
      case "definition": {
        const problem = urlProblem(node.url);
        if (problem) this.problem(node, problem);
        return true;
      }
      case "inlineMath":
      case "math":
        this.countMath(node, node.value);
        return false;
      case "code":
        if (node.lang === "math") this.countMath(node, node.value);
        return false;
      default:
        return true;
    }
  }

  private countMath(node: MdastNodes, tex: string): void {
    const refused = mathProblem(tex);
    if (refused) this.problems.push({ message: refused.message, ...this.placeInMath(node, tex, refused.index) });
    const before = this.mathLength;
    this.mathLength += tex.length;
    if (before <= SOURCE_LIMITS.maxMathLength && this.mathLength > SOURCE_LIMITS.maxMathLength) {
      this.problem(
        node,
        `The formulas in this source hold more than ${SOURCE_LIMITS.maxMathLength.toLocaleString("en")} characters of TeX. Split it into several sheets.`,
      );
    }
  }

  private checkElement(node: JsxElement): boolean {
    const name = node.name;
    if (name === null) {
      this.problem(node, "Empty tags (<>…</>) are not needed in a sheet; remove them.");
      return true;
    }
    if (name.includes(".") || name.includes(":")) {
      this.problem(node, `Element names with "." or ":" are not allowed. ${this.allowedNamesSentence()}`);
      return false;
    }
    const attributesSound = this.checkAttributeForms(node);

    const calculatorId = calculatorIdOf(name);
    if (calculatorId !== undefined) {
      if (this.kind === "document") {
        // A calculation in a report would escape the check; it belongs in a sheet the report cites.
        this.problem(node, `Calculations belong in calc sheets, where a checker verifies them. Put this ${name} in a sheet and cite its revision here: <Cite sheet="CS-0001" rev="A" />.`);
      } else if (attributesSound) this.checkBlock(node, name, calculatorId);
      this.refuseChildren(node, `A calculator block holds no text; write it as <${name} id="…" … />.`);
      return false;
    }
    if (name === MEASUREMENT_COMPONENT) {
      if (this.kind === "document") {
        this.problem(node, `Measurements belong in calc sheets, beside the calculation they check. Put this ${name} in a sheet and cite its revision here.`);
      } else if (attributesSound) this.checkMeasurement(node);
      this.refuseChildren(node, `A measured-waveform block holds no text; write it as <${MEASUREMENT_COMPONENT} id="…" file="…" />.`);
      return false;
    }
    if (name === CAUTION_COMPONENT) {
      if (node.attributes.length > 0) {
        this.problem(node, `Caution takes no attributes; put the note between <Caution> and </Caution>.`);
      }
      return true;
    }
    if (name === CITE_COMPONENT) {
      if (this.kind !== "document") {
        this.problem(node, "Citations belong in project documents, not in calc sheets. Name the sheet and revision in words instead.");
      } else if (attributesSound) {
        this.checkCitation(node);
      }
      this.refuseChildren(node, `A citation holds no text; write it as <Cite sheet="…" rev="…" />.`);
      return false;
    }
    const allowedAttributes = Object.hasOwn(SAFE_HTML_ELEMENTS, name) ? SAFE_HTML_ELEMENTS[name] : undefined;
    if (allowedAttributes) {
      if (attributesSound) this.checkHtmlAttributes(node, name, allowedAttributes);
      if (VOID_HTML_ELEMENTS.has(name)) this.refuseChildren(node, `<${name} /> holds nothing; write it as <${name} />.`);
      return true;
    }
    this.problem(node, this.unknownElementMessage(name));
    return false;
  }

  /** Refuses spreads, {expression} values, bare names, event handlers, style and dangerous URLs. */
  private checkAttributeForms(node: JsxElement): boolean {
    let sound = true;
    const seen = new Set<string>();
    for (const attribute of node.attributes) {
      if (attribute.type === "mdxJsxExpressionAttribute") {
        this.problem(attribute, 'Spread attributes ({...}) run code and are not allowed. Write each attribute as name="value".');
        sound = false;
        continue;
      }
      const name = attribute.name;
      if (/^on/i.test(name)) {
        this.problem(attribute, `Event handlers such as ${name} run code and are not allowed.`);
        sound = false;
      } else if (name.toLowerCase() === "style") {
        this.problem(attribute, "style attributes are not allowed; the app sets the sheet's look.");
        sound = false;
      } else if (typeof attribute.value !== "string") {
        this.problem(
          attribute,
          attribute.value === null || attribute.value === undefined
            ? `${name} has no value. Write it as ${name}="…".`
            : `The value of ${name} is in curly braces, which run code. Write it in quotes instead: ${name}="…".`,
        );
        sound = false;
      } else if (isDangerousUrl(attribute.value)) {
        this.problem(attribute, `The value of ${name} is a script or data address, which is not allowed.`);
        sound = false;
      } else if (seen.has(name)) {
        this.problem(attribute, `${name} is given twice; keep one.`);
        sound = false;
      }
      seen.add(name);
    }
    return sound;
  }

  private checkBlock(node: JsxElement, component: string, calculatorId: string): void {
    const calculator = getCalculator(calculatorId)!;
    const inputKeys = calculator.inputs.map((input) => input.key);
    const inputs: Record<string, string> = {};
    const attributes: Record<string, AttributeSpan> = {};
    let id: string | undefined;
    let sound = true;
    for (const attribute of node.attributes) {
      if (attribute.type !== "mdxJsxAttribute" || typeof attribute.value !== "string") continue;
      if (attribute.name === "id") {
        id = attribute.value;
      } else if (inputKeys.includes(attribute.name)) {
        inputs[attribute.name] = attribute.value;
      } else {
        this.problem(attribute, `${component} has no input "${attribute.name}". Its inputs are: ${inputKeys.join(", ")}.`);
        sound = false;
      }
      attributes[attribute.name] = this.span(attribute);
    }
    if (id === undefined) {
      const example = nextBlockId(calculatorId, this.blockLines.keys());
      this.problem(node, `This block needs an id, e.g. <${component} id="${example}" … />; other blocks refer to its results by it.`);
      return;
    }
    if (!SOURCE_BLOCK_ID_PATTERN.test(id)) {
      this.problem(node, "A block id starts with a letter and holds only letters, digits and _ (at most 32 characters).");
      return;
    }
    const place = this.claimBlockId(node, id);
    if (!place || !sound) return;
    const { line, column } = place;
    if (this.blocks.length === SOURCE_LIMITS.maxBlocks) {
      this.problem(node, `A sheet may hold at most ${SOURCE_LIMITS.maxBlocks} calculator blocks. Split it into several sheets.`);
    }
    this.blocks.push({
      id,
      calculator: calculatorId,
      component,
      inputs,
      line,
      column,
      start: this.offset(node.position?.start.offset),
      end: this.offset(node.position?.end.offset),
      attributes,
    });
  }

  /** Takes a block id for this element, or says which line already uses it; ids are shared by every kind of block. */
  private claimBlockId(node: JsxElement, id: string): { line: number; column: number } | undefined {
    const firstLine = this.blockLines.get(id);
    const place = this.place(node);
    if (firstLine !== undefined) {
      this.problem(node, `The id "${id}" is already used by the block on line ${firstLine}. Give this block another id.`);
      return undefined;
    }
    this.blockLines.set(id, place.line);
    return place;
  }

  private checkMeasurement(node: JsxElement): void {
    const attributes: Record<string, string> = {};
    let id: string | undefined;
    let sound = true;
    for (const attribute of node.attributes) {
      if (attribute.type !== "mdxJsxAttribute" || typeof attribute.value !== "string") continue;
      if (attribute.name === "id") id = attribute.value;
      else if ((MEASUREMENT_ATTRIBUTE_NAMES as string[]).includes(attribute.name)) attributes[attribute.name] = attribute.value;
      else {
        this.problem(attribute, `${MEASUREMENT_COMPONENT} has no attribute "${attribute.name}". It takes: id, ${MEASUREMENT_ATTRIBUTE_NAMES.join(", ")}.`);
        sound = false;
      }
    }
    if (id === undefined || !SOURCE_BLOCK_ID_PATTERN.test(id)) {
      this.problem(node, `This block needs an id of a letter, then letters, digits or _ (at most 32), e.g. <${MEASUREMENT_COMPONENT} id="m1" … />.`);
      return;
    }
    const place = this.claimBlockId(node, id);
    if (!place || !sound) return;
    const { line, column } = place;
    if (this.blocks.length + this.measurements.length >= SOURCE_LIMITS.maxBlocks) {
      this.problem(node, `A sheet may hold at most ${SOURCE_LIMITS.maxBlocks} blocks. Split it into several sheets.`);
      return;
    }
    this.measurements.push({ id, attributes, line, column });
  }

  private checkCitation(node: JsxElement): void {
    const values: Record<string, string> = {};
    let revSpan: AttributeSpan | undefined;
    for (const attribute of node.attributes) {
      if (attribute.type !== "mdxJsxAttribute" || typeof attribute.value !== "string") continue;
      if (attribute.name === "sheet" || attribute.name === "rev") values[attribute.name] = attribute.value;
      else this.problem(attribute, `Cite has no attribute "${attribute.name}". Write it as <Cite sheet="…" rev="…" />.`);
      if (attribute.name === "rev") revSpan = this.span(attribute);
    }
    const sheet = values.sheet?.trim();
    const rev = values.rev?.trim();
    if (!sheet || !rev) {
      this.problem(node, 'A citation names a sheet and its revision: <Cite sheet="…" rev="…" />.');
      return;
    }
    if (this.citations.length === SOURCE_LIMITS.maxCitations) {
      this.problem(node, `A document may hold at most ${SOURCE_LIMITS.maxCitations} citations. Split it into several documents.`);
    }
    this.citations.push({ sheet, rev, ...this.place(node), revSpan: revSpan! });
  }

  private checkHtmlAttributes(node: JsxElement, name: string, allowed: readonly string[]): void {
    for (const attribute of node.attributes) {
      if (attribute.type !== "mdxJsxAttribute" || typeof attribute.value !== "string") continue;
      if (!allowed.includes(attribute.name)) {
        this.problem(
          attribute,
          allowed.length === 0
            ? `<${name}> takes no attributes.`
            : `<${name}> takes only ${allowed.join(" and ")}, not "${attribute.name}".`,
        );
      } else if (attribute.name === "href") {
        const problem = urlProblem(attribute.value);
        if (problem) this.problem(attribute, problem);
      }
    }
  }

  private refuseChildren(node: JsxElement, message: string): void {
    const holdsSomething = node.children.some((child) => child.type !== "text" || child.value.trim() !== "");
    if (holdsSomething) this.problem(node, message);
  }

  private unknownElementMessage(name: string): string {
    const shown = name.length > 40 ? `${name.slice(0, 40)}…` : name;
    const sameLetters = allowedComponentNames(this.kind).find((allowed) => allowed.toLowerCase() === name.toLowerCase());
    if (sameLetters) return `There is no element <${shown}>; did you mean <${sameLetters}>? Component names are case-sensitive.`;
    if (/^[A-Z]/.test(name)) return `There is no component <${shown}>. ${this.allowedNamesSentence()}`;
    return `The HTML element <${shown}> is not allowed in a sheet. Allowed HTML: ${Object.keys(SAFE_HTML_ELEMENTS)
      .map((allowed) => `<${allowed}>`)
      .join(", ")}.`;
  }

  private allowedNamesSentence(): string {
    const kindWords = this.kind === "document" ? "A project document" : "A calc sheet";
    return `${kindWords} can use: ${allowedComponentNames(this.kind).join(", ")}.`;
  }

  private span(attribute: JsxAttribute): AttributeSpan {
    const start = this.offset(attribute.position?.start.offset);
    const end = this.offset(attribute.position?.end.offset);
    // The value sits between the quote that ends the attribute and the same quote after its name and "=".
    const quote = this.source.charAt(end - 1);
    const valueStart = this.source.indexOf(quote, start + (attribute.type === "mdxJsxAttribute" ? attribute.name.length : 0)) + 1;
    return { start, end, valueStart, valueEnd: end - 1 };
  }

  /** Where a command inside a formula is: its same occurrence in the source after the formula's start. */
  private placeInMath(node: MdastNodes, tex: string, index: number): { line: number; column: number } {
    const command = /^\\(?:[A-Za-z@]+|.)/.exec(tex.slice(index))?.[0] ?? "";
    const earlier = tex.slice(0, index).split(command).length - 1;
    let at = this.offset(node.position?.start.offset) - 1;
    for (let seen = 0; seen <= earlier && (at = this.source.indexOf(command, at + 1)) >= 0; seen++);
    if (at < 0) return this.place(node);
    const before = this.source.slice(0, at);
    const line = before.split("\n").length;
    return { line, column: at - before.lastIndexOf("\n") };
  }

  private offset(parserOffset: number | undefined): number {
    return (parserOffset ?? 0) + this.offsetShift;
  }

  private place(node: { position?: { start: { line: number; column: number } } }): { line: number; column: number } {
    return { line: node.position?.start.line ?? 1, column: node.position?.start.column ?? 1 };
  }

  private problem(node: { position?: { start: { line: number; column: number } } }, message: string): void {
    this.problems.push({ message, ...this.place(node) });
  }
}

/** `{/* a note *\/}` is MDX's comment: it holds no code, so it may stay (and renders as nothing). */
function isCommentOnly(node: Expression): boolean {
  const program = node.data?.estree;
  return program !== undefined && program !== null && program.body.length === 0;
}

/** Schemes that make a browser run or embed something, wherever they appear in an attribute. */
function isDangerousUrl(value: string): boolean {
  // Browsers ignore whitespace and control characters inside a scheme ("java\tscript:").
  const squeezed = value.replace(/[\u0000-\u0020\u007f]/g, "").toLowerCase();
  return /^(?:javascript|vbscript|data):/.test(squeezed);
}

interface ParserMessage {
  reason: string;
  line?: number | null;
  column?: number | null;
  source?: string | null;
}

function isParserMessage(error: unknown): error is ParserMessage {
  return typeof error === "object" && error !== null && typeof (error as ParserMessage).reason === "string";
}

/** The parser's message in plain words, at the place it names. */
function describeParseError(error: unknown): SourceProblem {
  if (error instanceof RangeError) {
    // A stack overflow the prescan did not foresee: refuse rather than fail the request.
    return { message: `Elements are nested too deeply to be read. Flatten the structure.`, line: 1, column: 1 };
  }
  if (!isParserMessage(error)) throw error;
  const where = { line: error.line ?? 1, column: error.column ?? 1 };
  const reason = error.reason;
  const origin = error.source ?? "";

  if (/mdx-expression|events-to-acorn/.test(origin)) return { message: BRACE_ADVICE, ...where };
  if (origin.includes("mdxjs-esm")) return { message: ESM_ADVICE, ...where };

  if (origin === "mdast-util-mdx-jsx") {
    const opened = /\((\d+):(\d+)-\d+:\d+\)/.exec(reason);
    const openedAt = opened ? { line: Number(opened[1]), column: Number(opened[2]) } : where;
    const tags = [...reason.matchAll(/`(<\/?[^`]*>)`/g)].map((match) => match[1]!);
    if (reason.startsWith("Expected a closing tag for") && tags[0]) {
      const tag = tags[0];
      return {
        message: `The tag ${tag} is never closed. Close it with ${tag.replace("<", "</")}, or write ${tag.replace(">", " />")} if it holds nothing.`,
        ...openedAt,
      };
    }
    if (reason.startsWith("Unexpected closing tag") && tags.length >= 2) {
      return { message: `The closing tag ${tags[0]} does not match ${tags[1]}, opened on line ${openedAt.line}. Close ${tags[1]} first.`, ...where };
    }
    if (reason.startsWith("Expected the closing tag")) {
      return { message: `A tag opened in a paragraph or list item must be closed in the same one.`, ...where };
    }
    if (reason.includes("closing slash")) return { message: "This closing tag has no opening tag.", ...where };
    return { message: 'This tag is not written correctly. Tags look like <Name attribute="value" /> or <Name>…</Name>.', ...where };
  }

  if (origin === "micromark-extension-mdx-jsx") {
    if (reason.includes("create a comment in MDX")) {
      return { message: "HTML comments (<!-- … -->) are not supported. Write a note as {/* note */}, or remove it.", ...where };
    }
    if (reason.includes("create a link in MDX")) {
      return { message: "Links are written [text](https://…), not between < and >.", ...where };
    }
    if (/ before (?:name|local name)/.test(reason) || reason.startsWith("Unexpected end of file in name")) {
      return { message: "A < here starts a tag, but no tag follows. For a less-than sign write \\< or use math: $a < b$.", ...where };
    }
    if (reason.includes("before attribute value")) {
      return { message: 'Attribute values are written in quotes, e.g. vdc="48 V".', ...where };
    }
    if (reason.includes("in attribute value")) return { message: "This attribute value is missing its closing quote.", ...where };
    if (reason.includes("attribute name")) return { message: 'An attribute here is not written correctly. Attributes look like name="value".', ...where };
    return { message: 'This tag is not written correctly. Tags look like <Name attribute="value" /> or <Name>…</Name>.', ...where };
  }
  return { message: `The source could not be read here: ${reason}`, ...where };
}
