import type { EditorView } from "@codemirror/view";
import { useMemo, useRef, useState } from "react";
import { data, Link, redirect, useActionData, useLoaderData, useNavigation, type RouterContextProvider } from "react-router";
import type { Route } from "./+types/documents.$number.edit";
import { ReferenceList } from "~/components/citations";
import type { CitationTarget } from "~/components/sheet-view";
import { insertAtCursor, PreviewPending, SourceEditorLayout, useAutosavedSource, usePreview } from "~/components/source-editor";
import { citationKey, citationStatus, toCitationView, type CitationView } from "~/lib/documents/citations";
import { sourceEditorForm } from "~/lib/forms/sheets";
import type { SourceProblem } from "~/lib/mdx/types";
import { parseDocumentNumber, parseSheetNumber, sheetNumberLabel } from "~/lib/sheets/numbering";
import { requireMember } from "~/.server/access";
import { citableSheets, discardDocumentDraft, getDocument, getDocumentDraft, getVersion, saveDocumentDraft, saveDocumentVersion, STARTER_DOCUMENT } from "~/.server/documents";

export const meta: Route.MetaFunction = ({ data }) => [{ title: data ? `Editing ${data.document.label} · Sinewright` : "Document editor · Sinewright" }];

async function loadDocument(request: Request, context: Readonly<RouterContextProvider>, numberText: string) {
  const me = await requireMember(request, context, "engineer");
  const number = parseDocumentNumber(numberText);
  const document = number ? await getDocument(me.team.teamId, number) : undefined;
  if (!document) throw new Response(null, { status: 404 });
  return { me, document };
}

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { me, document } = await loadDocument(request, context, params.number);
  const [latest, draft, sheets] = await Promise.all([
    document.latestVersionId ? getVersion(document.id, { id: document.latestVersionId }) : undefined,
    getDocumentDraft(document.id, me.user.id),
    citableSheets(me.team.teamId),
  ]);
  const source = draft?.source ?? latest?.source ?? STARTER_DOCUMENT;
  return {
    document: { label: document.label, title: document.title, projectCode: document.projectCode },
    base: latest ? { id: latest.id, sequence: latest.sequence } : null,
    source,
    draft: draft ? { updatedAt: draft.updatedAt.toISOString(), staleBase: (draft.baseVersionId ?? null) !== (latest?.id ?? null) } : null,
    sheets,
  };
}

const editorAction = sourceEditorForm("baseVersionId", "version");

export async function action({ request, params, context }: Route.ActionArgs) {
  const { me, document } = await loadDocument(request, context, params.number);
  const parsed = editorAction.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) {
    return data({ problems: [] as SourceProblem[], conflict: null as string | null, error: parsed.error.issues[0]?.message ?? "The form was incomplete.", savedAt: null as string | null }, { status: 400 });
  }
  const input = parsed.data;
  if (input.intent === "autosave") {
    await saveDocumentDraft(document.id, me.user.id, input.source, input.baseVersionId || null);
    return { problems: [] as SourceProblem[], conflict: null as string | null, error: null as string | null, savedAt: new Date().toISOString() };
  }
  if (input.intent === "discard-draft") {
    await discardDocumentDraft(document.id, me.user.id);
    throw redirect(`/documents/${document.label}/edit`);
  }
  const outcome = await saveDocumentVersion(me, document, { source: input.source, baseVersionId: input.baseVersionId || null, note: input.note });
  if (outcome.ok) throw redirect(`/documents/${document.label}`);
  if (outcome.reason === "invalid") {
    return data({ problems: outcome.problems, conflict: null as string | null, error: "The document was not saved: fix the problems listed, then save again." as string | null, savedAt: null as string | null }, { status: 400 });
  }
  return data({ problems: [] as SourceProblem[], conflict: outcome.message as string | null, error: null as string | null, savedAt: null as string | null }, { status: 409 });
}

