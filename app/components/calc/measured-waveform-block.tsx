/**
 * A measured-waveform block: what the attached capture shows (RMS, DC offset,
 * fundamental, THD, plots of one cycle and the spectrum) and, when the author linked
 * a calculator block, measured against calculated row by row with the tolerances the
 * author set. Every verdict is in words; the marks only help the eye.
 */
import { useId } from "react";
import { formatQuantity } from "~/lib/calc/format";
import type { ComparisonRow, MeasurementOutcome } from "~/lib/waveform/measurement";
import { BLOCK_FRAME, BlockHeader } from "./calculator-block";
import { SpectrumChart, WaveformChart } from "./charts";
import { HarmonicsTable } from "./harmonics-table";
import { OverMark, PassMark, WarningMark } from "./status-icons";

export interface MeasuredWaveformBlockProps {
  blockId: string;
  /** The attributes as typed (file, channel, compare …). */
  attributes: Record<string, string>;
  outcome?: MeasurementOutcome | undefined;
  /** The download address of an attachment, when the page can offer one. */
  attachmentHref?: ((attachmentId: string) => string) | undefined;
}

const percent = (value: number) => `${value.toFixed(2)} %`;

function quantity(value: number, unit: string): string {
  return unit === "%" ? percent(value) : formatQuantity(value, unit);
}

function differenceText(row: ComparisonRow): string {
  const sign = row.difference > 0 ? "+" : row.difference < 0 ? "−" : "±";
  const size = Math.abs(row.difference).toFixed(2);
  return row.toleranceKind === "relative" ? `${sign}${size} %` : `${sign}${size} points`;
}

function toleranceText(row: ComparisonRow): string {
  return row.toleranceKind === "relative" ? `± ${row.tolerance} %` : `± ${row.tolerance} points`;
}

export function MeasuredWaveformBlock({ blockId, attributes, outcome, attachmentHref }: MeasuredWaveformBlockProps) {
  const uid = useId();
  const titleId = `${uid}title`;
  const comparison = outcome?.ok ? outcome.comparison : null;
  const failed = comparison ? comparison.rows.filter((r) => !r.pass).length : 0;

  let status: React.ReactNode;
  if (!outcome) status = <span className="text-xs text-ink-faint">Not analysed yet</span>;
  else if (!outcome.ok) {
    status = (
      <span className="inline-flex items-center gap-1 text-xs font-semibold text-danger">
        <OverMark /> {outcome.errors.length === 1 ? "1 problem" : `${outcome.errors.length} problems`}
      </span>
    );
  } else if (!comparison) status = <span className="text-xs font-medium text-ink-soft">Measured (not compared)</span>;
  else if (failed === 0) {
    status = (
      <span className="inline-flex items-center gap-1 text-xs font-semibold text-verified">
        <PassMark /> Matches {comparison.block} within tolerance
      </span>
    );
  } else {
    status = (
      <span className="inline-flex items-center gap-1 text-xs font-semibold text-danger">
        <OverMark /> {failed} of {comparison.rows.length} outside tolerance
      </span>
    );
  }

  return (
    <section aria-labelledby={titleId} className={BLOCK_FRAME} data-block-id={blockId} data-measurement="true">
      <BlockHeader titleId={titleId} blockId={blockId} title="Measured waveform" status={status} />
      <div className="px-4 py-4 sm:px-5">
        {!outcome || !outcome.ok ? (
          <div>
            <p className="m-0 text-sm text-ink-soft">
              Capture <span className="font-mono">{attributes.file || "(none named)"}</span>
              {attributes.channel ? (
                <>
                  , channel <span className="font-mono">{attributes.channel}</span>
                </>
              ) : null}
            </p>
            {outcome && !outcome.ok ? (
              <ul className="mt-2 space-y-1 text-sm text-danger" aria-label={`Problems of ${blockId}`}>
                {outcome.errors.map((error, index) => (
                  <li key={index} className="flex items-start gap-1.5">
                    <OverMark className="mt-0.5" />
                    <span>
                      <strong className="font-mono font-semibold">{error.field}</strong>: {error.message}
                    </span>
                  </li>
                ))}
              </ul>
            ) : null}
          </div>
        ) : (
          <MeasuredBody blockId={blockId} outcome={outcome} attachmentHref={attachmentHref} />
        )}
        <p className="mt-4 mb-0 flex items-start gap-1.5 text-xs text-[#5e480a]">
          <WarningMark className="mt-px" />
          <span>
            <strong className="font-semibold">Probing lethal voltages.</strong> Measure inverter outputs and DC links with differential
            probes or an isolated scope, never by floating a grounded scope; de-energise before connecting, and follow your site&apos;s
            electrical-safety rules. A measurement supports, and never replaces, compliance testing by an accredited laboratory.
          </span>
        </p>
      </div>
    </section>
  );
}

