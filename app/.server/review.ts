import { and, asc, desc, eq, inArray, isNull, ne, or, sql } from "drizzle-orm";
import { LRUCache } from "lru-cache";
import { evaluateSheet } from "~/lib/calc/evaluate-sheet";
import type { Results, ScalarResult } from "~/lib/calc/types";
import { ENGINE_VERSION } from "~/lib/calc/version";
import { revisionHash, type HashedBlock } from "~/lib/sheets/integrity";
import { sheetNumberLabel } from "~/lib/sheets/numbering";
import { prepareSheet } from "~/lib/sheets/pipeline";
import { recordAudit } from "./audit";
import { config } from "./config";
import { db, type Database } from "./db/client";
import { auditEvent, calcSheet, checkRequest, checkValue, member, notification, reviewComment, revisionBlock, sheetRevision, stamp, user } from "./db/schema";
import { enqueueMail } from "./mail/outbox";
import type { Member } from "./access";
import { indexSheet } from "./search/indexer";
import { roleAtLeast, type Role } from "./roles";
import type { revisionBlocks } from "./sheets";

/** A refusal of a review step, with the status the route should answer. */
export class ReviewRuleError extends Error {
  constructor(
    message: string,
    readonly status: 400 | 403 | 409 = 400,
  ) {
    super(message);
  }
}

type Tx = Parameters<Parameters<Database["transaction"]>[0]>[0];
type BlockRow = Awaited<ReturnType<typeof revisionBlocks>>[number];

interface RevisionRef {
  id: string;
  sheetId: string;
  label: string;
}

function sheetLink(sheetNumber: number, label?: string): string {
  return label ? `/sheets/${sheetNumberLabel(sheetNumber)}/revisions/${label}` : `/sheets/${sheetNumberLabel(sheetNumber)}`;
}

/** Notifies a member in the app and by e-mail, inside the caller's transaction so neither is lost. */
async function notify(tx: Tx, to: { userId: string; email: string }, teamId: string, kind: string, subject: string, message: string, link: string) {
  await tx.insert(notification).values({ userId: to.userId, teamId, kind, message, link });
  await enqueueMail({ to: to.email, subject, text: `${message}\n\nOpen it here:\n${new URL(link, config().APP_URL).toString()}\n` }, tx);
}

/** Tells a revision's author what happened to it, in the app and by e-mail. */
async function notifyAuthor(
  tx: Tx,
  revision: { authorId: string | null; label: string },
  sheet: { teamId: string; number: number },
  kind: string,
  subject: string,
  message: string,
) {
  const author = await userById(tx, revision.authorId);
  if (author) await notify(tx, { userId: author.id, email: author.email }, sheet.teamId, kind, subject, message, sheetLink(sheet.number, revision.label));
}

async function userById(tx: Tx, id: string | null) {
  if (!id) return undefined;
  const [row] = await tx.select({ id: user.id, name: user.name, email: user.email }).from(user).where(eq(user.id, id));
  return row;
}

/** Members who may check this revision: checkers and admins of the team, never its author. */
export async function eligibleCheckers(teamId: string, authorId: string | null) {
  return db()
    .select({ id: user.id, name: user.name, email: user.email, role: member.role })
    .from(member)
    .innerJoin(user, eq(member.userId, user.id))
    .where(and(eq(member.organizationId, teamId), inArray(member.role, ["checker", "admin"]), authorId ? ne(user.id, authorId) : sql`true`))
    .orderBy(asc(user.name));
}

async function lockRevision(tx: Tx, me: Member, revisionId: string) {
  const [row] = await tx
    .select({ revision: sheetRevision, sheet: calcSheet })
    .from(sheetRevision)
    .innerJoin(calcSheet, eq(calcSheet.id, sheetRevision.sheetId))
    .where(and(eq(sheetRevision.id, revisionId), eq(sheetRevision.teamId, me.team.teamId)))
    .for("update");
  if (!row) throw new ReviewRuleError("That revision does not exist in this team.", 400);
  return row;
}

