import type { Root } from "hast";
import { useMemo } from "react";
import { data, Link, useActionData, useLoaderData, useNavigation } from "react-router";
import type { Route } from "./+types/documents.$number";
import { HardwareCaution } from "~/components/caution";
import { ReferenceList, StaleCitationList } from "~/components/citations";
import { EmptyState } from "~/components/empty-state";
import { FormError, Notice } from "~/components/form-fields";
import { PrintButton, PrintTitleStrip } from "~/components/print-button";
import { SheetView, type CitationTarget } from "~/components/sheet-view";
import { citationUpdateForm } from "~/lib/forms/sheets";
import { parseDocumentNumber } from "~/lib/sheets/numbering";
import { requireMember, type Member } from "~/.server/access";
import { citationView, DocumentRuleError, getDocument, getVersion, listVersions, updateCitation, versionCitations } from "~/.server/documents";
import { roleAtLeast } from "~/.server/roles";

export const meta: Route.MetaFunction = ({ data }) => [{ title: data ? `${data.document.label} ${data.document.title} · Sinewright` : "Project document · Sinewright" }];

async function loadDocument(params: { number: string }, me: Member) {
  const number = parseDocumentNumber(params.number);
  const document = number ? await getDocument(me.team.teamId, number) : undefined;
  if (!document) throw new Response(null, { status: 404 });
  return document;
}

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const me = await requireMember(request, context, "viewer");
  const document = await loadDocument(params, me);
  const sequence = params.version === undefined ? undefined : Number(params.version);
  if (sequence !== undefined && !(Number.isInteger(sequence) && sequence > 0)) throw new Response(null, { status: 404 });
  const version = sequence !== undefined ? await getVersion(document.id, { sequence }) : document.latestVersionId ? await getVersion(document.id, { id: document.latestVersionId }) : undefined;
  if (sequence !== undefined && !version) throw new Response(null, { status: 404 });
  const [versions, citations] = await Promise.all([listVersions(document.id), version ? versionCitations(me.team.teamId, version.id) : []]);
  return {
    teamName: me.team.teamName,
    canWrite: roleAtLeast(me.team.role, "engineer"),
    document: { id: document.id, label: document.label, title: document.title, projectCode: document.projectCode, projectName: document.projectName },
    version: version
      ? { id: version.id, sequence: version.sequence, note: version.note, authorName: version.authorName, createdAt: version.createdAt.toISOString(), tree: version.renderTree, isLatest: version.id === document.latestVersionId }
      : null,
    versions: versions.map((v) => ({ sequence: v.sequence, note: v.note, authorName: v.authorName, createdAt: v.createdAt.toISOString() })),
    citations: citations.map(citationView),
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const me = await requireMember(request, context, "engineer");
  const document = await loadDocument(params, me);
  const parsed = citationUpdateForm.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ ok: false, message: parsed.error.issues[0]?.message ?? "The form was incomplete." }, { status: 400 });
  if (parsed.data.documentId !== document.id) return data({ ok: false, message: "That citation belongs to another document." }, { status: 400 });
  try {
    const updated = await updateCitation(me, document.id, parsed.data);
    return { ok: true, message: `${updated.sheet} now cited at revision ${updated.to} (was ${updated.from}); saved as version ${updated.version}.` };
  } catch (error) {
    if (error instanceof DocumentRuleError) return data({ ok: false, message: error.message }, { status: 400 });
    throw error;
  }
}