function MeasuredBody({ blockId, outcome, attachmentHref }: { blockId: string; outcome: Extract<MeasurementOutcome, { ok: true }>; attachmentHref?: ((id: string) => string) | undefined }) {
  const { analysis, attachment, comparison } = outcome;
  const unit = analysis.unit;
  const facts: [string, string][] = [
    ["RMS, all components", quantity(analysis.rms, unit)],
    ["DC offset", quantity(analysis.dc, unit)],
    ["Fundamental", `${quantity(analysis.fundamentalRms, unit)} RMS at ${formatQuantity(analysis.fundamentalFrequency, "Hz")}`],
    ["THD, all components", percent(analysis.thd)],
    ["THD, orders 2–40", percent(analysis.thd40)],
    ["THD, orders 2–50", percent(analysis.thd50)],
  ];
  return (
    <>
      <p className="m-0 text-sm text-ink-soft">
        Channel <span className="font-medium text-ink">{analysis.channel}</span> of{" "}
        {attachmentHref ? (
          <a href={attachmentHref(attachment.id)} className="font-mono" download>
            {attachment.fileName}
          </a>
        ) : (
          <span className="font-mono">{attachment.fileName}</span>
        )}{" "}
        · {outcome.sampleCount.toLocaleString("en")} samples at {formatQuantity(outcome.sampleRate, "Hz")} · {analysis.cycles} whole cycle
        {analysis.cycles === 1 ? "" : "s"} analysed ·{" "}
        <span className="font-mono text-xs" title={`SHA-256 ${attachment.sha256}`}>
          SHA-256 {attachment.sha256.slice(0, 12)}
        </span>
      </p>
      <h4 className="eyebrow m-0 mt-4 mb-2">Measured</h4>
      <dl className="m-0 grid gap-x-8 text-sm md:grid-cols-2">
        {facts.map(([label, value]) => (
          <div key={label} className="flex items-baseline justify-between gap-x-3 border-b border-rule/70 py-1.5">
            <dt className="text-ink-soft">{label}</dt>
            <dd className="m-0 font-mono tabular-nums">{value}</dd>
          </div>
        ))}
      </dl>
      <h4 className="eyebrow m-0 mt-5 mb-2">
        Measured against calculated{comparison ? <> (<span className="font-mono normal-case">{comparison.block}</span>)</> : null}
      </h4>
      {comparison ? (
        <ComparisonTable blockId={blockId} rows={comparison.rows} calculatedBlock={comparison.block} />
      ) : (
        <p className="m-0 text-sm text-ink-faint">
          Name a calculator block in <span className="font-mono">compare</span> to check the measurement against it.
        </p>
      )}
      {analysis.warnings.length > 0 ? (
        <ul className="mt-4 mb-0 list-none space-y-1 p-0 text-sm text-[#5e480a]" aria-label={`Notes on ${blockId}`}>
          {analysis.warnings.map((warning) => (
            <li key={warning} className="flex items-start gap-1.5">
              <WarningMark className="mt-0.5" />
              <span>{warning}</span>
            </li>
          ))}
        </ul>
      ) : null}
      <div className="mt-5 grid gap-6">
        <WaveformChart points={analysis.waveform} title={`Measured ${analysis.channel}, one cycle (average of ${analysis.cycles})`} />
        <SpectrumChart harmonics={analysis.harmonics} title={`Measured spectrum of ${analysis.channel}`} />
      </div>
      <HarmonicsTable harmonics={analysis.harmonics} blockId={blockId} />
    </>
  );
}

function ComparisonTable({ blockId, rows, calculatedBlock }: { blockId: string; rows: ComparisonRow[]; calculatedBlock: string }) {
  return (
    <div className="overflow-x-auto" tabIndex={0} role="region" aria-label={`Comparison of ${blockId} with ${calculatedBlock}`}>
      <table className="w-full text-sm whitespace-nowrap tabular-nums">
        <caption className="sr-only">
          Measured {blockId} against calculated {calculatedBlock}, with the tolerance of each row and whether it is met
        </caption>
        <thead className="text-xs text-ink-faint">
          <tr>
            <th scope="col" className="py-1.5 pr-3 text-left font-medium">Quantity</th>
            <th scope="col" className="px-2 py-1.5 text-left font-medium">Verdict</th>
            <th scope="col" className="px-2 py-1.5 text-right font-medium">Measured</th>
            <th scope="col" className="px-2 py-1.5 text-right font-medium">Calculated</th>
            <th scope="col" className="px-2 py-1.5 text-right font-medium">Difference</th>
            <th scope="col" className="px-2 py-1.5 text-right font-medium">Tolerance</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((row) => (
            <tr key={row.key} className="border-t border-rule/70">
              <th scope="row" className="py-1.5 pr-3 text-left font-normal text-ink-soft">{row.label}</th>
              <td className={`px-2 py-1.5 font-semibold ${row.pass ? "text-verified" : "text-danger"}`}>
                <span className="inline-flex items-center gap-1">
                  {row.pass ? <PassMark /> : <OverMark />} {row.pass ? "within" : "outside"}
                </span>
              </td>
              <td className="px-2 py-1.5 text-right font-mono">{Number.isFinite(row.measured) ? quantity(row.measured, row.unit) : "—"}</td>
              <td className="px-2 py-1.5 text-right font-mono">{quantity(row.calculated, row.unit)}</td>
              <td className="px-2 py-1.5 text-right font-mono">{Number.isFinite(row.difference) ? differenceText(row) : "—"}</td>
              <td className="px-2 py-1.5 text-right font-mono">{toleranceText(row)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
