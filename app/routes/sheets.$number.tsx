import type { Element, Root } from "hast";
import { data, Form, Link, redirect, useActionData, useLoaderData } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/sheets.$number";
import { AttachmentsPanel } from "~/components/attachments-panel";
import { HardwareCaution } from "~/components/caution";
import { EmptyState } from "~/components/empty-state";
import { FormError, Notice, SelectField } from "~/components/form-fields";
import { PrintButton, PrintTitleStrip } from "~/components/print-button";
import { ReviewPanel } from "~/components/review-panel";
import { SheetView } from "~/components/sheet-view";
import { StatusBadge } from "~/components/status-badge";
import { TitleBlock } from "~/components/title-block";
import { VerificationStamp } from "~/components/verification-stamp";
import { parseSheetNumber } from "~/lib/sheets/numbering";
import { shortHash } from "~/lib/sheets/integrity";
import type { MeasurementOutcome } from "~/lib/waveform/measurement";
import { requireMember, type Member } from "~/.server/access";
import { attachmentLimitBytes, listAttachments } from "~/.server/attachments";
import { roleAtLeast } from "~/.server/roles";
import { addComment, checkIntegrity, eligibleCheckers, recordCheckValues, resolveComment, returnRevision, ReviewRuleError, revisionReview, sheetAudit, stampRevision, submitForCheck } from "~/.server/review";
import { storedEvaluation } from "~/.server/sheet-view";
import { citingDocuments } from "~/.server/documents";
import { listProjects } from "~/.server/projects";
import { getRevision, getRevisionById, getSheet, listRevisions, reuseRevision, revisionBlocks, sheetLineage, SheetRuleError } from "~/.server/sheets";
import { sheetNumberLabel } from "~/lib/sheets/numbering";
import { describeAuditEvent } from "~/lib/audit/wording";

export const meta: Route.MetaFunction = ({ data }) => [{ title: data ? `${data.sheet.label} ${data.sheet.title} · Sinewright` : "Sheet · Sinewright" }];

async function loadRevision(request: Request, params: { number: string; rev?: string }, me: Member) {
  const number = parseSheetNumber(params.number);
  const sheet = number ? await getSheet(me.team.teamId, number) : undefined;
  if (!sheet) throw new Response(null, { status: 404 });
  const revision = params.rev ? await getRevision(sheet.id, params.rev) : sheet.latestRevisionId ? await getRevisionById(sheet.latestRevisionId) : undefined;
  if (params.rev && !revision) throw new Response(null, { status: 404 });
  return { sheet, revision };
}

/** Paragraphs and blocks a comment can be anchored to, in reading order. */
function commentAnchors(tree: Root, blockIds: string[]): { value: string; label: string }[] {
  const anchors = [{ value: "sheet", label: "The whole sheet" }, ...blockIds.map((id) => ({ value: `block:${id}`, label: `Block ${id}` }))];
  let paragraph = 0;
  for (const node of tree.children) {
    if (node.type === "element" && node.tagName === "p") {
      paragraph += 1;
      anchors.push({ value: `paragraph:${paragraph}`, label: `Paragraph ${paragraph}: ${textOf(node).slice(0, 48)}…` });
    }
  }
  return anchors;
}

