import { formatQuantity } from "~/lib/calc/format";
import type { Harmonic } from "~/lib/calc/types";

/**
 * Every harmonic as numbers, folded away by default: the spectrum plot shows the
 * shape, this shows the figures (and is the plot's full text alternative).
 * Harmonic outputs in the catalogue are all output voltages, hence volts.
 */
export function HarmonicsTable({ harmonics, blockId }: { harmonics: readonly Harmonic[]; blockId: string }) {
  const withFrequency = harmonics.some((h) => h.frequency !== undefined);
  return (
    <details className="mt-3 rounded-md border border-rule bg-white/60">
      <summary className="cursor-pointer px-3 py-2 text-sm font-medium text-ink-soft">
        Harmonics table <span className="text-ink-faint">({harmonics.length} orders)</span>
      </summary>
      {/* Focusable so keyboard users can scroll it (a long list scrolls inside the block). */}
      <div className="max-h-72 overflow-auto border-t border-rule" tabIndex={0} role="region" aria-label={`Harmonics of ${blockId}`}>
        <table className="w-full text-right text-sm whitespace-nowrap tabular-nums">
          <thead className="sticky top-0 bg-sheet text-xs text-ink-faint">
            <tr>
              <th scope="col" className="px-3 py-1.5 font-medium">n</th>
              {withFrequency ? (
                <th scope="col" className="px-3 py-1.5 font-medium">Frequency</th>
              ) : null}
              <th scope="col" className="px-3 py-1.5 font-medium">Peak</th>
              <th scope="col" className="px-3 py-1.5 font-medium">RMS</th>
              <th scope="col" className="px-3 py-1.5 font-medium">% of fundamental</th>
            </tr>
          </thead>
          <tbody className="font-mono text-[13px]">
            {harmonics.map((h) => (
              <tr key={h.n} className="border-t border-rule/70">
                <th scope="row" className="px-3 py-1 font-medium">{h.n}</th>
                {withFrequency ? <td className="px-3 py-1">{h.frequency === undefined ? "—" : formatQuantity(h.frequency, "Hz")}</td> : null}
                <td className="px-3 py-1">{formatQuantity(h.peak, "V")}</td>
                <td className="px-3 py-1">{formatQuantity(h.rms, "V")}</td>
                <td className="px-3 py-1">{formatQuantity(h.percent, "%")}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </details>
  );
}