export async function submitForCheck(me: Member, revisionId: string, checkerId: string) {
  return db().transaction(async (tx) => {
    const { revision, sheet } = await lockRevision(tx, me, revisionId);
    if (sheet.latestRevisionId !== revision.id) throw new ReviewRuleError(`Only the latest revision can be sent for checking; revision ${revision.label} has been superseded.`, 409);
    if (revision.state === "submitted") throw new ReviewRuleError(`Revision ${revision.label} is already waiting for a check.`, 409);
    if (revision.state === "verified") throw new ReviewRuleError(`Revision ${revision.label} is already verified.`, 409);
    const failed = await tx
      .select({ blockId: revisionBlock.blockId })
      .from(revisionBlock)
      .where(and(eq(revisionBlock.revisionId, revision.id), eq(revisionBlock.ok, false)));
    if (failed.length > 0) throw new ReviewRuleError(`Fix the blocks with errors before asking for a check: ${failed.map((f) => f.blockId).join(", ")}.`, 400);
    if (checkerId === revision.authorId || checkerId === me.user.id) throw new ReviewRuleError("Choose someone else as checker: nobody checks their own calculation.", 400);
    const [checkerMember] = await tx
      .select({ role: member.role })
      .from(member)
      .where(and(eq(member.organizationId, me.team.teamId), eq(member.userId, checkerId)));
    if (!checkerMember || !roleAtLeast(checkerMember.role as Role, "checker")) throw new ReviewRuleError("The checker must be a member of this team with the checker or admin role.", 400);
    await tx.update(sheetRevision).set({ state: "submitted" }).where(eq(sheetRevision.id, revision.id));
    await indexSheet(tx, sheet.id); // search: hits show the review state and filter on it
    await tx.insert(checkRequest).values({ revisionId: revision.id, sheetId: sheet.id, teamId: sheet.teamId, requestedBy: me.user.id, checkerId });
    const checker = (await userById(tx, checkerId))!;
    const label = sheetNumberLabel(sheet.number);
    await recordAudit({ teamId: sheet.teamId, actorId: me.user.id, action: "revision.submitted", subjectType: "sheet", subjectId: sheet.id, detail: { label: revision.label, checker: checker.name } }, tx);
    await notify(
      tx,
      { userId: checker.id, email: checker.email },
      sheet.teamId,
      "check-requested",
      `Check requested: ${label} rev ${revision.label} — ${sheet.title}`,
      `${me.user.name} asks you to check ${label} revision ${revision.label}, “${sheet.title}”.`,
      sheetLink(sheet.number, revision.label),
    );
  });
}

export async function addComment(me: Member, revisionId: string, input: { anchor: string; body: string; parentId?: string }) {
  return db().transaction(async (tx) => {
    const { revision, sheet } = await lockRevision(tx, me, revisionId);
    let parent: typeof reviewComment.$inferSelect | undefined;
    if (input.parentId) {
      [parent] = await tx.select().from(reviewComment).where(and(eq(reviewComment.id, input.parentId), eq(reviewComment.revisionId, revision.id)));
      if (!parent) throw new ReviewRuleError("The comment you answer is not on this revision.", 400);
    }
    const [created] = await tx
      .insert(reviewComment)
      .values({ revisionId: revision.id, sheetId: sheet.id, teamId: sheet.teamId, anchor: parent?.anchor ?? input.anchor, parentId: parent?.id ?? null, authorId: me.user.id, body: input.body })
      .returning({ id: reviewComment.id });
    await recordAudit({ teamId: sheet.teamId, actorId: me.user.id, action: parent ? "comment.replied" : "comment.added", subjectType: "sheet", subjectId: sheet.id, detail: { label: revision.label, anchor: parent?.anchor ?? input.anchor } }, tx);
    // Everyone else in the thread (and the revision's author) hears about a reply.
    if (parent) {
      const threadAuthors = await tx
        .selectDistinct({ id: reviewComment.authorId })
        .from(reviewComment)
        .where(or(eq(reviewComment.id, parent.id), eq(reviewComment.parentId, parent.id)));
      const recipients = new Set([...threadAuthors.map((t) => t.id), revision.authorId].filter((id): id is string => Boolean(id) && id !== me.user.id));
      for (const id of recipients) {
        const person = await userById(tx, id);
        if (!person) continue;
        await notify(
          tx,
          { userId: person.id, email: person.email },
          sheet.teamId,
          "comment-reply",
          `Reply on ${sheetNumberLabel(sheet.number)} rev ${revision.label}`,
          `${me.user.name} replied on ${sheetNumberLabel(sheet.number)} revision ${revision.label}: “${input.body.slice(0, 200)}”`,
          sheetLink(sheet.number, revision.label),
        );
      }
    }
    return created!.id;
  });
}