function textOf(node: Element | Root): string {
  return node.children.map((child) => (child.type === "text" ? child.value : child.type === "element" ? textOf(child) : "")).join("");
}

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const me = await requireMember(request, context, "viewer");
  const { sheet, revision } = await loadRevision(request, params, me);
  const canWrite = roleAtLeast(me.team.role, "engineer");
  // Independent reads, in parallel.
  const [revisions, rows, review, attachments, audit, lineage, citedIn, projects] = await Promise.all([
    listRevisions(sheet.id),
    revision ? revisionBlocks([revision.id]) : [],
    revision ? revisionReview(revision.id) : null,
    listAttachments(sheet.id),
    sheetAudit(sheet.id, 40),
    sheetLineage(sheet.id, sheet.derivedFromRevisionId),
    citingDocuments(me.team.teamId, sheet.number),
    canWrite ? listProjects(me.team.teamId) : [],
  ]);
  const stored = revision ? storedEvaluation(revision.engineVersion, rows) : null;
  const isLatest = Boolean(revision && revision.id === sheet.latestRevisionId);
  const isAuthor = Boolean(revision && revision.authorId === me.user.id);
  const can = {
    submit: Boolean(revision && isLatest && canWrite && (revision.state === "draft" || revision.state === "returned")),
    comment: Boolean(revision && canWrite && revision.state !== "verified"),
    check: Boolean(revision && isLatest && revision.state === "submitted" && roleAtLeast(me.team.role, "checker") && !isAuthor),
    resolveAny: me.team.role === "admin",
  };
  const [integrity, checkers] = await Promise.all([
    revision ? checkIntegrity(revision, rows, review?.stamp?.contentHash ?? null) : null,
    can.submit ? eligibleCheckers(me.team.teamId, revision?.authorId ?? null) : [],
  ]);
  return {
    teamName: me.team.teamName,
    me: { name: me.user.name },
    canWrite,
    sheet: { id: sheet.id, label: sheet.label, title: sheet.title, tags: sheet.tags, projectCode: sheet.projectCode, projectName: sheet.projectName },
    revision: revision
      ? {
          id: revision.id,
          label: revision.label,
          state: revision.state,
          note: revision.note,
          engineVersion: revision.engineVersion,
          contentHash: revision.contentHash,
          authorName: revision.authorName,
          createdAt: revision.createdAt.toISOString(),
          tree: revision.renderTree as Root,
          measurements: (revision.measurements ?? {}) as Record<string, MeasurementOutcome>,
          isLatest,
        }
      : null,
    attachments: attachments.map((a) => ({ ...a, url: `/sheets/${sheet.label}/attachments/${a.id}` })),
    attachmentLimit: attachmentLimitBytes(),
    stored,
    integrity,
    review: review
      ? {
          stamp: review.stamp ? { ...review.stamp, createdAt: review.stamp.createdAt.toISOString() } : null,
          openRequest: review.openRequest ? { checkerName: review.openRequest.checkerName, createdAt: review.openRequest.createdAt.toISOString() } : null,
          comments: review.comments.map((c) => ({ ...c, createdAt: c.createdAt.toISOString(), resolvedAt: c.resolvedAt?.toISOString() ?? null })),
          checks: review.checks.map((c) => ({ ...c, createdAt: c.createdAt.toISOString(), inputs: c.inputs as Record<string, string>, comparison: c.comparison as never })),
        }
      : null,
    can,
    checkers: checkers.map((c) => ({ id: c.id, name: c.name, role: c.role })),
    anchors: revision ? commentAnchors(revision.renderTree as Root, rows.map((r) => r.blockId)) : [],
    blocks: rows.map((r) => ({ id: r.blockId, calculator: r.calculator, inputs: r.inputs as Record<string, string> })),
    audit: audit.map((e) => ({ id: e.id, action: e.action, detail: e.detail as Record<string, unknown>, createdAt: e.createdAt.toISOString(), actorName: e.actorName })),
    revisions: revisions.map((r) => ({ label: r.label, state: r.state, note: r.note, authorName: r.authorName, createdAt: r.createdAt.toISOString(), contentHash: r.contentHash })),
    lineage,
    citedIn,
    projects: projects.map((p) => ({ id: p.id, label: `${p.code} — ${p.name}` })),
  };
}

const reviewAction = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("submit"), checkerId: z.string().min(1, "Choose a checker.") }),
  z.object({
    intent: z.literal("comment"),
    anchor: z.string().regex(/^(sheet|block:[A-Za-z][A-Za-z0-9_]{0,31}|paragraph:\d{1,4})$/, "Choose what the comment is about."),
    body: z.string().trim().min(1, "Write the comment.").max(4000, "Keep a comment under 4000 characters."),
    parentId: z.string().optional(),
  }),
  z.object({ intent: z.literal("resolve"), commentId: z.string().min(1) }),
  z.object({ intent: z.literal("return") }),
  z.object({ intent: z.literal("reuse"), projectId: z.string().default("") }),
  z.object({ intent: z.literal("stamp") }),
  z.object({
    intent: z.literal("check-values"),
    blockId: z.string().min(1),
    tolerancePercent: z.coerce.number({ message: "Give the tolerance as a number of percent, e.g. 1." }).positive("The tolerance must be above 0 %.").max(50, "Keep the tolerance at or below 50 %."),
  }),
]);

