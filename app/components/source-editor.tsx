/**
 * The MDX editor shared by calc sheets and project documents: CodeMirror with a named,
 * keyboard-reachable editing area, the autosaved draft, and the list of problems the
 * source check found.
 */
import { markdown } from "@codemirror/lang-markdown";
import { EditorView } from "@codemirror/view";
import CodeMirror from "@uiw/react-codemirror";
import { useCallback, useEffect, useMemo, useRef, useState, type RefObject } from "react";
import { useFetcher } from "react-router";
import type { SourceProblem } from "~/lib/mdx/types";

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

export function SourceCodeEditor({ source, onChange, label, view }: { source: string; onChange: (next: string) => void; label: string; view: RefObject<EditorView | null> }) {
  // The editable area itself carries the name and an explicit tab stop, for screen readers and keyboard users.
  const extensions = useMemo(() => [markdown(), EditorView.contentAttributes.of({ "aria-label": label, tabindex: "0" }), EditorView.lineWrapping], [label]);
  return (
    <div className="overflow-hidden rounded-md border border-rule-strong bg-white text-sm">
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