export async function resolveComment(me: Member, commentId: string) {
  const [row] = await db()
    .select({ comment: reviewComment, authorId: sheetRevision.authorId })
    .from(reviewComment)
    .innerJoin(sheetRevision, eq(sheetRevision.id, reviewComment.revisionId))
    .where(and(eq(reviewComment.id, commentId), eq(reviewComment.teamId, me.team.teamId)));
  if (!row || row.comment.parentId) throw new ReviewRuleError("That comment thread does not exist.", 400);
  if (row.authorId !== me.user.id && row.comment.authorId !== me.user.id && me.team.role !== "admin") {
    throw new ReviewRuleError("Only the sheet's author or the comment's writer resolves a thread.", 403);
  }
  await db().update(reviewComment).set({ resolvedAt: new Date(), resolvedBy: me.user.id }).where(eq(reviewComment.id, commentId));
  await recordAudit({ teamId: me.team.teamId, actorId: me.user.id, action: "comment.resolved", subjectType: "sheet", subjectId: row.comment.sheetId, detail: { anchor: row.comment.anchor } });
}

function assertChecker(me: Member, revision: typeof sheetRevision.$inferSelect) {
  if (!roleAtLeast(me.team.role, "checker")) throw new ReviewRuleError("Only checkers and admins check revisions.", 403);
  if (revision.authorId === me.user.id) throw new ReviewRuleError("You wrote this revision: someone else must check it.", 403);
}

async function openRequest(tx: Tx, revisionId: string) {
  const [request] = await tx.select().from(checkRequest).where(and(eq(checkRequest.revisionId, revisionId), eq(checkRequest.outcome, "open"))).orderBy(desc(checkRequest.createdAt)).limit(1);
  return request;
}

export interface CheckComparison {
  key: string;
  label: string;
  author: ScalarResult | null;
  checker: ScalarResult | null;
  relativeDifference: number | null;
  agrees: boolean;
}

/** Compares a block's scalar results; a result agrees when its relative difference is within tolerance. */
export function compareResults(authorResults: Results | null, checkerResults: Results | null, tolerance: number): CheckComparison[] {
  const keys = new Set([...Object.keys(authorResults ?? {}), ...Object.keys(checkerResults ?? {})]);
  const rows: CheckComparison[] = [];
  for (const key of keys) {
    const a = authorResults?.[key];
    const c = checkerResults?.[key];
    const isScalar = (v: unknown): v is ScalarResult => typeof v === "object" && v !== null && !Array.isArray(v) && "value" in v && "display" in v;
    if (!isScalar(a) && !isScalar(c)) continue;
    const author = isScalar(a) ? a : null;
    const checker = isScalar(c) ? c : null;
    const relativeDifference = author && checker ? Math.abs(author.value - checker.value) / Math.max(Math.abs(author.value), Math.abs(checker.value), 1e-300) : null;
    const agrees = relativeDifference !== null && (relativeDifference <= tolerance || author!.value === checker!.value);
    rows.push({ key, label: key, author, checker, relativeDifference, agrees });
  }
  return rows;
}