export async function action({ request, params, context }: Route.ActionArgs) {
  const me = await requireMember(request, context, "engineer");
  const { revision } = await loadRevision(request, params, me);
  if (!revision) throw new Response("Save a revision before asking for a check.", { status: 400 });
  const form = await request.formData();
  const parsed = reviewAction.safeParse(Object.fromEntries([...form].filter(([k]) => !k.startsWith("input."))));
  if (!parsed.success) return data({ ok: false, message: parsed.error.issues[0]?.message ?? "The form was incomplete." }, { status: 400 });
  const input = parsed.data;
  try {
    switch (input.intent) {
      case "submit":
        await submitForCheck(me, revision.id, input.checkerId);
        return { ok: true, message: `Revision ${revision.label} is sent for checking; the checker has been told.` };
      case "comment":
        await addComment(me, revision.id, { anchor: input.anchor, body: input.body, parentId: input.parentId || undefined });
        return { ok: true, message: "Comment added." };
      case "resolve":
        await resolveComment(me, input.commentId);
        return { ok: true, message: "Thread resolved." };
      case "return":
        await returnRevision(me, revision.id);
        return { ok: true, message: `Revision ${revision.label} is returned to its author with your comments.` };
      case "reuse": {
        const created = await reuseRevision(me, revision.id, input.projectId || null);
        throw redirect(`/sheets/${sheetNumberLabel(created.number)}/edit`);
      }
      case "stamp":
        await stampRevision(me, revision.id);
        return { ok: true, message: `Revision ${revision.label} is verified and stamped.` };
      case "check-values": {
        const inputs = Object.fromEntries([...form].filter(([k]) => k.startsWith("input.")).map(([k, v]) => [k.slice(6), String(v)]));
        const outcome = await recordCheckValues(me, revision.id, { blockId: input.blockId, inputs, tolerance: input.tolerancePercent / 100 });
        return { ok: true, message: outcome.agrees ? `Your re-run of ${input.blockId} agrees with the author's results.` : `Your re-run of ${input.blockId} differs from the author's results beyond the tolerance: see the table.` };
      }
    }
  } catch (error) {
    if (error instanceof ReviewRuleError) return data({ ok: false, message: error.message }, { status: error.status });
    if (error instanceof SheetRuleError) return data({ ok: false, message: error.message }, { status: 400 });
    throw error;
  }
}

