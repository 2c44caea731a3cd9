/**
 * The MDX editor shared by calc sheets and project documents: CodeMirror with a named,
 * keyboard-reachable editing area, the autosaved draft, the live preview and the list of
 * problems the source check found.
 *
 * The editor loads with the page; the preview's pipeline (MDX check, engine, KaTeX) follows
 * by dynamic import (`usePreview`), so the source is there at once and the preview says it
 * is being prepared until the pipeline arrives.
 */
import { markdown } from "@codemirror/lang-markdown";
import { EditorView } from "@codemirror/view";
import CodeMirror from "@uiw/react-codemirror";
import { useCallback, useDeferredValue, useEffect, useMemo, useRef, useState, type ReactNode, type RefObject } from "react";
import { Form, Link, useFetcher } from "react-router";
import type { SourceKind, SourceProblem } from "~/lib/mdx/types";
import type { StoredCapture } from "~/lib/waveform/measurement";
import { HardwareCaution } from "./caution";
import { FormError, Notice } from "./form-fields";

const AUTOSAVE_DELAY_MS = 2_000;

/**
 * The author's text, kept as a draft on the server shortly after typing stops. The
 * route's action takes `intent=autosave` with `source` and the base field.
 */
export function useAutosavedSource(initial: string, base: { field: string; id: string | null }) {
  const autosave = useFetcher<{ savedAt?: string | null }>();
  const [source, setSource] = useState(initial);
  const [dirty, setDirty] = useState(false);
  // The latest source, even between renders: two quick edits must build on each other.
  const latest = useRef(initial);

  useEffect(() => {
    if (!dirty) return;
    const timer = setTimeout(() => {
      autosave.submit({ intent: "autosave", source, [base.field]: base.id ?? "" }, { method: "post" });
      setDirty(false);
    }, AUTOSAVE_DELAY_MS);
    return () => clearTimeout(timer);
  }, [source, dirty, autosave, base.field, base.id]);

  const edit = useCallback((next: string) => {
    latest.current = next;
    setSource(next);
    setDirty(true);
  }, []);

  const savedAt = autosave.data?.savedAt;
  const status = autosave.state !== "idle" ? "Saving draft…" : savedAt ? `Draft kept at ${savedAt.slice(11, 19)} UTC` : dirty ? "Unsaved changes" : "";
  return { source, edit, latest, status };
}

type PreviewPipeline = typeof import("./preview-pipeline");
let pipelineLoad: Promise<PreviewPipeline> | undefined;
let pipelineLoaded: PreviewPipeline | undefined;

/** The preview's pipeline, loaded once per page load (a failed load is tried again on the next call). */
export function loadPreviewPipeline(): Promise<PreviewPipeline> {
  pipelineLoad ??= import("./preview-pipeline").then(
    (pipeline) => (pipelineLoaded = pipeline),
    (error: unknown) => {
      pipelineLoad = undefined;
      throw error;
    },
  );
  return pipelineLoad;
}

const NO_CAPTURES: Readonly<Record<string, StoredCapture>> = {};

/**
 * The source checked and computed for the preview, once the pipeline has arrived: until
 * then `pipeline` and `prepared` are undefined (on the server and at hydration too, so both
 * render the same "preparing" state). The preview may lag the source while typing
 * (`deferredSource` is what `prepared` was made from).
 */
export function usePreview(source: string, kind: SourceKind, captures: Readonly<Record<string, StoredCapture>> = NO_CAPTURES) {
  const [pipeline, setPipeline] = useState<PreviewPipeline | undefined>(() => pipelineLoaded);
  const [failed, setFailed] = useState(false);
  useEffect(() => {
    if (pipeline) return;
    let current = true;
    loadPreviewPipeline().then(
      (loaded) => current && setPipeline(loaded),
      () => current && setFailed(true),
    );
    return () => {
      current = false;
    };
  }, [pipeline]);
  const deferredSource = useDeferredValue(source);
  const prepared = useMemo(() => pipeline?.prepareSheet(deferredSource, kind, captures), [pipeline, deferredSource, kind, captures]);
  return { pipeline, prepared, deferredSource, failed };
}

/** What the preview pane shows before the pipeline is here. */
export function PreviewPending({ failed }: { failed: boolean }) {
  return failed ? (
    <p role="alert" className="text-sm text-danger">
      The preview could not be loaded. Reload the page to try again; what you type is still kept as a draft.
    </p>
  ) : (
    <p role="status" className="text-sm text-ink-soft">
      Preparing the preview…
    </p>
  );
}

export function SourceCodeEditor({ source, onChange, label, view }: { source: string; onChange: (next: string) => void; label: string; view: RefObject<EditorView | null> }) {
  // The editable area itself carries the name and an explicit tab stop, for screen readers and keyboard users.
  const extensions = useMemo(() => [markdown(), EditorView.contentAttributes.of({ "aria-label": label, tabindex: "0" }), EditorView.lineWrapping], [label]);
  // CodeMirror starts in the browser after hydration; until then the text itself fills the box.
  const [started, setStarted] = useState(false);
  return (
    <div className="overflow-hidden rounded-md border border-rule-strong bg-white text-sm">
      {started ? null : (
        <pre className="m-0 max-h-[70vh] min-h-[28rem] overflow-auto px-[0.4rem] py-1 pl-9 font-mono leading-[1.4] whitespace-pre-wrap text-ink">
          {source}
        </pre>
      )}
      <CodeMirror
        value={source}
        onChange={onChange}
        extensions={extensions}
        indentWithTab={false}
        basicSetup={{ foldGutter: false, highlightActiveLine: false }}
        minHeight="28rem"
        maxHeight="70vh"
        onCreateEditor={(editorView) => {
          view.current = editorView;
          setStarted(true);
        }}
      />
    </div>
  );
}