/** Re-runs one block with the checker's own inputs (the rest of the sheet as saved) and records the comparison. */
export async function recordCheckValues(me: Member, revisionId: string, input: { blockId: string; inputs: Record<string, string>; tolerance: number }) {
  return db().transaction(async (tx) => {
    const { revision } = await lockRevision(tx, me, revisionId);
    assertChecker(me, revision);
    if (revision.state !== "submitted") throw new ReviewRuleError(`Revision ${revision.label} is not waiting for a check.`, 409);
    const rows = await tx.select().from(revisionBlock).where(eq(revisionBlock.revisionId, revision.id)).orderBy(asc(revisionBlock.position));
    const own = rows.find((r) => r.blockId === input.blockId);
    if (!own) throw new ReviewRuleError(`There is no block ${input.blockId} in revision ${revision.label}.`, 400);
    const evaluation = evaluateSheet(
      rows.map((r) => ({ id: r.blockId, calculator: r.calculator, inputs: r.blockId === input.blockId ? input.inputs : (r.inputs as Record<string, string>) })),
    );
    const outcome = evaluation.blocks[input.blockId];
    if (!outcome?.ok) {
      throw new ReviewRuleError(`Your inputs for ${input.blockId} need fixing: ${(outcome && !outcome.ok ? outcome.errors : []).map((e) => `${e.field}: ${e.message}`).join("; ")}`, 400);
    }
    const comparison = compareResults(own.results as Results | null, outcome.results, input.tolerance);
    const agrees = comparison.length > 0 && comparison.every((c) => c.agrees);
    await tx.insert(checkValue).values({ revisionId: revision.id, teamId: revision.teamId, blockId: input.blockId, checkerId: me.user.id, inputs: input.inputs, results: outcome.results, tolerance: input.tolerance, agrees, comparison });
    await recordAudit({ teamId: revision.teamId, actorId: me.user.id, action: "check.values-recorded", subjectType: "sheet", subjectId: revision.sheetId, detail: { label: revision.label, blockId: input.blockId, agrees } }, tx);
    return { agrees, comparison };
  });
}

export async function returnRevision(me: Member, revisionId: string) {
  return db().transaction(async (tx) => {
    const { revision, sheet } = await lockRevision(tx, me, revisionId);
    assertChecker(me, revision);
    if (revision.state !== "submitted") throw new ReviewRuleError(`Revision ${revision.label} is not waiting for a check (it is ${revision.state}).`, 409);
    const [{ comments }] = (await tx.select({ comments: sql<number>`count(*)::int` }).from(reviewComment).where(eq(reviewComment.revisionId, revision.id))) as [{ comments: number }];
    if (comments === 0) throw new ReviewRuleError("Write at least one comment saying what to change before returning the revision.", 400);
    await tx.update(sheetRevision).set({ state: "returned" }).where(eq(sheetRevision.id, revision.id));
    await indexSheet(tx, sheet.id); // search: hits show the review state and filter on it
    const request = await openRequest(tx, revision.id);
    if (request) await tx.update(checkRequest).set({ outcome: "returned", closedAt: new Date() }).where(eq(checkRequest.id, request.id));
    await recordAudit({ teamId: sheet.teamId, actorId: me.user.id, action: "revision.returned", subjectType: "sheet", subjectId: sheet.id, detail: { label: revision.label } }, tx);
    await notifyAuthor(tx, revision, sheet, "returned", `Returned with comments: ${sheetNumberLabel(sheet.number)} rev ${revision.label}`,
      `${me.user.name} returned ${sheetNumberLabel(sheet.number)} revision ${revision.label}, “${sheet.title}”, with ${comments} comment${comments === 1 ? "" : "s"}.`);
  });
}

/**
 * Verifies and stamps a revision. The revision row is locked, so when two checkers
 * stamp at once the second waits, then finds it verified and is told so: one stamp.
 */
