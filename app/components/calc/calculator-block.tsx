import { useId, useState } from "react";
import type { BlockOutcome } from "~/lib/calc/evaluate-sheet";
import { formatQuantity, SI_UNIT } from "~/lib/calc/format";
import type {
  BodePoint,
  FieldError,
  Harmonic,
  InputSpec,
  LimitRow,
  ParsedInputValue,
  Results,
  ScalarResult,
  StandardSource,
  WaveformPoint,
} from "~/lib/calc/types";
import { VERDICT_NOTE } from "~/lib/calc/verdict-note";
import { describeCalculator, describedCalculators, type CalculatorDescription } from "./calculator-catalogue";
import { BodeChart, SpectrumChart, WaveformChart } from "./charts";
import { HarmonicsTable } from "./harmonics-table";
import { LimitsCheck } from "./limits-check";
import { OverMark, PassMark, WarningMark } from "./status-icons";

export interface CalculatorBlockProps {
  /** The author's block id, e.g. "qs1". */
  blockId: string;
  /** Registry id, e.g. "quasi-square". */
  calculatorId: string;
  /** The raw strings as typed in the source, by input key. */
  inputs: Record<string, string>;
  /** This block's result from evaluateSheet; absent until the sheet has been evaluated. */
  outcome?: BlockOutcome | undefined;
  /** Form fields when true; a read-only list of the inputs when false. */
  editable?: boolean;
  /** Called on every keystroke; the parent re-evaluates and writes the value back into the source. */
  onInputChange?: ((blockId: string, key: string, value: string) => void) | undefined;
}

export const BLOCK_FRAME = "my-6 overflow-hidden rounded-lg border border-rule-strong bg-sheet font-sans text-ink shadow-[0_1px_0_var(--color-rule)]";
const BLOCK_HEAD = "flex flex-wrap items-center justify-between gap-x-3 gap-y-1 border-b border-rule border-l-4 border-l-copper bg-paper px-4 py-2";
// Utilities (not the prose layer) so a block looks the same inside .prose-sheet and outside it.
const BLOCK_TITLE = "m-0 text-sm font-semibold leading-snug";

/** A block's head band: its id and what it is, and its status on the right. */
export function BlockHeader({ titleId, blockId, title, status }: { titleId: string; blockId: string; title: React.ReactNode; status: React.ReactNode }) {
  return (
    <header className={BLOCK_HEAD}>
      <h3 id={titleId} className={BLOCK_TITLE}>
        <span className="font-mono text-copper-deep">{blockId}</span>
        <span className="text-ink-faint" aria-hidden="true">
          {" · "}
        </span>
        {title}
      </h3>
      {status}
    </header>
  );
}

/** Cautions most calculators share: the sheet shows them once in full, a block names them in one line. */
const SHARED_CAUTIONS: ReadonlySet<string> = (() => {
  const counts = new Map<string, number>();
  for (const c of describedCalculators) for (const text of c.cautions) counts.set(text, (counts.get(text) ?? 0) + 1);
  return new Set([...counts].filter(([, n]) => n >= 3).map(([text]) => text));
})();

function isScalar(value: unknown): value is ScalarResult {
  return typeof value === "object" && value !== null && !Array.isArray(value) && typeof (value as ScalarResult).display === "string";
}

function arrayResult<T>(results: Results, key: string): T[] | undefined {
  const value = results[key];
  return Array.isArray(value) ? (value as T[]) : undefined;
}

/** The first output of a kind, so a block finds its plot data whatever the output is called. */
function outputOfKind<T>(calculator: CalculatorDescription, results: Results, kind: string): { key: string; label: string; value: T[] } | undefined {
  for (const spec of calculator.outputs) {
    if (spec.kind !== kind) continue;
    const value = arrayResult<T>(results, spec.key);
    if (value && value.length > 0) return { key: spec.key, label: spec.label, value };
  }
  return undefined;
}

/** What a bare number in this input is read as, for the hint beside the field. */
function unitHint(spec: InputSpec): string | undefined {
  if (spec.kind === "quantity") return spec.displayUnit || undefined;
  if (spec.kind === "quantityList") return spec.displayUnit ? `${spec.displayUnit}, list` : "list";
  if (spec.kind === "spectrum") return spec.valueUnit === "A" ? "A, list" : "% list";
  return undefined;
}