/** Inserts text at the cursor (or at the end when the editor is not up yet) and returns the focus to the editor. */
export function insertAtCursor(view: EditorView | null, text: string, fallback: () => void) {
  if (!view) return fallback();
  const at = view.state.selection.main.head;
  view.dispatch({ changes: { from: at, insert: text }, selection: { anchor: at + text.length } });
  view.focus();
}

export function SourceProblems({ problems }: { problems: SourceProblem[] }) {
  if (problems.length === 0) return null;
  return (
    <div role="alert" className="panel border-[#e2b4b0] p-3">
      <h3 className="text-sm font-semibold text-danger">Problems in the source</h3>
      <ul className="mt-1 space-y-1 text-sm">
        {problems.map((p, i) => (
          <li key={i}>
            <span className="font-mono text-ink-faint">{`line ${p.line}, column ${p.column}:`}</span> {p.message}
          </li>
        ))}
      </ul>
    </div>
  );
}

export interface SourceEditorLayoutProps {
  breadcrumb: ReactNode;
  eyebrow: string;
  title: string;
  /** The autosave line from useAutosavedSource. */
  status: string;
  /** What a save makes: "revision" for sheets, "version" for documents. */
  unit: "revision" | "version";
  draft: { updatedAt: string; staleBase: boolean } | null;
  conflict: string | null | undefined;
  /** Where the newest saved revision or version is read. */
  latestHref: string;
  error: string | null | undefined;
  source: string;
  onChange: (next: string) => void;
  editorLabel: string;
  view: RefObject<EditorView | null>;
  /** What the author inserts from: calculators for sheets, citable sheets for documents. */
  palette: ReactNode;
  problems: SourceProblem[];
  save: { baseField: string; baseId: string | null; notePlaceholder: string; buttonLabel: string; saving: boolean };
  /** Shown above the preview, e.g. a value that could not be written back. */
  previewAlert?: ReactNode;
  preview: ReactNode;
  /** Below the source and the preview, e.g. the sheet's attachments. */
  after?: ReactNode;
}

/** Source on the left, live preview on the right (stacked on a phone), with the draft, conflict and save around them. */
export function SourceEditorLayout(props: SourceEditorLayoutProps) {
  const { unit, save } = props;
  return (
    <div className="space-y-4">
      <nav aria-label="Breadcrumb" className="text-sm text-ink-faint">
        {props.breadcrumb}
      </nav>
      <header className="flex flex-col gap-2 sm:flex-row sm:items-end sm:justify-between">
        <div>
          <p className="eyebrow">{props.eyebrow}</p>
          <h1 className="font-serif text-2xl font-semibold">{props.title}</h1>
        </div>
        <p className="text-xs text-ink-faint" role="status" aria-live="polite">
          {props.status}
        </p>
      </header>

      {props.draft ? (
        <Notice tone="caution">
          Restored your unsaved draft from {props.draft.updatedAt.slice(0, 16).replace("T", " ")} UTC.
          {props.draft.staleBase ? ` Someone has saved a newer ${unit} since: compare before saving.` : ""}{" "}
          <Form method="post" className="inline">
            <input type="hidden" name="intent" value="discard-draft" />
            <button type="submit" className="underline">
              Discard the draft
            </button>
          </Form>
        </Notice>
      ) : null}
      {props.conflict ? (
        <div role="alert" className="rounded-md border border-[#e2b4b0] bg-danger-wash px-3 py-2 text-sm text-danger">
          {props.conflict}{" "}
          <Link to={props.latestHref} className="underline">
            {`Open the latest ${unit}`}
          </Link>
        </div>
      ) : null}
      <FormError message={props.error ?? undefined} />

      <div className="grid gap-4 lg:grid-cols-2">
        <section aria-labelledby="source-heading" className="flex min-w-0 flex-col gap-3">
          <div className="flex items-center justify-between">
            <h2 id="source-heading" className="text-sm font-semibold">
              Source
            </h2>
            <span className="text-xs text-ink-faint">{props.source.length.toLocaleString("en")} characters</span>
          </div>
          <SourceCodeEditor source={props.source} onChange={props.onChange} label={props.editorLabel} view={props.view} />
          {props.palette}
          <SourceProblems problems={props.problems} />
          <Form method="post" className="panel flex flex-col gap-3 p-3 sm:flex-row sm:items-end">
            <input type="hidden" name="intent" value="save" />
            <input type="hidden" name="source" value={props.source} />
            <input type="hidden" name={save.baseField} value={save.baseId ?? ""} />
            <div className="flex-1">
              <label htmlFor="save-note" className="field-label">
                {`What changed (${unit} note)`}
              </label>
              <input id="save-note" name="note" className="field-input" placeholder={save.notePlaceholder} />
            </div>
            <button type="submit" className="btn btn-primary" disabled={save.saving}>
              {save.saving ? "Saving…" : save.buttonLabel}
            </button>
          </Form>
        </section>
        <section aria-labelledby="preview-heading" className="min-w-0">
          <h2 id="preview-heading" className="mb-3 text-sm font-semibold">
            Live preview
          </h2>
          {props.previewAlert}
          <div className="panel p-4 sm:p-6">{props.preview}</div>
          <div className="mt-4">
            <HardwareCaution compact />
          </div>
        </section>
      </div>
      {props.after}
    </div>
  );
}