export default function DocumentPage() {
  const { teamName, canWrite, document, version, versions, citations } = useLoaderData<typeof loader>();
  const result = useActionData<typeof action>();
  const navigation = useNavigation();
  const targets = useMemo(
    () => Object.fromEntries(citations.map((c, i) => [c.key, { title: c.title ?? "", state: c.state, words: c.words, href: c.href, reference: i + 1 } satisfies CitationTarget])),
    [citations],
  );
  const stale = citations.filter((c) => c.stale);
  const busyKey = navigation.formData?.get("intent") === "update-citation" ? `${document.id}:${String(navigation.formData.get("sheet"))}@${String(navigation.formData.get("rev"))}` : null;
  return (
    <div className="sheet-page space-y-6">
      {version ? <PrintTitleStrip left={teamName} center={`${document.label} v${version.sequence} — ${document.title}`} right={stale.length ? `${stale.length} citation(s) need attention` : "All citations verified"} /> : null}
      <nav aria-label="Breadcrumb" className="text-sm text-ink-faint">
        <Link to="/projects">Projects</Link> <span aria-hidden="true">/</span> <Link to={`/projects/${document.projectCode}`}>{document.projectCode}</Link>{" "}
        <span aria-hidden="true">/</span> <span className="font-mono">{document.label}</span>
      </nav>
      <header className="title-block overflow-hidden rounded-md border border-rule-strong bg-sheet">
        <div className="border-b border-rule-strong px-4 py-3">
          <p className="eyebrow">Project document</p>
          <h1 className="font-serif text-2xl font-semibold">{document.title}</h1>
        </div>
        <dl className="grid grid-cols-2 text-sm sm:grid-cols-4">
          {[
            ["Document", <span className="font-mono">{document.label}</span>],
            ["Project", `${document.projectCode} — ${document.projectName}`],
            ["Version", version ? <span className="font-mono">{`${version.sequence} of ${versions.length}`}</span> : "—"],
            ["Saved", version ? `${version.createdAt.slice(0, 10)} by ${version.authorName ?? "—"}` : "—"],
          ].map(([term, value], i) => (
            <div key={i} className="border-rule px-4 py-2 [&:not(:last-child)]:border-r">
              <dt className="text-xs uppercase tracking-wide text-ink-faint">{term}</dt>
              <dd>{value}</dd>
            </div>
          ))}
        </dl>
      </header>
      {result ? result.ok ? <Notice tone="success">{result.message}</Notice> : <FormError message={result.message} /> : null}
      <div className="flex flex-wrap items-center gap-2 print:hidden">
        {canWrite ? (
          <Link className="btn btn-primary" to={`/documents/${document.label}/edit`}>
            {version ? "Edit — new version" : "Start writing"}
          </Link>
        ) : null}
        {version && !version.isLatest ? (
          <p role="status" className="text-sm text-[#5e480a]">
            You are reading version {version.sequence}; the latest is {versions[0]?.sequence}.{" "}
            <Link to={`/documents/${document.label}`} className="underline">
              Read the latest
            </Link>
          </p>
        ) : null}
        {version ? <PrintButton /> : null}
      </div>
      {stale.length > 0 ? (
        <section aria-labelledby="stale-heading" className="panel border-[#e3cf8f]">
          <h2 id="stale-heading" className="border-b border-rule px-4 py-3 font-semibold">
            {`${stale.length} citation${stale.length === 1 ? " needs" : "s need"} attention`}
          </h2>
          <StaleCitationList
            rows={stale.map((c) => ({ document: { id: document.id, label: document.label, title: document.title, version: version?.sequence ?? 0 }, citation: c }))}
            canUpdate={canWrite && Boolean(version?.isLatest)}
            showDocument={false}
            busyKey={busyKey}
          />
        </section>
      ) : null}
      <HardwareCaution compact />
      {version ? (
        <article aria-label={`Document ${document.label} version ${version.sequence}`} className="panel p-5 sm:p-8">
          <SheetView tree={version.tree as Root} inputsById={{}} citations={targets} />
          <ReferenceList citations={citations} />
        </article>
      ) : (
        <EmptyState title="Nothing saved yet">This document has no saved version. {canWrite ? "Open the editor to write it." : "Its author has not saved it yet."}</EmptyState>
      )}
      {versions.length > 0 ? (
        <section aria-labelledby="versions-heading" className="print:hidden">
          <h2 id="versions-heading" className="mb-3 font-semibold">
            Versions
          </h2>
          <ol className="panel divide-y divide-rule text-sm">
            {versions.map((v) => (
              <li key={v.sequence} className="flex flex-col gap-1 px-4 py-2 sm:flex-row sm:gap-4">
                <Link to={`/documents/${document.label}/versions/${v.sequence}`} className="w-24 font-mono">
                  {`version ${v.sequence}`}
                </Link>
                <span className="flex-1 text-ink-soft">{v.note || "—"}</span>
                <span className="text-ink-faint">{`${v.createdAt.slice(0, 16).replace("T", " ")} · ${v.authorName ?? "—"}`}</span>
              </li>
            ))}
          </ol>
        </section>
      ) : null}
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