/** A referenced input ("=qs1.v1Rms") shown with the value it resolved to. */
function resolvedText(spec: InputSpec, raw: string, parsed: ParsedInputValue): string | undefined {
  if (!raw.trimStart().startsWith("=") || parsed === undefined) return undefined;
  if (spec.kind === "quantity" && typeof parsed === "number") return formatQuantity(parsed, SI_UNIT[spec.dimension]);
  if (spec.kind === "quantityList" && Array.isArray(parsed)) {
    return (parsed as number[]).map((v) => formatQuantity(v, SI_UNIT[spec.dimension])).join(", ");
  }
  if (spec.kind === "spectrum" && Array.isArray(parsed)) return `${parsed.length} lines`;
  return undefined;
}

function BlockStatus({ outcome }: { outcome: BlockOutcome | undefined }) {
  if (!outcome) return <span className="text-xs text-ink-faint">Not computed yet</span>;
  if (outcome.ok) {
    return (
      <span className="inline-flex items-center gap-1 text-xs font-medium text-verified">
        <PassMark /> Computed
      </span>
    );
  }
  const n = outcome.errors.length;
  return (
    <span className="inline-flex items-center gap-1 text-xs font-semibold text-danger">
      <OverMark /> {n === 1 ? "1 problem" : `${n} problems`}
    </span>
  );
}

interface FieldProps {
  fieldId: string;
  spec: InputSpec;
  raw: string;
  error: string | undefined;
  resolved: string | undefined;
  onChange: (value: string) => void;
}

/**
 * One input. It keeps its own draft so typing never waits for the parent: the
 * parent's value replaces the draft only when it changes (e.g. an edit in the source).
 */