export async function stampRevision(me: Member, revisionId: string) {
  return db().transaction(async (tx) => {
    const { revision, sheet } = await lockRevision(tx, me, revisionId);
    assertChecker(me, revision);
    if (revision.state === "verified") {
      const [existing] = await tx.select({ checkerId: stamp.checkerId, createdAt: stamp.createdAt }).from(stamp).where(eq(stamp.revisionId, revision.id));
      const who = await userById(tx, existing?.checkerId ?? null);
      throw new ReviewRuleError(`Revision ${revision.label} was already verified by ${who?.name ?? "another checker"} at ${existing?.createdAt.toISOString().slice(0, 16).replace("T", " ")} UTC; nothing more to stamp.`, 409);
    }
    if (revision.state !== "submitted") throw new ReviewRuleError(`Revision ${revision.label} is not waiting for a check (it is ${revision.state}).`, 409);
    if (sheet.latestRevisionId !== revision.id) throw new ReviewRuleError(`Revision ${revision.label} has been superseded; only the latest submitted revision can be verified.`, 409);
    await tx.insert(stamp).values({ revisionId: revision.id, sheetId: sheet.id, teamId: sheet.teamId, checkerId: me.user.id, contentHash: revision.contentHash, engineVersion: revision.engineVersion });
    await tx.update(sheetRevision).set({ state: "verified" }).where(eq(sheetRevision.id, revision.id));
    await indexSheet(tx, sheet.id); // search: hits show the review state and filter on it
    const request = await openRequest(tx, revision.id);
    if (request) await tx.update(checkRequest).set({ outcome: "verified", closedAt: new Date() }).where(eq(checkRequest.id, request.id));
    await recordAudit({ teamId: sheet.teamId, actorId: me.user.id, action: "revision.verified", subjectType: "sheet", subjectId: sheet.id, detail: { label: revision.label, contentHash: revision.contentHash } }, tx);
    await notifyAuthor(tx, revision, sheet, "verified", `Verified: ${sheetNumberLabel(sheet.number)} rev ${revision.label}`,
      `${me.user.name} verified ${sheetNumberLabel(sheet.number)} revision ${revision.label}, “${sheet.title}”.`);
  });
}

export async function revisionReview(revisionId: string) {
  const [comments, checks, [stampRow], requests] = await Promise.all([
    db()
      .select({ id: reviewComment.id, anchor: reviewComment.anchor, parentId: reviewComment.parentId, body: reviewComment.body, createdAt: reviewComment.createdAt, resolvedAt: reviewComment.resolvedAt, authorId: reviewComment.authorId, authorName: user.name })
      .from(reviewComment)
      .leftJoin(user, eq(user.id, reviewComment.authorId))
      .where(eq(reviewComment.revisionId, revisionId))
      .orderBy(asc(reviewComment.createdAt)),
    db()
      .select({ id: checkValue.id, blockId: checkValue.blockId, inputs: checkValue.inputs, tolerance: checkValue.tolerance, agrees: checkValue.agrees, comparison: checkValue.comparison, createdAt: checkValue.createdAt, checkerName: user.name })
      .from(checkValue)
      .leftJoin(user, eq(user.id, checkValue.checkerId))
      .where(eq(checkValue.revisionId, revisionId))
      .orderBy(asc(checkValue.createdAt)),
    db()
      .select({ contentHash: stamp.contentHash, engineVersion: stamp.engineVersion, createdAt: stamp.createdAt, checkerName: user.name, checkerId: stamp.checkerId })
      .from(stamp)
      .leftJoin(user, eq(user.id, stamp.checkerId))
      .where(eq(stamp.revisionId, revisionId)),
    db()
      .select({ checkerId: checkRequest.checkerId, checkerName: user.name, outcome: checkRequest.outcome, createdAt: checkRequest.createdAt })
      .from(checkRequest)
      .leftJoin(user, eq(user.id, checkRequest.checkerId))
      .where(eq(checkRequest.revisionId, revisionId))
      .orderBy(desc(checkRequest.createdAt)),
  ]);
  return { comments, checks, stamp: stampRow ?? null, openRequest: requests.find((r) => r.outcome === "open") ?? null };
}

export interface IntegrityReport {
  /** The stored content still hashes to the revision's hash. */
  hashMatches: boolean;
  /** A stamp exists and carries the same hash as the content. */
  stampValid: boolean | null;
  recomputedHash: string;
  /** Current engine version, and blocks whose results differ from the stored ones beyond tolerance. */
  engineVersion: string;
  drift: { blockId: string; key: string; stored: string; now: string }[];
}

const DRIFT_TOLERANCE = 1e-9;

type EngineRerun = Pick<IntegrityReport, "engineVersion" | "drift">;

/**
 * The engine re-run of a revision depends only on its content (covered by the
 * recomputed hash) and on the current engine, so it is remembered per process under
 * both. The re-hash itself runs on every view — a changed row gives a new hash and a
 * miss. Entries are always safe to drop; nothing else is kept between requests.
 */
const engineReruns = new LRUCache<string, EngineRerun>({ max: 2_000 });

