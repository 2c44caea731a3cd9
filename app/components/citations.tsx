/**
 * Citations of calc-sheet revisions in project documents: the state badge, the numbered
 * references that end each document, and the list of stale citations with their
 * one-click update.
 */
import { Form, Link } from "react-router";
import type { CitationState, CitationView } from "~/lib/documents/citations";

/** Each state in our own words, with a mark as well as a colour. */
const LOOK: Record<CitationState, { label: string; className: string; mark: string }> = {
  verified: { label: "Verified", className: "border-[#9fc39a] bg-verified-wash text-verified", mark: "✓" },
  superseded: { label: "Superseded", className: "border-[#d9bf6a] bg-waiting-wash text-[#5e480a]", mark: "⇡" },
  recheck: { label: "Needs re-check", className: "border-[#e2b4b0] bg-danger-wash text-danger", mark: "⟳" },
  waiting: { label: "Awaiting check", className: "border-[#d9bf6a] bg-waiting-wash text-[#5e480a]", mark: "◔" },
  returned: { label: "Returned", className: "border-[#e2b4b0] bg-danger-wash text-danger", mark: "↩" },
  draft: { label: "Draft", className: "border-rule-strong text-ink-soft", mark: "◇" },
  missing: { label: "Not found", className: "border-[#e2b4b0] bg-danger-wash text-danger", mark: "✕" },
};

export function CitationBadge({ state }: { state: CitationState }) {
  const look = LOOK[state];
  return (
    <span className={`inline-flex w-fit items-center gap-1 whitespace-nowrap rounded-full border px-2 py-0.5 font-sans text-xs font-medium ${look.className}`}>
      <span aria-hidden="true">{look.mark}</span>
      {look.label}
    </span>
  );
}

/** The numbered references at the end of a document, in order of first citation. */
export function ReferenceList({ citations }: { citations: CitationView[] }) {
  return (
    <section aria-labelledby="references-heading" className="mt-8 border-t border-rule-strong pt-4">
      <h2 id="references-heading" className="font-serif text-lg font-semibold">
        References
      </h2>
      {citations.length === 0 ? (
        <p className="mt-2 text-sm text-ink-soft">This document cites no calc sheet.</p>
      ) : (
        <ol className="mt-3 space-y-3 text-sm">
          {citations.map((c, i) => (
            <li key={c.key} id={`ref-${i + 1}`} className="grid grid-cols-[2rem_1fr] gap-x-2">
              <span className="font-mono text-ink-faint">[{i + 1}]</span>
              <div className="min-w-0">
                <p className="flex flex-wrap items-baseline gap-x-2 gap-y-1">
                  {c.href ? (
                    <Link to={c.href} className="font-mono font-medium">
                      {`${c.sheet} rev ${c.rev}`}
                    </Link>
                  ) : (
                    <span className="font-mono font-medium">{`${c.sheet} rev ${c.rev}`}</span>
                  )}
                  <span>{c.title ?? ""}</span>
                  <CitationBadge state={c.state} />
                </p>
                <p className="text-ink-soft">
                  {c.words}
                  {c.stampedAt ? ` · stamped ${c.stampedAt.slice(0, 10)}${c.checkerName ? ` by ${c.checkerName}` : ""}` : ""}
                </p>
                {c.contentHash ? <p className="break-all font-mono text-xs text-ink-faint">SHA-256 {c.contentHash}</p> : null}
              </div>
            </li>
          ))}
        </ol>
      )}
    </section>
  );
}

export interface StaleCitationRow {
  document: { id: string; label: string; title: string; version: number };
  citation: CitationView;
}

/**
 * Every stale citation with what to do about it: a one-click update where a newer
 * verified revision exists, otherwise what is being waited for.
 */
export function StaleCitationList({ rows, canUpdate, showDocument, busyKey }: { rows: StaleCitationRow[]; canUpdate: boolean; showDocument: boolean; busyKey?: string | null }) {
  return (
    <ul className="divide-y divide-rule">
      {rows.map(({ document, citation }) => {
        const key = `${document.id}:${citation.key}`;
        return (
          <li key={key} className="flex flex-col gap-2 px-4 py-3 sm:flex-row sm:items-center sm:gap-4">
            <div className="min-w-0 flex-1 text-sm">
              {showDocument ? (
                <p>
                  <Link to={`/documents/${document.label}`} className="font-mono">
                    {document.label}
                  </Link>{" "}
                  {document.title}
                </p>
              ) : null}
              <p className="flex flex-wrap items-center gap-2">
                <span className="font-mono">{`cites ${citation.sheet} rev ${citation.rev}`}</span>
                <CitationBadge state={citation.state} />
              </p>
              <p className="text-ink-soft">{citation.words}</p>
            </div>
            {citation.updateTo && canUpdate ? (
              <Form method="post" className="shrink-0">
                <input type="hidden" name="intent" value="update-citation" />
                <input type="hidden" name="documentId" value={document.id} />
                <input type="hidden" name="sheet" value={citation.sheet} />
                <input type="hidden" name="rev" value={citation.rev} />
                <button type="submit" className="btn btn-primary" disabled={busyKey === key}>
                  {`Update to rev ${citation.updateTo.label}`}
                  <span className="sr-only">{` in ${document.label}`}</span>
                </button>
              </Form>
            ) : (
              <p className="shrink-0 text-xs text-ink-faint">{citation.updateTo ? `Newer verified: rev ${citation.updateTo.label}` : "No newer verified revision yet"}</p>
            )}
          </li>
        );
      })}
    </ul>
  );
}
