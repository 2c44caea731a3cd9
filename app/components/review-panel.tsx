import { Form, useNavigation } from "react-router";
import { ScrollRegion } from "./scroll-region";
import { StatusBadge } from "./status-badge";

export interface ReviewComment {
  id: string;
  anchor: string;
  parentId: string | null;
  body: string;
  createdAt: string;
  resolvedAt: string | null;
  authorName: string | null;
}

export interface CheckRecord {
  id: string;
  blockId: string;
  tolerance: number;
  agrees: boolean;
  checkerName: string | null;
  createdAt: string;
  comparison: { key: string; author: { display: string } | null; checker: { display: string } | null; relativeDifference: number | null; agrees: boolean }[];
  inputs: Record<string, string>;
}

export interface ReviewPanelProps {
  revisionLabel: string;
  state: string;
  isLatest: boolean;
  /** What the signed-in member may do here, decided by the server. */
  can: { submit: boolean; comment: boolean; check: boolean; resolveAny: boolean };
  myName: string;
  checkers: { id: string; name: string; role: string }[];
  openRequest: { checkerName: string | null; createdAt: string } | null;
  comments: ReviewComment[];
  checks: CheckRecord[];
  anchors: { value: string; label: string }[];
  blocks: { id: string; calculator: string; inputs: Record<string, string> }[];
}

function anchorLabel(anchors: ReviewPanelProps["anchors"], anchor: string): string {
  return anchors.find((a) => a.value === anchor)?.label ?? anchor;
}