function InputField({ fieldId, spec, raw, error, resolved, onChange }: FieldProps) {
  const [draft, setDraft] = useState(raw);
  const [lastRaw, setLastRaw] = useState(raw);
  if (raw !== lastRaw) {
    setLastRaw(raw);
    setDraft(raw);
  }
  const hint = unitHint(spec);
  const hintId = `${fieldId}-hint`;
  const errorId = `${fieldId}-error`;
  const resolvedId = `${fieldId}-resolved`;
  const describedBy = [hint ? hintId : null, resolved ? resolvedId : null, error ? errorId : null].filter(Boolean).join(" ") || undefined;
  const change = (value: string) => {
    setDraft(value);
    onChange(value);
  };
  const common = {
    id: fieldId,
    name: spec.key,
    "aria-invalid": error ? true : undefined,
    "aria-describedby": describedBy,
  } as const;

  let control: React.ReactNode;
  if (spec.kind === "choice") {
    const value = draft === "" ? (spec.default ?? spec.options[0]?.value ?? "") : draft;
    const known = spec.options.some((o) => o.value === value);
    control = (
      <select {...common} className="field-input" value={value} onChange={(e) => change(e.target.value)}>
        {/* Keep an unknown typed value visible rather than silently replacing it. */}
        {known ? null : <option value={value}>{value}</option>}
        {spec.options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    );
  } else if (spec.kind === "spectrum") {
    control = (
      <textarea
        {...common}
        className="field-input font-mono"
        rows={2}
        spellCheck={false}
        value={draft}
        placeholder={spec.default ?? "=qs1.harmonics"}
        onChange={(e) => change(e.target.value)}
      />
    );
  } else {
    control = (
      <input
        {...common}
        type="text"
        inputMode="text"
        autoComplete="off"
        spellCheck={false}
        className="field-input font-mono"
        value={draft}
        placeholder={spec.default}
        onChange={(e) => change(e.target.value)}
      />
    );
  }

  return (
    <div>
      <label htmlFor={fieldId} className="mb-1 block text-sm leading-snug text-ink-soft" title={spec.description}>
        {spec.label}
        {spec.optional ? <span className="text-ink-faint"> (optional)</span> : null}{" "}
        <span className="ml-0.5 font-mono text-xs text-ink-faint">{spec.key}</span>
      </label>
      <div className="flex min-w-0 items-center gap-2">
        <div className="min-w-0 flex-1">{control}</div>
        {/* The unit column is kept even when empty so the fields line up. */}
        <span id={hint ? hintId : undefined} className="w-14 shrink-0 font-mono text-xs text-ink-faint">
          {hint ? <span className="sr-only">Unit: </span> : null}
          {hint}
        </span>
      </div>
      {resolved ? (
        <p id={resolvedId} className="m-0 mt-1 font-mono text-xs text-ink-soft">
          <span className="sr-only">Resolves to </span>→ {resolved}
        </p>
      ) : null}
      {error ? (
        <p id={errorId} className="field-error m-0 flex items-start gap-1">
          <OverMark className="mt-0.5" />
          <span>{error}</span>
        </p>
      ) : null}
    </div>
  );
}

function ReadOnlyInputs({ calculator, inputs, outcome }: { calculator: CalculatorDescription; inputs: Record<string, string>; outcome: BlockOutcome | undefined }) {
  const parsed = outcome?.ok ? outcome.inputs : {};
  const errors = outcome && !outcome.ok ? outcome.errors : [];
  return (
    <dl className="m-0 text-sm">
      {calculator.inputs.map((spec) => {
        const raw = inputs[spec.key] ?? "";
        const resolved = resolvedText(spec, raw, parsed[spec.key]);
        const error = errors.find((e) => e.field === spec.key);
        const choice = spec.kind === "choice" ? spec.options.find((o) => o.value === (raw || spec.default)) : undefined;
        if (raw === "" && spec.optional && !error) return null;
        return (
          <div key={spec.key} className="flex items-baseline justify-between gap-x-3 border-b border-rule/70 py-1.5 last:border-0">
            <dt className="min-w-[40%] flex-1 text-ink-soft" title={spec.description}>
              {spec.label} <span className="font-mono text-xs text-ink-faint">{spec.key}</span>
            </dt>
            <dd className="m-0 min-w-0 text-right font-mono [overflow-wrap:anywhere]">
              {choice ? <span className="font-sans">{choice.label}</span> : raw === "" ? (spec.default ?? "—") : raw}
              {raw === "" && spec.default ? <span className="font-sans text-ink-faint"> (default)</span> : null}
              {resolved ? <span className="block text-xs text-ink-soft"> → {resolved}</span> : null}
              {error ? (
                <span className="mt-0.5 flex items-start gap-1 font-sans text-sm text-danger">
                  <OverMark className="mt-0.5" />
                  {error.message}
                </span>
              ) : null}
            </dd>
          </div>
        );
      })}
    </dl>
  );
}

function ResultsTable({ calculator, results, blockId }: { calculator: CalculatorDescription; results: Results; blockId: string }) {
  const rows = calculator.outputs.filter((o) => o.kind === "scalar" && isScalar(results[o.key]));
  if (rows.length === 0) return null;
  return (
    <table className="m-0 w-full text-sm">
      <caption className="sr-only">Results of {blockId}</caption>
      <tbody>
        {rows.map((o) => (
          <tr key={o.key} className="border-b border-rule/70 last:border-0">
            <th scope="row" className="py-1.5 pr-3 text-left font-normal text-ink-soft" title={o.description}>
              {o.label} <span className="font-mono text-xs text-ink-faint">{o.key}</span>
            </th>
            <td className="py-1.5 text-right font-mono font-medium whitespace-nowrap text-ink tabular-nums">{(results[o.key] as ScalarResult).display}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function ErrorSummary({
  blockId,
  errors,
  calculator,
  fieldIdFor,
}: {
  blockId: string;
  errors: FieldError[];
  calculator: CalculatorDescription | undefined;
  fieldIdFor: ((key: string) => string) | undefined;
}) {
  return (
    <div className="rounded-md border border-[#e2b4b0] bg-danger-wash px-3 py-2.5 text-sm text-danger">
      <p className="m-0 flex items-center gap-1.5 font-semibold">
        <OverMark /> {blockId} did not compute. Fix {errors.length === 1 ? "this input" : "these inputs"}:
      </p>
      <ul className="mt-1.5 space-y-1 pl-5">
        {errors.map((error, i) => {
          const spec = calculator?.inputs.find((s) => s.key === error.field);
          const name = spec ? `${spec.label} (${error.field})` : error.field;
          return (
            <li key={`${error.field}-${i}`} className="list-disc">
              {spec && fieldIdFor ? (
                <a href={`#${fieldIdFor(error.field)}`} className="font-semibold text-danger underline">
                  {name}
                </a>
              ) : (
                <strong className="font-semibold">{name}</strong>
              )}
              : {error.message}
            </li>
          );
        })}
      </ul>
    </div>
  );
}

function Warnings({ warnings, blockId }: { warnings: string[]; blockId: string }) {
  if (warnings.length === 0) return null;
  return (
    <ul aria-label={`Warnings for ${blockId}`} className="m-0 list-none space-y-1.5 p-0">
      {warnings.map((text) => (
        <li key={text} className="flex items-start gap-2 rounded-md border border-[#e3cf8f] bg-waiting-wash px-3 py-2 text-sm text-[#5e480a]">
          <WarningMark className="mt-0.5" />
          <span>
            <span className="sr-only">Warning: </span>
            {text}
          </span>
        </li>
      ))}
    </ul>
  );
}

function Cautions({ calculator }: { calculator: CalculatorDescription }) {
  const shared = calculator.cautions.some((c) => SHARED_CAUTIONS.has(c));
  // The verdict note is printed with the verdict itself.
  const own = calculator.cautions.filter((c) => !SHARED_CAUTIONS.has(c) && c !== VERDICT_NOTE);
  if (!shared && own.length === 0) return null;
  return (
    <ul aria-label="Cautions" className="m-0 list-none space-y-1 p-0 text-xs text-[#5e480a]">
      {shared ? (
        <li className="flex items-start gap-1.5">
          <WarningMark className="mt-px" />
          <span>
            <strong className="font-semibold">Lethal voltages.</strong> Ideal-switch estimates for design checks only; hardware work needs
            review by a qualified engineer.
          </span>
        </li>
      ) : null}
      {own.map((text) => (
        <li key={text} className="flex items-start gap-1.5">
          <WarningMark className="mt-px" />
          <span>{text}</span>
        </li>
      ))}
    </ul>
  );
}

/**
 * One calculator of a calc sheet, boxed like a worked calculation: the block id and
 * calculator in the head, the given values, the results, and the plots and checks
 * the results carry. A block that fails says why inside its own box; the rest of
 * the sheet is untouched.
 */
export function CalculatorBlock({ blockId, calculatorId, inputs, outcome, editable = false, onInputChange }: CalculatorBlockProps) {
  const uid = useId();
  const calculator = describeCalculator(calculatorId);
  const titleId = `${uid}title`;
  const fieldIdFor = (key: string) => `${uid}${key}`;

  if (!calculator) {
    const errors = outcome && !outcome.ok ? outcome.errors : [{ field: "calculator", message: `unknown calculator "${calculatorId}"` }];
    return (
      <section aria-labelledby={titleId} className={BLOCK_FRAME}>
        <BlockHeader titleId={titleId} blockId={blockId} title="Unknown calculator" status={<BlockStatus outcome={outcome ?? { ok: false, calculator: calculatorId, errors }} />} />
        <div className="px-4 py-4 sm:px-5">
          <ErrorSummary blockId={blockId} errors={errors} calculator={undefined} fieldIdFor={undefined} />
        </div>
      </section>
    );
  }

  const errors = outcome && !outcome.ok ? outcome.errors : [];
  const results = outcome?.ok ? outcome.results : undefined;
  const parsed = outcome?.ok ? outcome.inputs : {};
  // Shown with the verdict instead.
  const warnings = outcome?.ok ? outcome.warnings.filter((w) => w !== VERDICT_NOTE) : [];
  const knownKeys = new Set(calculator.inputs.map((s) => s.key));
  const waveform = results ? outputOfKind<WaveformPoint>(calculator, results, "waveform") : undefined;
  const harmonics = results ? outputOfKind<Harmonic>(calculator, results, "harmonics") : undefined;
  const bode = results ? outputOfKind<BodePoint>(calculator, results, "bode") : undefined;
  const limitRows = results ? arrayResult<LimitRow>(results, "rows") : undefined;
  const isLimits = calculator.outputs.some((o) => o.kind === "limitRows");
  const scalarOf = (key: string) => (results && isScalar(results[key]) ? (results[key] as ScalarResult) : undefined);
  const fsw = typeof parsed.fsw === "number" ? parsed.fsw : undefined;

  return (
    <section aria-labelledby={titleId} className={BLOCK_FRAME} data-block-id={blockId}>
      <BlockHeader titleId={titleId} blockId={blockId} title={calculator.title} status={<BlockStatus outcome={outcome} />} />

      <div className="px-4 py-4 sm:px-5">
        <div className="grid gap-x-8 gap-y-5 md:grid-cols-2">
          <div className="min-w-0">
            <h4 className="eyebrow m-0 mb-2">Given</h4>
            {editable ? (
              <div className="space-y-3" role="group" aria-label={`Inputs of ${blockId}`}>
                {calculator.inputs.map((spec) => (
                  <InputField
                    key={spec.key}
                    fieldId={fieldIdFor(spec.key)}
                    spec={spec}
                    raw={inputs[spec.key] ?? ""}
                    error={errors.find((e) => e.field === spec.key)?.message}
                    resolved={resolvedText(spec, inputs[spec.key] ?? "", parsed[spec.key])}
                    onChange={(value) => onInputChange?.(blockId, spec.key, value)}
                  />
                ))}
              </div>
            ) : (
              <ReadOnlyInputs calculator={calculator} inputs={inputs} outcome={outcome} />
            )}
            {Object.keys(inputs).some((k) => !knownKeys.has(k)) ? (
              <p className="m-0 mt-2 text-xs text-ink-faint">
                Also in the source:{" "}
                {Object.keys(inputs)
                  .filter((k) => !knownKeys.has(k))
                  .map((k) => `${k}="${inputs[k]}"`)
                  .join(", ")}
              </p>
            ) : null}
          </div>

          <div className="min-w-0">
            <h4 className="eyebrow m-0 mb-2">Results</h4>
            {results ? (
              <ResultsTable calculator={calculator} results={results} blockId={blockId} />
            ) : (
              <p className="m-0 text-sm text-ink-faint">{outcome ? "No results until the inputs are fixed." : "Results appear once the sheet is computed."}</p>
            )}
          </div>
        </div>

        {errors.length > 0 ? (
          <div className="mt-4">
            <ErrorSummary blockId={blockId} errors={errors} calculator={calculator} fieldIdFor={editable ? fieldIdFor : undefined} />
          </div>
        ) : null}

        {outcome?.ok && outcome.defaultsUsed && outcome.defaultsUsed.length > 0 ? (
          <p className="m-0 mt-3 text-sm text-ink-soft">
            <span className="font-medium text-ink">Default used:</span>{" "}
            {outcome.defaultsUsed.map((d, i) => (
              <span key={d.key}>
                {i > 0 ? ", " : null}
                <span className="font-mono">{d.key}</span> = <span className="font-mono">{d.value}</span>
              </span>
            ))}
          </p>
        ) : null}

        {warnings.length > 0 ? (
          <div className="mt-4">
            <Warnings warnings={warnings} blockId={blockId} />
          </div>
        ) : null}

        {isLimits && results && limitRows ? (
          <LimitsCheck
            blockId={blockId}
            rows={limitRows}
            pass={typeof results.pass === "boolean" ? results.pass : undefined}
            source={results.source as StandardSource | undefined}
            thd={scalarOf("thd")}
            thdLimit={scalarOf("thdLimit")}
          />
        ) : null}

        {waveform || harmonics || bode ? (
          <div className="mt-5 grid gap-6">
            {waveform ? <WaveformChart points={waveform.value} title={waveform.label} /> : null}
            {harmonics ? <SpectrumChart harmonics={harmonics.value} title={harmonics.label === "Harmonics" ? "Harmonic spectrum" : harmonics.label} /> : null}
            {bode ? <BodeChart points={bode.value} f0={scalarOf("f0")?.value} fsw={fsw} gainAtFswDb={scalarOf("gainFswDb")?.value} title={bode.label} /> : null}
          </div>
        ) : null}

        {harmonics ? <HarmonicsTable harmonics={harmonics.value} blockId={blockId} /> : null}

        <div className="mt-4">
          <Cautions calculator={calculator} />
        </div>
      </div>
    </section>
  );
}
