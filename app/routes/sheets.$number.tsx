import { Form, Link, useLoaderData } from "react-router";
import type { Route } from "./+types/sheets.$number";
import { HardwareCaution } from "~/components/caution";
import { EmptyState } from "~/components/empty-state";
import { SheetView } from "~/components/sheet-view";
import { StatusBadge } from "~/components/status-badge";
import { TitleBlock } from "~/components/title-block";
import { parseSheetNumber } from "~/lib/sheets/numbering";
import { shortHash } from "~/lib/sheets/integrity";
import { requireMember } from "~/.server/access";
import { storedEvaluation } from "~/.server/sheet-view";
import { getRevision, getRevisionById, getSheet, listRevisions, revisionBlocks } from "~/.server/sheets";

export const meta: Route.MetaFunction = ({ data }) => [{ title: data ? `${data.sheet.label} ${data.sheet.title} · Sinewright` : "Sheet · Sinewright" }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const me = await requireMember(request, "viewer");
  const number = parseSheetNumber(params.number);
  const sheet = number ? await getSheet(me.team.teamId, number) : undefined;
  if (!sheet) throw new Response(null, { status: 404 });
  const revisions = await listRevisions(sheet.id);
  const revision = params.rev ? await getRevision(sheet.id, params.rev) : sheet.latestRevisionId ? await getRevisionById(sheet.latestRevisionId) : undefined;
  if (params.rev && !revision) throw new Response(null, { status: 404 });
  const stored = revision ? storedEvaluation(revision.engineVersion, await revisionBlocks([revision.id])) : null;
  return {
    teamName: me.team.teamName,
    canWrite: me.team.role !== "viewer",
    sheet: { id: sheet.id, label: sheet.label, title: sheet.title, tags: sheet.tags, projectCode: sheet.projectCode, projectName: sheet.projectName },
    revision: revision
      ? {
          label: revision.label,
          state: revision.state,
          note: revision.note,
          engineVersion: revision.engineVersion,
          contentHash: revision.contentHash,
          authorName: revision.authorName,
          createdAt: revision.createdAt.toISOString(),
          tree: revision.renderTree,
          isLatest: revision.id === sheet.latestRevisionId,
        }
      : null,
    stored,
    revisions: revisions.map((r) => ({ label: r.label, state: r.state, note: r.note, authorName: r.authorName, createdAt: r.createdAt.toISOString(), contentHash: r.contentHash })),
  };
}

export default function SheetPage() {
  const { teamName, canWrite, sheet, revision, stored, revisions } = useLoaderData<typeof loader>();
  const projectLabel = sheet.projectCode ? `${sheet.projectCode} — ${sheet.projectName}` : "Team library";
  return (
    <div className="space-y-6">
      <nav aria-label="Breadcrumb" className="text-sm text-ink-faint">
        <Link to="/sheets">Sheets</Link> <span aria-hidden="true">/</span>{" "}
        {sheet.projectCode ? (
          <>
            <Link to={`/projects/${sheet.projectCode}`}>{sheet.projectCode}</Link> <span aria-hidden="true">/</span>{" "}
          </>
        ) : null}
        <span className="font-mono">{sheet.label}</span>
      </nav>
      <TitleBlock
        data={{
          teamName,
          project: projectLabel,
          number: sheet.label,
          title: sheet.title,
          revision: revision?.label ?? "—",
          preparer: revision?.authorName ?? "—",
          date: revision ? revision.createdAt.slice(0, 10) : "—",
          status: revision?.state ?? "unsaved",
          engineVersion: revision?.engineVersion ?? "—",
          contentHash: revision ? shortHash(revision.contentHash) : undefined,
        }}
      />
      <div className="flex flex-wrap items-center gap-2">
        {canWrite ? (
          <Link className="btn btn-primary" to={`/sheets/${sheet.label}/edit`}>
            {revision ? "Edit — new revision" : "Start writing"}
          </Link>
        ) : null}
        {revisions.length > 1 ? (
          <Link className="btn btn-quiet" to={`/sheets/${sheet.label}/diff?from=${revisions[1]!.label}&to=${revisions[0]!.label}`}>
            Compare revisions
          </Link>
        ) : null}
        {revision && !revision.isLatest ? (
          <p role="status" className="text-sm text-[#5e480a]">
            You are reading revision {revision.label}; the latest is {revisions[0]?.label}.{" "}
            <Link to={`/sheets/${sheet.label}`} className="underline">
              Read the latest
            </Link>
          </p>
        ) : null}
      </div>
      {sheet.tags.length > 0 ? <p className="text-sm text-ink-faint">Tags: {sheet.tags.join(", ")}</p> : null}
      <HardwareCaution compact />
      {revision && stored ? (
        <article aria-label={`Sheet ${sheet.label} revision ${revision.label}`} className="panel p-5 sm:p-8">
          <SheetView tree={revision.tree as never} inputsById={stored.inputsById} evaluation={stored.evaluation} editable={false} />
        </article>
      ) : (
        <EmptyState title="Nothing saved yet">This sheet has no saved revision. {canWrite ? "Open the editor to write it." : "Its author has not saved it yet."}</EmptyState>
      )}
      {revisions.length > 0 ? (
        <section aria-labelledby="history-heading" className="panel p-5">
          <h2 id="history-heading" className="font-semibold">
            Revision history
          </h2>
          <ol className="mt-3 divide-y divide-rule">
            {revisions.map((r) => (
              <li key={r.label} className="flex flex-col gap-1 py-2 sm:flex-row sm:items-center sm:gap-4">
                <Link to={`/sheets/${sheet.label}/revisions/${r.label}`} className="w-16 font-mono">
                  Rev {r.label}
                </Link>
                <StatusBadge status={r.state} />
                <span className="text-sm text-ink-soft">
                  {r.authorName ?? "—"}, {r.createdAt.slice(0, 16).replace("T", " ")}
                </span>
                <span className="flex-1 text-sm">{r.note}</span>
                <span className="font-mono text-[11px] text-ink-faint">{shortHash(r.contentHash)}</span>
              </li>
            ))}
          </ol>
          {revisions.length > 1 ? (
            <Form method="get" action={`/sheets/${sheet.label}/diff`} className="mt-4 flex flex-wrap items-end gap-3">
              <div>
                <label className="field-label" htmlFor="diff-from">
                  Compare
                </label>
                <select id="diff-from" name="from" defaultValue={revisions[1]!.label} className="field-input !w-auto">
                  {revisions.map((r) => (
                    <option key={r.label}>{r.label}</option>
                  ))}
                </select>
              </div>
              <div>
                <label className="field-label" htmlFor="diff-to">
                  with
                </label>
                <select id="diff-to" name="to" defaultValue={revisions[0]!.label} className="field-input !w-auto">
                  {revisions.map((r) => (
                    <option key={r.label}>{r.label}</option>
                  ))}
                </select>
              </div>
              <button type="submit" className="btn btn-quiet">
                Show differences
              </button>
            </Form>
          ) : null}
        </section>
      ) : null}
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
