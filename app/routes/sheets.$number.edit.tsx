import type { EditorView } from "@codemirror/view";
import { useCallback, useRef, useState } from "react";
import { data, Link, redirect, useActionData, useLoaderData, useNavigation, type RouterContextProvider } from "react-router";
import type { Route } from "./+types/sheets.$number.edit";
import { AttachmentsPanel } from "~/components/attachments-panel";
import { insertAtCursor, loadPreviewPipeline, PreviewPending, SourceEditorLayout, useAutosavedSource, usePreview } from "~/components/source-editor";
import { sourceEditorForm } from "~/lib/forms/sheets";
import type { SourceProblem } from "~/lib/mdx/types";
import { parseSheetNumber } from "~/lib/sheets/numbering";
import { requireMember } from "~/.server/access";
import { attachmentLimitBytes, capturesForSheet, listAttachments } from "~/.server/attachments";
import { discardDraft, getDraft, getRevisionById, getSheet, saveDraft, saveRevision, STARTER_SOURCE } from "~/.server/sheets";
import { calculators } from "~/lib/calc/registry";

export const meta: Route.MetaFunction = ({ data }) => [{ title: data ? `Editing ${data.sheet.label} · Sinewright` : "Editor · Sinewright" }];

async function loadSheet(request: Request, context: Readonly<RouterContextProvider>, numberText: string) {
  const me = await requireMember(request, context, "engineer");
  const number = parseSheetNumber(numberText);
  const sheet = number ? await getSheet(me.team.teamId, number) : undefined;
  if (!sheet) throw new Response(null, { status: 404 });
  return { me, sheet };
}

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { me, sheet } = await loadSheet(request, context, params.number);
  const [latest, draft, attachments, captures] = await Promise.all([
    sheet.latestRevisionId ? getRevisionById(sheet.latestRevisionId) : undefined,
    getDraft(sheet.id, me.user.id),
    listAttachments(sheet.id),
    capturesForSheet(sheet.id),
  ]);
  const source = draft?.source ?? latest?.source ?? STARTER_SOURCE;
  return {
    sheet: { label: sheet.label, title: sheet.title },
    base: latest ? { id: latest.id, label: latest.label } : null,
    source,
    draft: draft ? { updatedAt: draft.updatedAt.toISOString(), staleBase: (draft.baseRevisionId ?? null) !== (latest?.id ?? null) } : null,
    draftBaseId: draft ? draft.baseRevisionId : null,
    palette: calculators.map((c) => ({ id: c.id, title: c.title, summary: c.summary })),
    attachments: attachments.map((a) => ({ ...a, url: `/sheets/${sheet.label}/attachments/${a.id}` })),
    // Analyses only (no samples): the preview measures with the same numbers the save will.
    captures,
    attachmentLimit: attachmentLimitBytes(),
  };
}

const editorAction = sourceEditorForm("baseRevisionId", "revision");

export async function action({ request, params, context }: Route.ActionArgs) {
  const { me, sheet } = await loadSheet(request, context, params.number);
  const parsed = editorAction.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) {
    return data({ problems: [] as SourceProblem[], conflict: null as string | null, error: parsed.error.issues[0]?.message ?? "The form was incomplete.", savedAt: null as string | null }, { status: 400 });
  }
  const input = parsed.data;
  if (input.intent === "autosave") {
    await saveDraft(sheet.id, me.user.id, input.source, input.baseRevisionId || null);
    return { problems: [] as SourceProblem[], conflict: null as string | null, error: null as string | null, savedAt: new Date().toISOString() };
  }
  if (input.intent === "discard-draft") {
    await discardDraft(sheet.id, me.user.id);
    throw redirect(`/sheets/${sheet.label}/edit`);
  }
  const outcome = await saveRevision(me, sheet, { source: input.source, baseRevisionId: input.baseRevisionId || null, note: input.note });
  if (outcome.ok) throw redirect(`/sheets/${sheet.label}`);
  if (outcome.reason === "invalid") {
    return data({ problems: outcome.problems, conflict: null as string | null, error: "The sheet was not saved: fix the problems listed, then save again." as string | null, savedAt: null as string | null }, { status: 400 });
  }
  return data({ problems: [] as SourceProblem[], conflict: outcome.message as string | null, error: null as string | null, savedAt: null as string | null }, { status: 409 });
}

