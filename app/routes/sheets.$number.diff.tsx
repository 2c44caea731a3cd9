import { Link, useLoaderData } from "react-router";
import type { Route } from "./+types/sheets.$number.diff";
import { HardwareCaution } from "~/components/caution";
import { PageHeader } from "~/components/empty-state";
import { ScrollRegion } from "~/components/scroll-region";
import { diffRevisions, type DiffBlock } from "~/lib/sheets/diff";
import { parseSheetNumber } from "~/lib/sheets/numbering";
import { requireMember } from "~/.server/access";
import { getRevision, getSheet, revisionBlocks } from "~/.server/sheets";

export const meta: Route.MetaFunction = () => [{ title: "Compare revisions · Sinewright" }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const me = await requireMember(request, context, "viewer");
  const number = parseSheetNumber(params.number);
  const sheet = number ? await getSheet(me.team.teamId, number) : undefined;
  if (!sheet) throw new Response(null, { status: 404 });
  const url = new URL(request.url);
  const [from, to] = await Promise.all([getRevision(sheet.id, url.searchParams.get("from") ?? ""), getRevision(sheet.id, url.searchParams.get("to") ?? "")]);
  if (!from || !to) throw new Response("Choose two revisions of this sheet to compare, e.g. ?from=A&to=B.", { status: 400 });
  const rows = await revisionBlocks([from.id, to.id]);
  const pick = (revisionId: string): DiffBlock[] =>
    rows
      .filter((r) => r.revisionId === revisionId)
      .map((r) => ({ blockId: r.blockId, calculator: r.calculator, inputs: r.inputs as Record<string, string>, results: r.results as Record<string, unknown> | null, ok: r.ok }));
  return {
    sheet: { label: sheet.label, title: sheet.title },
    from: { label: from.label, engineVersion: from.engineVersion },
    to: { label: to.label, engineVersion: to.engineVersion },
    sourceChanged: from.source !== to.source,
    changes: diffRevisions(pick(from.id), pick(to.id)),
  };
}

const KIND_WORDS = { added: "added", removed: "removed", changed: "changed", unchanged: "unchanged" } as const;

export default function SheetDiff() {
  const { sheet, from, to, changes, sourceChanged } = useLoaderData<typeof loader>();
  const changed = changes.filter((c) => c.kind !== "unchanged");
  return (
    <div>
      <nav aria-label="Breadcrumb" className="mb-2 text-sm text-ink-faint">
        <Link to={`/sheets/${sheet.label}`}>
          {sheet.label} {sheet.title}
        </Link>
      </nav>
      <PageHeader eyebrow={sheet.label} title={`Revision ${from.label} → ${to.label}`} />
      <p className="text-ink-soft">
        {changed.length === 0 ? "No block's inputs or results differ." : `${changed.length} of ${changes.length} blocks differ.`}
        {sourceChanged ? " The text of the sheet differs too." : " The text is identical."}
        {from.engineVersion !== to.engineVersion ? ` Engine ${from.engineVersion} → ${to.engineVersion}.` : ""}
      </p>
      <div className="mt-4">
        <HardwareCaution compact />
      </div>
      <ul className="mt-6 space-y-4">
        {changes.map((c) => (
          <li key={c.blockId} className={`panel p-4 ${c.kind === "unchanged" ? "border-dashed" : "border-l-4 border-l-copper"}`}>
            <h2 className="font-mono text-sm">
              {c.blockId} <span className="font-sans text-ink-faint">· {c.calculator} · {KIND_WORDS[c.kind]}</span>
            </h2>
            {c.inputs.length + c.results.length > 0 ? (
              <ScrollRegion label={`Changes in block ${c.blockId}`} className="mt-2">
                <table className="w-full min-w-[28rem] text-left text-sm">
                  <thead className="text-ink-faint">
                    <tr className="border-b border-rule">
                      <th className="py-1 pr-3 font-medium">What</th>
                      <th className="py-1 pr-3 font-medium">Rev {from.label}</th>
                      <th className="py-1 font-medium">Rev {to.label}</th>
                    </tr>
                  </thead>
                  <tbody>
                    {c.inputs.map((d) => (
                      <tr key={`in-${d.key}`} className="border-b border-rule last:border-0">
                        <th scope="row" className="py-1 pr-3 font-normal">
                          input <span className="font-mono">{d.key}</span>
                        </th>
                        <td className="py-1 pr-3 font-mono">{d.from ?? "—"}</td>
                        <td className="py-1 font-mono">{d.to ?? "—"}</td>
                      </tr>
                    ))}
                    {c.results.map((d) => (
                      <tr key={`out-${d.key}`} className="border-b border-rule last:border-0">
                        <th scope="row" className="py-1 pr-3 font-normal">
                          result <span className="font-mono">{d.key}</span>
                        </th>
                        <td className="py-1 pr-3 font-mono">{d.from ?? "—"}</td>
                        <td className="py-1 font-mono">{d.to ?? "—"}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </ScrollRegion>
            ) : null}
          </li>
        ))}
      </ul>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