export default function SheetPage() {
  const { teamName, me, canWrite, sheet, revision, stored, revisions, integrity, review, can, checkers, anchors, blocks, audit, lineage, citedIn, projects, attachments, attachmentLimit } = useLoaderData<typeof loader>();
  const result = useActionData<typeof action>();
  const projectLabel = sheet.projectCode ? `${sheet.projectCode} — ${sheet.projectName}` : "Team library";
  const stampValid = Boolean(review?.stamp && integrity?.stampValid);
  return (
    <div className="sheet-page space-y-6">
      {revision ? (
        <PrintTitleStrip
          left={teamName}
          center={`${sheet.label} rev ${revision.label} — ${sheet.title}`}
          right={`${revision.state === "verified" && stampValid ? "Verified" : "Not verified"} · #${shortHash(revision.contentHash)}`}
        />
      ) : null}
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
      {integrity && !integrity.hashMatches ? (
        <div role="alert" className="rounded-md border-2 border-danger bg-danger-wash p-4 text-danger">
          <p className="text-lg font-bold">Integrity check failed — this revision's stored content no longer matches its hash.</p>
          <p className="mt-1 text-sm">
            Stored hash {shortHash(revision!.contentHash)}, content now hashes to {shortHash(integrity.recomputedHash)}. The data was changed outside
            Sinewright; {review?.stamp ? "the verification stamp is void and must not be relied on." : "do not rely on it."} Tell your admin.
          </p>
        </div>
      ) : null}
      {integrity && integrity.drift.length > 0 ? (
        <div role="alert" className="rounded-md border border-[#e3cf8f] bg-waiting-wash p-4 text-[#5e480a]">
          <p className="font-semibold">Needs a re-check: the current engine ({integrity.engineVersion}) computes different results from the stored ones.</p>
          <ul className="mt-2 list-disc pl-5 text-sm">
            {integrity.drift.map((d) => (
              <li key={`${d.blockId}.${d.key}`}>
                <span className="font-mono">
                  {d.blockId}.{d.key}
                </span>
                : stored {d.stored}, now {d.now}
              </li>
            ))}
          </ul>
        </div>
      ) : null}
      {result ? (result.ok ? <Notice tone="success">{result.message}</Notice> : <FormError message={result.message} />) : null}
      <div className="flex flex-wrap items-start justify-between gap-4">
      <div className="flex flex-wrap items-center gap-2 print:hidden">
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
        {revision ? <PrintButton /> : null}
      </div>
      {review?.stamp ? (
        <VerificationStamp checkerName={review.stamp.checkerName ?? "—"} date={review.stamp.createdAt.slice(0, 10)} contentHash={review.stamp.contentHash} engineVersion={review.stamp.engineVersion} valid={stampValid} />
      ) : null}
      </div>
      {sheet.tags.length > 0 ? <p className="text-sm text-ink-faint">Tags: {sheet.tags.join(", ")}</p> : null}
      {lineage.derivedFrom || lineage.reusedIn.length > 0 ? (
        <section aria-label="Lineage" className="text-sm text-ink-soft">
          {lineage.derivedFrom ? (
            <p>
              Derived from{" "}
              <Link to={`/sheets/${lineage.derivedFrom.sheet}/revisions/${lineage.derivedFrom.revision}`} className="font-mono">
                {`${lineage.derivedFrom.sheet} rev ${lineage.derivedFrom.revision}`}
              </Link>{" "}
              ({lineage.derivedFrom.title}); it needs its own check.
            </p>
          ) : null}
          {lineage.reusedIn.length > 0 ? (
            <p>
              Reused in:{" "}
              {lineage.reusedIn.map((r, i) => (
                <span key={r.sheet}>
                  {i > 0 ? ", " : ""}
                  <Link to={`/sheets/${r.sheet}`} className="font-mono">
                    {r.sheet}
                  </Link>
                  {` (${r.project ?? "library"}, from rev ${r.fromRevision})`}
                </span>
              ))}
            </p>
          ) : null}
        </section>
      ) : null}
      {citedIn.length > 0 ? (
        <p className="text-sm text-ink-soft">
          Cited in:{" "}
          {citedIn.map((d, i) => (
            <span key={`${d.label}@${d.rev}`}>
              {i > 0 ? ", " : ""}
              <Link to={`/documents/${d.label}`} className="font-mono">
                {d.label}
              </Link>
              {` ${d.title} (${d.projectCode}, rev ${d.rev})`}
            </span>
          ))}
        </p>
      ) : null}
      <HardwareCaution compact />
      {revision && stored ? (
        <article aria-label={`Sheet ${sheet.label} revision ${revision.label}`} className="panel p-5 sm:p-8">
          <SheetView
            tree={revision.tree as never}
            inputsById={stored.inputsById}
            evaluation={stored.evaluation}
            editable={false}
            measurements={revision.measurements}
            attachmentHref={(id) => `/sheets/${sheet.label}/attachments/${id}`}
          />
        </article>
      ) : (
        <EmptyState title="Nothing saved yet">This sheet has no saved revision. {canWrite ? "Open the editor to write it." : "Its author has not saved it yet."}</EmptyState>
      )}
      {revision && review ? (
        <ReviewPanel
          revisionLabel={revision.label}
          state={revision.state}
          isLatest={revision.isLatest}
          can={can}
          myName={me.name}
          checkers={checkers}
          openRequest={review.openRequest}
          comments={review.comments}
          checks={review.checks}
          anchors={anchors}
          blocks={blocks}
        />
      ) : null}
      <AttachmentsPanel sheetLabel={sheet.label} attachments={attachments} canUpload={canWrite} maxBytes={attachmentLimit} />
      {revision && canWrite ? (
        <Form method="post" className="panel flex flex-col gap-3 p-4 sm:flex-row sm:items-end print:hidden">
          <input type="hidden" name="intent" value="reuse" />
          <SelectField
            className="flex-1"
            name="projectId"
            label={`Reuse revision ${revision.label} in project`}
            options={[{ value: "", label: "Team library (no project)" }, ...projects.map((p) => ({ value: p.id, label: p.label }))]}
          />
          <button type="submit" className="btn btn-quiet">
            Reuse as a new sheet
          </button>
        </Form>
      ) : null}
      {revisions.length > 0 ? (
        <section aria-labelledby="history-heading" className="panel p-5 print:hidden">
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
      {audit.length > 0 ? (
        <section aria-labelledby="audit-heading" className="panel p-5 print:hidden">
          <h2 id="audit-heading" className="font-semibold">
            Audit trail
          </h2>
          <ol className="mt-3 space-y-1.5 text-sm">
            {audit.map((e) => (
              <li key={e.id} className="flex flex-col gap-0.5 sm:flex-row sm:gap-3">
                <time className="w-36 shrink-0 font-mono text-xs text-ink-faint" dateTime={e.createdAt}>
                  {e.createdAt.slice(0, 16).replace("T", " ")}
                </time>
                <span>
                  <strong className="font-medium">{e.actorName ?? "Sinewright"}</strong> {describeAuditEvent(e.action, e.detail)}
                </span>
              </li>
            ))}
          </ol>
        </section>
      ) : null}
    </div>
  );
}


export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
