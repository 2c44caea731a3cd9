import { STAMP_MEANING } from "~/lib/cautions";
import { StatusBadge } from "./status-badge";

export interface TitleBlockData {
  teamName: string;
  project: string;
  number: string;
  title: string;
  revision: string;
  preparer: string;
  date: string;
  status: string;
  engineVersion: string;
  contentHash?: string;
}

/** The block of facts that heads every sheet on screen and on each printed page. */
export function TitleBlock({ data }: { data: TitleBlockData }) {
  const cells: [string, React.ReactNode][] = [
    ["Team", data.teamName],
    ["Project", data.project],
    ["Sheet", <span className="font-mono">{data.number}</span>],
    ["Revision", <span className="font-mono">{data.revision}</span>],
    ["Prepared by", data.preparer],
    ["Date", data.date],
    ["State", <StatusBadge status={data.status} />],
    ["Engine", <span className="font-mono">{data.engineVersion}</span>],
  ];
  return (
    <section aria-label="Title block" className="title-block overflow-hidden rounded-md border border-rule-strong bg-sheet">
      <div className="border-b border-rule-strong px-4 py-3">
        <p className="eyebrow">Calculation</p>
        <h1 className="font-serif text-2xl font-semibold leading-snug sm:text-3xl">{data.title}</h1>
      </div>
      <dl className="grid grid-cols-2 sm:grid-cols-4">
        {cells.map(([label, value], i) => (
          <div key={label} className={`border-rule px-4 py-2 ${i % 2 === 1 ? "border-l" : ""} ${i >= 2 ? "border-t" : ""} sm:border-l sm:[&:nth-child(4n+1)]:border-l-0 ${i >= 4 ? "sm:border-t" : "sm:border-t-0"}`}>
            <dt className="text-[11px] uppercase tracking-wider text-ink-faint">{label}</dt>
            <dd className="mt-0.5 text-sm">{value}</dd>
          </div>
        ))}
      </dl>
      {data.contentHash ? (
        <p className="border-t border-rule px-4 py-1.5 font-mono text-[11px] text-ink-faint">content hash {data.contentHash}</p>
      ) : null}
      <p className="border-t border-rule px-4 py-1.5 text-[11px] text-ink-faint">{STAMP_MEANING}</p>
    </section>
  );
}