function rerunEngine(revision: { source: string; engineVersion: string }, rows: BlockRow[]): EngineRerun {
  // Only the results are compared: the formulas are not typeset.
  const prepared = prepareSheet(revision.source, "sheet", {}, null);
  const drift: IntegrityReport["drift"] = [];
  if (!prepared.ok) return { engineVersion: revision.engineVersion, drift };
  for (const row of rows) {
    const now = prepared.evaluation.blocks[row.blockId];
    const comparison = compareResults(row.ok ? (row.results as Results) : null, now?.ok ? now.results : null, DRIFT_TOLERANCE);
    for (const c of comparison) if (!c.agrees) drift.push({ blockId: row.blockId, key: c.key, stored: c.author?.display ?? "—", now: c.checker?.display ?? "—" });
  }
  return { engineVersion: prepared.evaluation.engineVersion, drift };
}

/**
 * Re-hashes the stored content and re-runs the current engine on it. A hash that no
 * longer matches means the rows were changed behind the application's back.
 */
export async function checkIntegrity(
  revision: { source: string; engineVersion: string; contentHash: string; measurements?: unknown },
  rows: BlockRow[],
  stampHash: string | null,
): Promise<IntegrityReport> {
  const blocks: HashedBlock[] = rows.map((r) => ({
    id: r.blockId,
    calculator: r.calculator,
    inputs: r.inputs as Record<string, string>,
    results: r.ok ? r.results : { errors: r.errors },
  }));
  const measurements = (revision.measurements ?? null) as Record<string, unknown> | null;
  const recomputedHash = await revisionHash({ source: revision.source, blocks, engineVersion: revision.engineVersion, measurements });
  const hashMatches = recomputedHash === revision.contentHash;
  const stampValid = stampHash === null ? null : hashMatches && stampHash === revision.contentHash;
  const memoKey = `${recomputedHash}|${ENGINE_VERSION}`;
  let rerun = engineReruns.get(memoKey);
  if (!rerun) {
    rerun = rerunEngine(revision, rows);
    engineReruns.set(memoKey, rerun);
  }
  return { hashMatches, stampValid, recomputedHash, engineVersion: rerun.engineVersion, drift: rerun.drift };
}

/** Revisions waiting for this member's check. */
export async function waitingForMe(me: Member) {
  return db()
    .select({ sheetNumber: calcSheet.number, title: calcSheet.title, label: sheetRevision.label, requestedAt: checkRequest.createdAt, requestedBy: user.name })
    .from(checkRequest)
    .innerJoin(sheetRevision, eq(sheetRevision.id, checkRequest.revisionId))
    .innerJoin(calcSheet, eq(calcSheet.id, checkRequest.sheetId))
    .leftJoin(user, eq(user.id, checkRequest.requestedBy))
    .where(and(eq(checkRequest.teamId, me.team.teamId), eq(checkRequest.checkerId, me.user.id), eq(checkRequest.outcome, "open")))
    .orderBy(asc(checkRequest.createdAt));
}

export async function listNotifications(me: Member, limit = 50) {
  return db()
    .select()
    .from(notification)
    .where(and(eq(notification.userId, me.user.id), eq(notification.teamId, me.team.teamId)))
    .orderBy(desc(notification.createdAt))
    .limit(limit);
}

export async function unreadCount(userId: string, teamId: string): Promise<number> {
  const [row] = (await db()
    .select({ n: sql<number>`count(*)::int` })
    .from(notification)
    .where(and(eq(notification.userId, userId), eq(notification.teamId, teamId), isNull(notification.readAt)))) as [{ n: number }];
  return row.n;
}

export async function markNotificationsRead(me: Member) {
  await db().update(notification).set({ readAt: new Date() }).where(and(eq(notification.userId, me.user.id), eq(notification.teamId, me.team.teamId), isNull(notification.readAt)));
}

export async function sheetAudit(sheetId: string, limit = 100) {
  return db()
    .select({ id: auditEvent.id, action: auditEvent.action, detail: auditEvent.detail, createdAt: auditEvent.createdAt, actorName: user.name })
    .from(auditEvent)
    .leftJoin(user, eq(user.id, auditEvent.actorId))
    .where(and(eq(auditEvent.subjectType, "sheet"), eq(auditEvent.subjectId, sheetId)))
    .orderBy(desc(auditEvent.createdAt))
    .limit(limit);
}
