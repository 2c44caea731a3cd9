/**
 * Renders a calc sheet's render tree (plain hast data from lib/mdx, never code):
 * prose and KaTeX as they are, each calculator element as a CalculatorBlock wired
 * to its typed inputs and its outcome, MeasuredWaveform as its measured block,
 * Caution as a callout, Cite as a reference.
 */
import type { Root } from "hast";
import { toJsxRuntime, type Components } from "hast-util-to-jsx-runtime";
import { createContext, useContext, useMemo, type ReactNode } from "react";
import { Fragment, jsx, jsxs } from "react/jsx-runtime";
import type { BlockOutcome, SheetEvaluation } from "~/lib/calc/evaluate-sheet";
import { citationKey, type CitationState } from "~/lib/documents/citations";
import { MEASUREMENT_COMPONENT, type MeasurementOutcome } from "~/lib/waveform/measurement";
import { CalculatorBlock } from "./calc/calculator-block";
import { describedCalculators } from "./calc/calculator-catalogue";
import { MeasuredWaveformBlock } from "./calc/measured-waveform-block";
import { CitationBadge } from "./citations";
import { WarningMark } from "./calc/status-icons";

/** What a citation of "CS-0001@B" points at, when the page knows it. */
export interface CitationTarget {
  title: string;
  /** The citation's state ("verified", "superseded" …) and the same in words. */
  state: CitationState;
  words: string;
  /** Null when the cited sheet does not exist. */
  href: string | null;
  /** Its number in the document's reference list. */
  reference: number;
}

export interface SheetViewProps {
  tree: Root;
  /** Raw input strings as typed, by block id then input key. */
  inputsById: Record<string, Record<string, string>>;
  evaluation?: SheetEvaluation | undefined;
  editable?: boolean;
  onInputChange?: ((blockId: string, key: string, value: string) => void) | undefined;
  /** Citation targets keyed "CS-0001@B"; without them a citation is plain text. */
  citations?: Record<string, CitationTarget> | undefined;
  /** Measured-waveform outcomes by block id. */
  measurements?: Record<string, MeasurementOutcome> | undefined;
  /** Download address of an attachment, for links from measured blocks. */
  attachmentHref?: ((attachmentId: string) => string) | undefined;
}

/** The MDX component name of a calculator: "lc-filter" → "LcFilter". */
export function componentNameFor(calculatorId: string): string {
  return calculatorId
    .split("-")
    .map((part) => part.charAt(0).toUpperCase() + part.slice(1))
    .join("");
}

interface SheetData {
  inputsById: Record<string, Record<string, string>>;
  blocks: Record<string, BlockOutcome>;
  editable: boolean;
  onInputChange: ((blockId: string, key: string, value: string) => void) | undefined;
  citations: Record<string, CitationTarget> | undefined;
  measurements: Record<string, MeasurementOutcome>;
  attachmentHref: ((attachmentId: string) => string) | undefined;
}

const SheetContext = createContext<SheetData>({
  inputsById: {},
  blocks: {},
  editable: false,
  onInputChange: undefined,
  citations: undefined,
  measurements: {},
  attachmentHref: undefined,
});

/** Inputs straight from the element's attributes, for a block the page did not list. */
function inputsFromProps(props: Record<string, unknown>): Record<string, string> {
  const inputs: Record<string, string> = {};
  for (const [key, value] of Object.entries(props)) {
    if (key === "id" || key === "children" || key === "node") continue;
    if (typeof value === "string") inputs[key] = value;
  }
  return inputs;
}

function blockComponent(calculatorId: string) {
  function SheetBlock(props: Record<string, unknown>) {
    const sheet = useContext(SheetContext);
    const blockId = typeof props.id === "string" ? props.id : "";
    return (
      <CalculatorBlock
        blockId={blockId}
        calculatorId={calculatorId}
        inputs={sheet.inputsById[blockId] ?? inputsFromProps(props)}
        outcome={sheet.blocks[blockId]}
        editable={sheet.editable}
        onInputChange={sheet.onInputChange}
      />
    );
  }
  SheetBlock.displayName = componentNameFor(calculatorId);
  return SheetBlock;
}

function SheetMeasurement(props: Record<string, unknown>) {
  const sheet = useContext(SheetContext);
  const blockId = typeof props.id === "string" ? props.id : "";
  return <MeasuredWaveformBlock blockId={blockId} attributes={inputsFromProps(props)} outcome={sheet.measurements[blockId]} attachmentHref={sheet.attachmentHref} />;
}

function SheetCaution({ children }: { children?: ReactNode }) {
  return (
    <div role="note" className="my-5 rounded-md border border-[#e3cf8f] bg-waiting-wash px-4 py-3 font-sans text-sm leading-relaxed text-[#5e480a] [&>*:first-child]:mt-0 [&>*:last-child]:mb-0 [&_p]:my-1.5">
      <p className="m-0 flex items-center gap-1.5 font-semibold">
        <WarningMark /> Caution
      </p>
      {children}
    </div>
  );
}