/** Submit, comment, re-run and verify: the checking workflow of one revision. */
export function ReviewPanel(props: ReviewPanelProps) {
  const navigation = useNavigation();
  const busy = navigation.state !== "idle";
  const threads = props.comments.filter((c) => !c.parentId);
  const replies = (id: string) => props.comments.filter((c) => c.parentId === id);
  return (
    <section aria-labelledby="review-heading" className="review-panel panel p-5 print:hidden">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id="review-heading" className="font-semibold">
          Check of revision {props.revisionLabel}
        </h2>
        <StatusBadge status={props.state} />
      </div>

      {props.openRequest ? (
        <p className="mt-2 text-sm text-ink-soft">
          Waiting for {props.openRequest.checkerName ?? "a checker"} since {props.openRequest.createdAt.slice(0, 16).replace("T", " ")} UTC.
        </p>
      ) : null}

      {props.can.submit ? (
        <Form method="post" className="mt-4 flex flex-col gap-3 sm:flex-row sm:items-end">
          <input type="hidden" name="intent" value="submit" />
          <div className="flex-1">
            <label htmlFor="checker" className="field-label">
              Send for checking to
            </label>
            {props.checkers.length === 0 ? (
              <p className="text-sm text-ink-faint">No other checker or admin in this team yet: an admin can make someone a checker on the Team page.</p>
            ) : (
              <select id="checker" name="checkerId" className="field-input">
                {props.checkers.map((c) => (
                  <option key={c.id} value={c.id}>
                    {c.name} ({c.role})
                  </option>
                ))}
              </select>
            )}
          </div>
          <button type="submit" className="btn btn-primary" disabled={busy || props.checkers.length === 0}>
            Send for checking
          </button>
        </Form>
      ) : null}

      <div className="mt-6">
        <h3 className="text-sm font-semibold">Comments</h3>
        {threads.length === 0 ? <p className="mt-1 text-sm text-ink-faint">No comments on this revision.</p> : null}
        <ol className="mt-2 space-y-3">
          {threads.map((thread) => (
            <li key={thread.id} className={`rounded-md border p-3 ${thread.resolvedAt ? "border-rule opacity-75" : "border-rule-strong bg-white"}`}>
              <p className="text-xs text-ink-faint">
                on {anchorLabel(props.anchors, thread.anchor)} · {thread.resolvedAt ? "resolved" : "open"}
              </p>
              <Comment comment={thread} />
              <ol className="ml-4 mt-2 space-y-2 border-l-2 border-rule pl-3">
                {replies(thread.id).map((reply) => (
                  <li key={reply.id}>
                    <Comment comment={reply} />
                  </li>
                ))}
              </ol>
              {props.can.comment && !thread.resolvedAt ? (
                <div className="mt-2 flex flex-col gap-2 sm:flex-row sm:items-end">
                  <Form method="post" className="flex flex-1 flex-col gap-2 sm:flex-row sm:items-end">
                    <input type="hidden" name="intent" value="comment" />
                    <input type="hidden" name="parentId" value={thread.id} />
                    <input type="hidden" name="anchor" value={thread.anchor} />
                    <label className="sr-only" htmlFor={`reply-${thread.id}`}>
                      Reply
                    </label>
                    <input id={`reply-${thread.id}`} name="body" className="field-input flex-1" placeholder="Reply…" required />
                    <button type="submit" className="btn btn-quiet" disabled={busy}>
                      Reply
                    </button>
                  </Form>
                  <Form method="post">
                    <input type="hidden" name="intent" value="resolve" />
                    <input type="hidden" name="commentId" value={thread.id} />
                    <button type="submit" className="btn btn-quiet" disabled={busy}>
                      Resolve
                    </button>
                  </Form>
                </div>
              ) : null}
            </li>
          ))}
        </ol>
        {props.can.comment ? (
          <Form method="post" className="mt-4 grid gap-2 sm:grid-cols-[14rem_1fr_auto] sm:items-end">
            <input type="hidden" name="intent" value="comment" />
            <div>
              <label htmlFor="comment-anchor" className="field-label">
                Comment on
              </label>
              <select id="comment-anchor" name="anchor" className="field-input">
                {props.anchors.map((a) => (
                  <option key={a.value} value={a.value}>
                    {a.label}
                  </option>
                ))}
              </select>
            </div>
            <div>
              <label htmlFor="comment-body" className="field-label">
                Comment
              </label>
              <input id="comment-body" name="body" className="field-input" placeholder="What should change, and why" required />
            </div>
            <button type="submit" className="btn btn-quiet" disabled={busy}>
              Add comment
            </button>
          </Form>
        ) : null}
      </div>

      {props.checks.length > 0 || props.can.check ? (
        <div className="mt-6">
          <h3 className="text-sm font-semibold">Independent check values</h3>
          <ul className="mt-2 space-y-2">
            {props.checks.map((check) => (
              <li key={check.id} className="rounded-md border border-rule p-3 text-sm">
                <p>
                  <span className="font-mono">{check.blockId}</span> re-run by {check.checkerName ?? "a checker"} within {(check.tolerance * 100).toPrecision(2)} %:{" "}
                  <strong className={check.agrees ? "text-verified" : "text-danger"}>{check.agrees ? "✓ agrees" : "✗ differs"}</strong>
                </p>
                <p className="mt-1 text-xs text-ink-faint">
                  inputs {Object.entries(check.inputs).map(([k, v]) => `${k}=${v}`).join(", ")}
                </p>
                <ScrollRegion label={`Re-run of ${check.blockId} compared`} className="mt-1">
                  <table className="w-full min-w-[24rem] text-xs">
                    <thead className="text-ink-faint">
                      <tr>
                        <th className="text-left font-medium">Result</th>
                        <th className="text-left font-medium">Author</th>
                        <th className="text-left font-medium">Checker</th>
                        <th className="text-left font-medium">Difference</th>
                      </tr>
                    </thead>
                    <tbody>
                      {check.comparison.map((c) => (
                        <tr key={c.key}>
                          <td className="font-mono">{c.key}</td>
                          <td>{c.author?.display ?? "—"}</td>
                          <td>{c.checker?.display ?? "—"}</td>
                          <td className={c.agrees ? "" : "font-semibold text-danger"}>
                            {c.relativeDifference === null ? "—" : `${(c.relativeDifference * 100).toPrecision(2)} %`} {c.agrees ? "" : "(over)"}
                          </td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </ScrollRegion>
              </li>
            ))}
          </ul>
          {props.can.check
            ? props.blocks.map((block) => (
                <details key={block.id} className="mt-2 rounded-md border border-rule p-3">
                  <summary className="cursor-pointer text-sm">
                    Re-run <span className="font-mono">{block.id}</span> ({block.calculator}) with your own inputs
                  </summary>
                  <Form method="post" className="mt-3 grid gap-2 sm:grid-cols-2">
                    <input type="hidden" name="intent" value="check-values" />
                    <input type="hidden" name="blockId" value={block.id} />
                    {Object.entries(block.inputs).map(([key, value]) => (
                      <div key={key}>
                        <label className="field-label" htmlFor={`check-${block.id}-${key}`}>
                          {key}
                        </label>
                        <input id={`check-${block.id}-${key}`} name={`input.${key}`} defaultValue={value} className="field-input font-mono" />
                      </div>
                    ))}
                    <div>
                      <label className="field-label" htmlFor={`check-${block.id}-tolerance`}>
                        Agreement tolerance (%)
                      </label>
                      <input id={`check-${block.id}-tolerance`} name="tolerancePercent" defaultValue="1" className="field-input" inputMode="decimal" />
                    </div>
                    <div className="flex items-end">
                      <button type="submit" className="btn btn-quiet" disabled={busy}>
                        Run and record
                      </button>
                    </div>
                  </Form>
                </details>
              ))
            : null}
        </div>
      ) : null}

      {props.can.check ? (
        <div className="mt-6 flex flex-wrap gap-3 border-t border-rule pt-4">
          <Form method="post">
            <input type="hidden" name="intent" value="return" />
            <button type="submit" className="btn btn-danger" disabled={busy}>
              Return with comments
            </button>
          </Form>
          <Form method="post">
            <input type="hidden" name="intent" value="stamp" />
            <button type="submit" className="btn btn-primary" disabled={busy}>
              Verify and stamp revision {props.revisionLabel}
            </button>
          </Form>
        </div>
      ) : null}
    </section>
  );
}

function Comment({ comment }: { comment: ReviewComment }) {
  return (
    <div className="mt-1">
      <p className="text-sm">{comment.body}</p>
      <p className="text-xs text-ink-faint">
        {comment.authorName ?? "someone"}, {comment.createdAt.slice(0, 16).replace("T", " ")} UTC
      </p>
    </div>
  );
}