export default function DocumentEditor() {
  const loaded = useLoaderData<typeof loader>();
  const result = useActionData<typeof action>();
  const navigation = useNavigation();
  const { source, edit, status } = useAutosavedSource(loaded.source, { field: "baseVersionId", id: loaded.base?.id ?? null });
  const view = useRef<EditorView | null>(null);
  const [filter, setFilter] = useState("");
  const { pipeline, prepared, failed } = usePreview(source, "document");

  // The preview decides each citation's state from the revisions the page loaded (stamps are re-checked on the document page).
  const preview = useMemo(() => {
    if (!prepared?.ok) return { targets: {}, references: [] as CitationView[] };
    const seen = new Map<string, CitationView>();
    for (const c of prepared.citations) {
      const key = citationKey(c.sheet, c.rev);
      if (seen.has(key)) continue;
      const number = parseSheetNumber(c.sheet);
      const sheet = number === undefined ? undefined : loaded.sheets.find((s) => s.number === sheetNumberLabel(number));
      const status = citationStatus(sheet, c.rev);
      const label = sheet?.number ?? c.sheet.toUpperCase();
      const rev = c.rev.toUpperCase();
      seen.set(
        key,
        toCitationView(status, { key, sheet: label, rev, title: sheet?.title ?? null, href: sheet ? `/sheets/${label}/revisions/${rev}` : null, stampedAt: null, checkerName: null, contentHash: null }),
      );
    }
    const references = [...seen.values()];
    const targets: Record<string, CitationTarget> = Object.fromEntries(
      references.map((r, i) => [r.key, { title: r.title ?? "", state: r.state, words: r.words, href: r.href, reference: i + 1 }]),
    );
    return { targets, references };
  }, [prepared, loaded.sheets]);

  const citable = loaded.sheets.filter((s) => `${s.number} ${s.title} ${s.projectCode ?? ""}`.toLowerCase().includes(filter.trim().toLowerCase()));
  const cite = (sheet: string, rev: string) => {
    const snippet = `<Cite sheet="${sheet}" rev="${rev}" />`;
    insertAtCursor(view.current, snippet, () => edit(source + snippet));
  };

  const problems = result?.problems?.length ? result.problems : prepared && !prepared.ok ? prepared.problems : [];
  const saving = navigation.state !== "idle" && navigation.formData?.get("intent") === "save";

  return (
    <SourceEditorLayout
      breadcrumb={
        <>
          <Link to={`/projects/${loaded.document.projectCode}`}>{loaded.document.projectCode}</Link> <span aria-hidden="true">/</span>{" "}
          <Link to={`/documents/${loaded.document.label}`}>{loaded.document.label}</Link> <span aria-hidden="true">/</span> editor
        </>
      }
      eyebrow={`${loaded.document.label} · ${loaded.base ? `new version after ${loaded.base.sequence}` : "first version"}`}
      title={loaded.document.title}
      status={status}
      unit="version"
      draft={loaded.draft}
      conflict={result?.conflict}
      latestHref={`/documents/${loaded.document.label}`}
      error={result?.error}
      source={source}
      onChange={edit}
      editorLabel="Document source (MDX)"
      view={view}
      palette={
        <details className="panel p-3" open>
          <summary className="cursor-pointer text-sm font-semibold">Cite a calc sheet</summary>
          <label htmlFor="cite-filter" className="field-label mt-2">
            Find a sheet
          </label>
          <input id="cite-filter" className="field-input" value={filter} onChange={(e) => setFilter(e.target.value)} placeholder="number, title or project" />
          <ul className="mt-2 max-h-72 divide-y divide-rule overflow-y-auto text-sm">
            {citable.map((s) => {
              const verified = s.revisions.filter((r) => r.state === "verified").at(-1);
              const latest = s.revisions.at(-1)!;
              return (
                <li key={s.number} className="flex flex-col gap-1 py-2 sm:flex-row sm:items-center sm:gap-3">
                  <span className="min-w-0 flex-1">
                    <span className="font-mono">{s.number}</span> {s.title}
                  </span>
                  <span className="flex shrink-0 gap-2">
                    {verified ? (
                      <button type="button" className="btn btn-quiet" onClick={() => cite(s.number, verified.label)}>
                        {`Cite rev ${verified.label} (verified)`}
                        <span className="sr-only">{` of ${s.number}`}</span>
                      </button>
                    ) : null}
                    {latest.id !== verified?.id ? (
                      <button type="button" className="btn btn-quiet" onClick={() => cite(s.number, latest.label)}>
                        {`Cite rev ${latest.label} (${latest.state})`}
                        <span className="sr-only">{` of ${s.number}`}</span>
                      </button>
                    ) : null}
                  </span>
                </li>
              );
            })}
          </ul>
          <p className="mt-2 text-xs text-ink-faint">Cite verified revisions where you can: anything else is listed as needing attention.</p>
        </details>
      }
      problems={problems}
      save={{ baseField: "baseVersionId", baseId: loaded.base?.id ?? null, notePlaceholder: "e.g. added the filter section", buttonLabel: loaded.base ? "Save as new version" : "Save version 1", saving }}
      preview={
        !pipeline || !prepared ? (
          <PreviewPending failed={failed} />
        ) : prepared.ok ? (
          <>
            <pipeline.SheetView tree={prepared.tree} inputsById={{}} citations={preview.targets} />
            <ReferenceList citations={preview.references} />
          </>
        ) : (
          <p className="text-sm text-ink-soft">The preview returns when the problems in the source are fixed.</p>
        )
      }
    />
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