function SheetCite({ sheet, rev }: { sheet?: unknown; rev?: unknown }) {
  const { citations } = useContext(SheetContext);
  const number = typeof sheet === "string" ? sheet.trim().toUpperCase() : "";
  const revision = typeof rev === "string" ? rev.trim().toUpperCase() : "";
  const label = `${number} rev ${revision}`;
  if (!citations) return <span className="font-mono text-[0.9em] whitespace-nowrap">{label}</span>;
  const target = citations[citationKey(number, revision)];
  if (!target) {
    return (
      <span className="font-mono text-[0.9em] whitespace-nowrap">
        {label} <span className="font-sans text-xs text-danger">(not found)</span>
      </span>
    );
  }
  return (
    <span className="inline-flex max-w-full flex-wrap items-baseline gap-x-1.5 align-baseline">
      {target.href ? (
        <a href={target.href} className="font-mono text-[0.9em] font-medium whitespace-nowrap" title={`${target.title}: ${target.words}`}>
          {label}
        </a>
      ) : (
        <span className="font-mono text-[0.9em] font-medium whitespace-nowrap">{label}</span>
      )}
      <a href={`#ref-${target.reference}`} className="font-mono text-[0.8em] text-ink-faint no-underline" aria-label={`reference ${target.reference}`}>
        [{target.reference}]
      </a>
      <CitationBadge state={target.state} />
    </span>
  );
}

/** KaTeX's display wrapper scrolls sideways on a phone; a scrolling region must be reachable from the keyboard. */
function SheetSpan(props: React.ComponentProps<"span">) {
  const display = typeof props.className === "string" && props.className.split(" ").includes("katex-display");
  return display ? <span {...props} tabIndex={0} /> : <span {...props} />;
}

// Built once: a new component type per render would remount every block and drop the focus of the field being typed in.
const SHEET_COMPONENTS: Record<string, unknown> = {
  ...Object.fromEntries(describedCalculators.map(({ id }) => [componentNameFor(id), blockComponent(id)])),
  [MEASUREMENT_COMPONENT]: SheetMeasurement,
  Caution: SheetCaution,
  Cite: SheetCite,
  span: SheetSpan,
};

/** Styles for the prose the author writes, on direct children only so they never reach inside a block. */
const PROSE_EXTRAS = [
  "[&>h1]:text-2xl [&>h1]:font-semibold",
  "[&>ul]:my-3 [&>ul]:list-disc [&>ul]:pl-6 [&>ol]:my-3 [&>ol]:list-decimal [&>ol]:pl-6 [&_li>ul]:list-[circle] [&_li>ul]:pl-5",
  "[&>blockquote]:my-4 [&>blockquote]:border-l-2 [&>blockquote]:border-rule-strong [&>blockquote]:pl-4 [&>blockquote]:text-ink-soft",
  "[&>pre]:my-4 [&>pre]:overflow-x-auto [&>pre]:rounded [&>pre]:bg-paper [&>pre]:p-3 [&>pre]:text-sm",
  "[&>p_code]:rounded [&>p_code]:bg-paper [&>p_code]:px-1 [&>p_code]:font-mono [&>p_code]:text-[0.88em]",
  "[&>table]:my-4 [&>table]:block [&>table]:overflow-x-auto [&>table]:text-sm [&>table_th]:border-b [&>table_th]:border-rule-strong [&>table_th]:px-2 [&>table_th]:py-1 [&>table_th]:text-left [&>table_td]:border-b [&>table_td]:border-rule [&>table_td]:px-2 [&>table_td]:py-1",
  // Wide display equations scroll on a phone instead of widening the page.
  "[&_.katex-display]:overflow-x-auto [&_.katex-display]:overflow-y-hidden [&_.katex-display]:py-1",
].join(" ");

export function SheetView({ tree, inputsById, evaluation, editable = false, onInputChange, citations, measurements, attachmentHref }: SheetViewProps) {
  const data = useMemo<SheetData>(
    () => ({ inputsById, blocks: evaluation?.blocks ?? {}, editable, onInputChange, citations, measurements: measurements ?? {}, attachmentHref }),
    [inputsById, evaluation, editable, onInputChange, citations, measurements, attachmentHref],
  );
  const content = useMemo(
    () => toJsxRuntime(tree, { Fragment, jsx, jsxs, components: SHEET_COMPONENTS as Partial<Components>, ignoreInvalidStyle: true }),
    [tree],
  );
  const sheetErrors = evaluation?.errors ?? [];
  return (
    <SheetContext.Provider value={data}>
      {sheetErrors.length > 0 ? (
        <div className="mb-4 rounded-md border border-[#e2b4b0] bg-danger-wash px-3 py-2.5 text-sm text-danger">
          <p className="font-semibold">The sheet has problems outside its blocks:</p>
          <ul className="mt-1 list-disc pl-5">
            {sheetErrors.map((e, i) => (
              <li key={i}>
                <strong className="font-semibold">{e.field}</strong>: {e.message}
              </li>
            ))}
          </ul>
        </div>
      ) : null}
      <div className={`prose-sheet min-w-0 text-[16px] text-ink ${PROSE_EXTRAS}`}>{content}</div>
    </SheetContext.Provider>
  );
}