export default function SheetEditor() {
  const loaded = useLoaderData<typeof loader>();
  const result = useActionData<typeof action>();
  const navigation = useNavigation();
  const { source, edit, latest: latestSource, status } = useAutosavedSource(loaded.source, { field: "baseRevisionId", id: loaded.base?.id ?? null });
  const [writeBackError, setWriteBackError] = useState<string | null>(null);
  const view = useRef<EditorView | null>(null);
  const { pipeline, prepared, deferredSource, failed } = usePreview(source, "sheet", loaded.captures);

  const onInputChange = useCallback(
    (blockId: string, key: string, value: string) => {
      // Inputs are edited in the preview, which is only there once the pipeline is.
      if (!pipeline || !prepared) return;
      const { checkSheetSource, setBlockInput } = pipeline;
      const current = latestSource.current;
      // The preview may lag behind the source (deferred); block positions must come from the current text.
      const checked = prepared.ok && deferredSource === current ? prepared : checkSheetSource(current, "sheet");
      if (!checked.ok) return;
      const block = checked.blocks.find((b) => b.id === blockId);
      if (!block) return;
      try {
        edit(setBlockInput(current, block, key, value));
        setWriteBackError(null);
      } catch (error) {
        // The source could not take this value (e.g. a line break): say so instead of losing it silently.
        setWriteBackError(`${blockId}.${key}: ${error instanceof Error ? error.message : String(error)}`);
      }
    },
    [pipeline, prepared, deferredSource, edit],
  );

  const insertBlock = async (calculatorId: string) => {
    const { blockSnippet, nextBlockId } = pipeline ?? (await loadPreviewPipeline());
    const existing = prepared?.ok ? prepared.blocks.map((b) => b.id) : [];
    const snippet = `\n${blockSnippet(calculatorId, nextBlockId(calculatorId, existing))}\n`;
    insertAtCursor(view.current, snippet, () => edit(source + snippet));
  };

  /** A measured block for a capture, compared with the first waveform calculator on the sheet. */
  const insertMeasurement = async (fileName: string) => {
    const { measurementSnippet } = pipeline ?? (await loadPreviewPipeline());
    const taken = prepared?.ok ? [...prepared.blocks.map((b) => b.id), ...prepared.measurementBlocks.map((m) => m.id)] : [];
    let n = 1;
    while (taken.includes(`m${n}`)) n++;
    const compare = prepared?.ok
      ? prepared.blocks.find((b) => {
          const outcome = prepared.evaluation.blocks[b.id];
          return outcome?.ok && Array.isArray(outcome.results.harmonics);
        })?.id
      : undefined;
    const snippet = `\n${measurementSnippet(`m${n}`, fileName, compare)}\n`;
    insertAtCursor(view.current, snippet, () => edit(source + snippet));
  };

  const problems = result?.problems?.length ? result.problems : prepared && !prepared.ok ? prepared.problems : [];
  const saving = navigation.state !== "idle" && navigation.formData?.get("intent") === "save";

  return (
    <SourceEditorLayout
      breadcrumb={
        <>
          <Link to="/sheets">Sheets</Link> <span aria-hidden="true">/</span> <Link to={`/sheets/${loaded.sheet.label}`}>{loaded.sheet.label}</Link>{" "}
          <span aria-hidden="true">/</span> editor
        </>
      }
      eyebrow={`${loaded.sheet.label} · ${loaded.base ? `new revision after ${loaded.base.label}` : "first revision"}`}
      title={loaded.sheet.title}
      status={status}
      unit="revision"
      draft={loaded.draft}
      conflict={result?.conflict}
      latestHref={`/sheets/${loaded.sheet.label}`}
      error={result?.error}
      source={source}
      onChange={edit}
      editorLabel="Sheet source (MDX)"
      view={view}
      palette={
        <details className="panel p-3" open>
          <summary className="cursor-pointer text-sm font-semibold">Insert a calculator</summary>
          <ul className="mt-2 grid gap-1 sm:grid-cols-2">
            {loaded.palette.map((c) => (
              <li key={c.id}>
                <button type="button" className="w-full rounded px-2 py-1.5 text-left text-sm hover:bg-paper" onClick={() => void insertBlock(c.id)} title={c.summary}>
                  <span className="font-medium">{c.title}</span>
                  <span className="block text-xs text-ink-faint">{c.summary}</span>
                </button>
              </li>
            ))}
          </ul>
          <p className="mt-2 text-xs text-ink-faint">
            Blocks are inserted at the cursor with every input at its default. <Link to="/calculators">What each calculator does</Link>
          </p>
          {Object.keys(loaded.captures).length > 0 ? (
            <div className="mt-3 border-t border-rule pt-3">
              <h3 className="m-0 text-sm font-semibold">Measure an attached capture</h3>
              <ul className="mt-1 grid gap-1 p-0">
                {Object.keys(loaded.captures).map((fileName) => (
                  <li key={fileName} className="list-none">
                    <button type="button" className="w-full rounded px-2 py-1.5 text-left text-sm hover:bg-paper" onClick={() => void insertMeasurement(fileName)}>
                      <span className="font-mono">{fileName}</span>
                      <span className="block text-xs text-ink-faint">Measured waveform, compared with the first waveform calculator on the sheet</span>
                    </button>
                  </li>
                ))}
              </ul>
            </div>
          ) : null}
        </details>
      }
      problems={problems}
      save={{ baseField: "baseRevisionId", baseId: loaded.base?.id ?? null, notePlaceholder: "e.g. raised fsw to 20 kHz; re-sized C", buttonLabel: loaded.base ? "Save as new revision" : "Save revision A", saving }}
      previewAlert={
        writeBackError ? (
          <div role="alert" className="mb-3 rounded-md border border-[#e2b4b0] bg-danger-wash px-3 py-2 text-sm text-danger">
            {writeBackError}
          </div>
        ) : null
      }
      preview={
        !pipeline || !prepared ? (
          <PreviewPending failed={failed} />
        ) : prepared.ok ? (
          <pipeline.SheetView
            tree={prepared.tree}
            inputsById={Object.fromEntries(prepared.blocks.map((b) => [b.id, b.inputs]))}
            evaluation={prepared.evaluation}
            editable
            onInputChange={onInputChange}
            measurements={prepared.measurements}
            attachmentHref={(id) => `/sheets/${loaded.sheet.label}/attachments/${id}`}
          />
        ) : (
          <p className="text-sm text-ink-soft">The preview returns when the problems in the source are fixed.</p>
        )
      }
      after={<AttachmentsPanel sheetLabel={loaded.sheet.label} attachments={loaded.attachments} canUpload maxBytes={loaded.attachmentLimit} />}
    />
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
