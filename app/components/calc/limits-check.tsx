import { VERDICT_NOTE } from "~/lib/calc/verdict-note";
import { formatQuantity } from "~/lib/calc/format";
import type { LimitRow, ScalarResult, StandardSource } from "~/lib/calc/types";
import { OverMark, PassMark, WarningMark } from "./status-icons";

interface LimitsCheckProps {
  blockId: string;
  rows: readonly LimitRow[];
  /** Undefined when the engine gives no verdict (limits from memory, interharmonics); the block's notes say why. */
  pass: boolean | undefined;
  source: StandardSource | undefined;
  thd: ScalarResult | undefined;
  thdLimit: ScalarResult | undefined;
}

function Verdict({ pass }: { pass: boolean }) {
  return pass ? (
    <span className="inline-flex items-center gap-1 font-semibold text-verified">
      <PassMark /> Pass
    </span>
  ) : (
    <span className="inline-flex items-center gap-1 font-semibold text-danger">
      <OverMark /> Over
    </span>
  );
}

/** A row's comparison when the limits are informative only: words, no pass mark. */
function Informative({ pass }: { pass: boolean }) {
  return <span className="font-medium text-[#5e480a]">{pass ? "within" : "above"} (informative)</span>;
}

/** The harmonic-limits verdict: overall word, THD against its limit, every order, and where the limits come from. */
export function LimitsCheck({ blockId, rows, pass, source, thd, thdLimit }: LimitsCheckProps) {
  const unverified = source?.status === "memory";
  const over = rows.filter((r) => !r.pass).length;
  const thdOver = thd !== undefined && thdLimit !== undefined && thd.value > thdLimit.value;
  const orders = rows.length === 1 ? "order" : "orders";
  const reasons = [
    over > 0 ? `${over} of ${rows.length} ${orders} over the limit` : rows.length === 1 ? "the one order listed is within its limit" : `all ${rows.length} orders within their limits`,
  ];
  if (thd && thdLimit) reasons.push(thdOver ? "THD over its limit" : "THD within its limit");

  return (
    <section aria-label={`Limits check of ${blockId}`} className="mt-4 space-y-3">
      <div
        className={`rounded-md border px-3 py-2.5 ${pass === undefined ? "border-[#e3cf8f] bg-waiting-wash" : pass ? "border-[#b8d3b3] bg-verified-wash" : "border-[#e2b4b0] bg-danger-wash"}`}
      >
        {pass === undefined ? (
          <p className="m-0 flex flex-wrap items-baseline gap-x-2 text-base">
            <span className="inline-flex items-center gap-1 font-semibold text-[#5e480a]">
              <WarningMark /> No verdict
            </span>{" "}
            <span className="text-sm text-ink-soft">
              — {unverified ? "these limits were entered from memory and are unverified: the comparison below is informative only" : "the spectrum has lines the table does not limit (see the notes above)"}.
            </span>
          </p>
        ) : (
          <p className="m-0 flex flex-wrap items-baseline gap-x-2 text-base">
            <span className="text-sm text-ink-soft">Verdict (estimate):</span> <Verdict pass={pass} />{" "}
            <span className="text-sm text-ink-soft">— {reasons.join("; ")}.</span>
          </p>
        )}
        {thd && thdLimit ? (
          <p className="m-0 mt-1 text-sm text-ink-soft">
            THD <span className="font-mono text-ink">{thd.display}</span> against a limit of{" "}
            <span className="font-mono text-ink">{thdLimit.display}</span>.
          </p>
        ) : null}
      </div>

      {source ? (
        <p className="m-0 text-sm text-ink-soft">
          <span className="font-medium text-ink">Limits from</span> {source.standard}, {source.edition}, {source.table}
          {source.note ? <span className="text-ink-faint"> — {source.note}</span> : null}
          {unverified ? (
            <span className="ml-2 inline-flex items-center gap-1 rounded border border-[#e3cf8f] bg-waiting-wash px-1.5 py-0.5 text-xs font-semibold text-[#5e480a]">
              <WarningMark /> Unverified: entered from memory
            </span>
          ) : null}
        </p>
      ) : null}

      <p className="m-0 text-sm italic text-ink-soft">{VERDICT_NOTE}</p>

      {rows.length > 0 ? (
        <div className="max-h-80 overflow-auto rounded-md border border-rule" tabIndex={0} role="region" aria-label={`Harmonic-by-harmonic limits of ${blockId}`}>
          <table className="w-full text-right text-xs whitespace-nowrap tabular-nums sm:text-sm">
            <thead className="sticky top-0 bg-sheet text-xs text-ink-faint">
              <tr>
                <th scope="col" className="px-2 py-1.5 font-medium sm:px-3">n</th>
                <th scope="col" className="px-2 py-1.5 text-left font-medium sm:px-3">{unverified ? "Comparison" : "Verdict"}</th>
                <th scope="col" className="px-2 py-1.5 font-medium sm:px-3">Value</th>
                <th scope="col" className="px-2 py-1.5 font-medium sm:px-3">Limit</th>
                <th scope="col" className="px-2 py-1.5 font-medium sm:px-3">Margin</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((row) => {
                const unit = row.unit ?? "%";
                return (
                  <tr key={row.n} className={`border-t border-rule/70 ${row.pass ? "" : "bg-danger-wash/60"}`}>
                    <th scope="row" className="px-2 py-1 font-mono font-medium sm:px-3">{row.n}</th>
                    <td className="px-2 py-1 text-left sm:px-3">
                      {unverified ? <Informative pass={row.pass} /> : <Verdict pass={row.pass} />}
                    </td>
                    <td className="px-2 py-1 font-mono sm:px-3">{formatQuantity(row.value, unit)}</td>
                    <td className="px-2 py-1 font-mono sm:px-3">{formatQuantity(row.limit, unit)}</td>
                    <td className="px-2 py-1 font-mono sm:px-3">{formatQuantity(row.margin, unit)}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      ) : null}
    </section>
  );
}
