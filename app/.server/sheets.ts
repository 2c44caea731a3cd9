import { and, asc, desc, eq, inArray, sql, type SQL } from "drizzle-orm";
import { sheetNumberLabel, revisionLabel } from "~/lib/sheets/numbering";
import { hashedBlocks, hashPrepared, measuredAttachmentIds } from "~/lib/sheets/pipeline";
import { prepareUntrustedSheet } from "./math-typesetter";
import type { SourceProblem } from "~/lib/mdx/types";
import { capturesForSheet, linkRevisionAttachments } from "./attachments";
import { recordAudit } from "./audit";
import { db } from "./db/client";
import { calcSheet, organization, project, revisionBlock, sheetDraft, sheetRevision, user } from "./db/schema";
import type { Member } from "./access";
import { indexSheet } from "./search/indexer";

export const SHEET_STATUSES = ["unsaved", "draft", "submitted", "returned", "verified"] as const;
export type SheetStatus = (typeof SHEET_STATUSES)[number];

/** What a new sheet starts with: a skeleton of the usual sections. */
export const STARTER_SOURCE = `## Purpose

State what this calculation decides, for which product, and the design inputs it rests on.

## Calculation

Add calculators from the palette. Any input may reference another block's result, e.g. \`=qs1.v1Rms\`.

## Conclusion

Summarise the result and the margin it leaves.
`;

export interface SheetListFilters {
  status?: SheetStatus;
  projectId?: string;
  calculator?: string;
  authorId?: string;
  sort: "number" | "title" | "updated" | "status";
  direction: "asc" | "desc";
  page: number;
  pageSize: number;
}

const latestRevision = sql`(select r.state from sheet_revision r where r.id = ${calcSheet.latestRevisionId})`;
const statusExpression = sql<string>`coalesce(${latestRevision}, 'unsaved')`;

export async function listSheets(teamId: string, filters: SheetListFilters) {
  const conditions: SQL[] = [eq(calcSheet.teamId, teamId)];
  if (filters.status) conditions.push(sql`${statusExpression} = ${filters.status}`);
  if (filters.projectId === "library") conditions.push(sql`${calcSheet.projectId} is null`);
  else if (filters.projectId) conditions.push(eq(calcSheet.projectId, filters.projectId));
  if (filters.calculator) {
    conditions.push(sql`exists (select 1 from revision_block b where b.revision_id = ${calcSheet.latestRevisionId} and b.calculator = ${filters.calculator})`);
  }
  if (filters.authorId) {
    conditions.push(sql`exists (select 1 from sheet_revision r where r.sheet_id = ${calcSheet.id} and r.author_id = ${filters.authorId})`);
  }
  const where = and(...conditions);
  const order = {
    number: calcSheet.number,
    title: calcSheet.title,
    updated: calcSheet.updatedAt,
    status: statusExpression,
  }[filters.sort];
  const rows = await db()
    .select({
      id: calcSheet.id,
      number: calcSheet.number,
      title: calcSheet.title,
      tags: calcSheet.tags,
      updatedAt: calcSheet.updatedAt,
      projectCode: project.code,
      projectName: project.name,
      status: statusExpression,
      latestLabel: sql<string | null>`(select r.label from sheet_revision r where r.id = ${calcSheet.latestRevisionId})`,
      authorName: sql<string | null>`(select u.name from sheet_revision r join "user" u on u.id = r.author_id where r.id = ${calcSheet.latestRevisionId})`,
      calculators: sql<string[]>`coalesce((select array_agg(distinct b.calculator order by b.calculator) from revision_block b where b.revision_id = ${calcSheet.latestRevisionId}), '{}')`,
    })
    .from(calcSheet)
    .leftJoin(project, eq(calcSheet.projectId, project.id))
    .where(where)
    .orderBy(filters.direction === "asc" ? asc(order) : desc(order), desc(calcSheet.number))
    .limit(filters.pageSize)
    .offset((filters.page - 1) * filters.pageSize);
  const [{ total }] = (await db().select({ total: sql<number>`count(*)::int` }).from(calcSheet).where(where)) as [{ total: number }];
  return { rows: rows.map((r) => ({ ...r, label: sheetNumberLabel(r.number) })), total };
}

/** People who have written revisions in the team, for the author filter. */
export async function sheetAuthors(teamId: string) {
  return db()
    .selectDistinct({ id: user.id, name: user.name })
    .from(sheetRevision)
    .innerJoin(user, eq(sheetRevision.authorId, user.id))
    .where(eq(sheetRevision.teamId, teamId))
    .orderBy(asc(user.name));
}

export class SheetRuleError extends Error {}

export async function createSheet(me: Member, input: { title: string; projectId: string | null; tags: string[]; derivedFromRevisionId?: string }) {
  return db().transaction(async (tx) => {
    // Numbers are handed out one at a time per team: lock the team's row while taking the next.
    await tx.select({ id: organization.id }).from(organization).where(eq(organization.id, me.team.teamId)).for("update");
    if (input.projectId) {
      const [owned] = await tx.select({ id: project.id }).from(project).where(and(eq(project.id, input.projectId), eq(project.teamId, me.team.teamId)));
      if (!owned) throw new SheetRuleError("That project does not exist in this team.");
    }
    const [{ next }] = (await tx
      .select({ next: sql<number>`coalesce(max(${calcSheet.number}), 0) + 1` })
      .from(calcSheet)
      .where(eq(calcSheet.teamId, me.team.teamId))) as [{ next: number }];
    const [sheet] = await tx
      .insert(calcSheet)
      .values({ teamId: me.team.teamId, number: next, title: input.title, projectId: input.projectId, tags: input.tags, createdBy: me.user.id, derivedFromRevisionId: input.derivedFromRevisionId ?? null })
      .returning();
    await recordAudit(
      { teamId: me.team.teamId, actorId: me.user.id, action: "sheet.created", subjectType: "sheet", subjectId: sheet!.id, detail: { number: sheetNumberLabel(next), title: input.title } },
      tx,
    );
    return sheet!;
  });
}

export async function getSheet(teamId: string, number: number) {
  const [row] = await db()
    .select({ sheet: calcSheet, projectCode: project.code, projectName: project.name })
    .from(calcSheet)
    .leftJoin(project, eq(calcSheet.projectId, project.id))
    .where(and(eq(calcSheet.teamId, teamId), eq(calcSheet.number, number)))
    .limit(1);
  return row ? { ...row.sheet, label: sheetNumberLabel(row.sheet.number), projectCode: row.projectCode, projectName: row.projectName } : undefined;
}

export async function listRevisions(sheetId: string) {
  return db()
    .select({
      id: sheetRevision.id,
      label: sheetRevision.label,
      sequence: sheetRevision.sequence,
      state: sheetRevision.state,
      note: sheetRevision.note,
      contentHash: sheetRevision.contentHash,
      engineVersion: sheetRevision.engineVersion,
      createdAt: sheetRevision.createdAt,
      authorName: user.name,
    })
    .from(sheetRevision)
    .leftJoin(user, eq(sheetRevision.authorId, user.id))
    .where(eq(sheetRevision.sheetId, sheetId))
    .orderBy(desc(sheetRevision.sequence));
}

export async function getRevision(sheetId: string, label: string) {
  const [row] = await db()
    .select({ revision: sheetRevision, authorName: user.name })
    .from(sheetRevision)
    .leftJoin(user, eq(sheetRevision.authorId, user.id))
    .where(and(eq(sheetRevision.sheetId, sheetId), eq(sheetRevision.label, label.toUpperCase())))
    .limit(1);
  return row ? { ...row.revision, authorName: row.authorName } : undefined;
}

export async function getRevisionById(revisionId: string) {
  const [row] = await db()
    .select({ revision: sheetRevision, authorName: user.name })
    .from(sheetRevision)
    .leftJoin(user, eq(sheetRevision.authorId, user.id))
    .where(eq(sheetRevision.id, revisionId))
    .limit(1);
  return row ? { ...row.revision, authorName: row.authorName } : undefined;
}

export async function revisionBlocks(revisionIds: string[]) {
  if (revisionIds.length === 0) return [];
  return db().select().from(revisionBlock).where(inArray(revisionBlock.revisionId, revisionIds)).orderBy(asc(revisionBlock.position));
}

export async function getDraft(sheetId: string, authorId: string) {
  const [row] = await db()
    .select()
    .from(sheetDraft)
    .where(and(eq(sheetDraft.sheetId, sheetId), eq(sheetDraft.authorId, authorId)))
    .limit(1);
  return row;
}

/** Keeps the author's working copy; one per author and sheet, overwritten on each autosave. */
export async function saveDraft(sheetId: string, authorId: string, source: string, baseRevisionId: string | null) {
  await db()
    .insert(sheetDraft)
    .values({ sheetId, authorId, source, baseRevisionId })
    .onConflictDoUpdate({ target: [sheetDraft.sheetId, sheetDraft.authorId], set: { source, baseRevisionId, updatedAt: new Date() } });
}

export async function discardDraft(sheetId: string, authorId: string) {
  await db().delete(sheetDraft).where(and(eq(sheetDraft.sheetId, sheetId), eq(sheetDraft.authorId, authorId)));
}

export type SaveOutcome =
  | { ok: true; label: string; revisionId: string; contentHash: string }
  | { ok: false; reason: "invalid"; problems: SourceProblem[] }
  | { ok: false; reason: "conflict"; message: string };

/**
 * Saves a new revision. The server re-checks the source and re-runs every block (the
 * browser's results are never trusted), then writes the revision and its block rows in
 * one transaction. If someone saved since the author opened the sheet, no revision is
 * written and the author's text is kept as their draft.
 */
export async function saveRevision(
  me: Member,
  sheet: { id: string; latestRevisionId: string | null },
  input: { source: string; baseRevisionId: string | null; note: string },
): Promise<SaveOutcome> {
  // Measured-waveform blocks read the sheet's stored capture analyses, never the samples.
  const prepared = await prepareUntrustedSheet(input.source, "sheet", await capturesForSheet(sheet.id));
  // Refused sources are not stored anywhere; the author's text stays in their editor.
  if (!prepared.ok) return { ok: false, reason: "invalid", problems: prepared.problems };
  const contentHash = await hashPrepared(input.source, prepared);
  const outcome = await db().transaction(async (tx) => {
    const [current] = await tx.select().from(calcSheet).where(eq(calcSheet.id, sheet.id)).for("update");
    if (!current) throw new SheetRuleError("The sheet no longer exists.");
    if ((current.latestRevisionId ?? null) !== (input.baseRevisionId ?? null)) {
      const [latest] = current.latestRevisionId
        ? await tx.select({ label: sheetRevision.label, authorId: sheetRevision.authorId }).from(sheetRevision).where(eq(sheetRevision.id, current.latestRevisionId))
        : [];
      return {
        ok: false as const,
        reason: "conflict" as const,
        message: `Revision ${latest?.label ?? "?"} was saved after you opened this sheet, so yours was not saved over it. Your text is kept as your draft: open the latest revision, compare, and save again.`,
      };
    }
    const [{ sequence }] = (await tx
      .select({ sequence: sql<number>`coalesce(max(${sheetRevision.sequence}), 0) + 1` })
      .from(sheetRevision)
      .where(eq(sheetRevision.sheetId, sheet.id))) as [{ sequence: number }];
    const label = revisionLabel(sequence);
    const [revision] = await tx
      .insert(sheetRevision)
      .values({
        sheetId: sheet.id,
        teamId: current.teamId,
        sequence,
        label,
        source: input.source,
        renderTree: prepared.tree,
        engineVersion: prepared.evaluation.engineVersion,
        contentHash,
        note: input.note,
        state: "draft",
        authorId: me.user.id,
        measurements: Object.keys(prepared.measurements).length > 0 ? prepared.measurements : null,
      })
      .returning({ id: sheetRevision.id });
    await linkRevisionAttachments(tx, revision!.id, sheet.id, measuredAttachmentIds(prepared));
    const rows = hashedBlocks(prepared).map((block, position) => {
      const outcome = prepared.evaluation.blocks[block.id];
      return {
        revisionId: revision!.id,
        sheetId: sheet.id,
        teamId: current.teamId,
        blockId: block.id,
        calculator: block.calculator,
        position,
        inputs: block.inputs,
        parsedInputs: outcome?.ok ? outcome.inputs : null,
        results: outcome?.ok ? outcome.results : null,
        ok: outcome?.ok ?? false,
        errors: outcome && !outcome.ok ? outcome.errors : [],
        warnings: outcome?.ok ? outcome.warnings : [],
      };
    });
    if (rows.length > 0) await tx.insert(revisionBlock).values(rows);
    await tx.update(calcSheet).set({ latestRevisionId: revision!.id, updatedAt: new Date() }).where(eq(calcSheet.id, sheet.id));
    await indexSheet(tx, sheet.id); // search: the sheet's search document follows its latest revision
    await tx.delete(sheetDraft).where(and(eq(sheetDraft.sheetId, sheet.id), eq(sheetDraft.authorId, me.user.id)));
    await recordAudit(
      { teamId: current.teamId, actorId: me.user.id, action: "revision.saved", subjectType: "sheet", subjectId: sheet.id, detail: { label, contentHash, blocks: rows.length } },
      tx,
    );
    return { ok: true as const, label, revisionId: revision!.id, contentHash };
  });
  if (!outcome.ok) await saveDraft(sheet.id, me.user.id, input.source, input.baseRevisionId);
  return outcome;
}

export async function updateSheetDetails(me: Member, sheetId: string, input: { title: string; projectId: string | null; tags: string[] }) {
  if (input.projectId) {
    const [owned] = await db().select({ id: project.id }).from(project).where(and(eq(project.id, input.projectId), eq(project.teamId, me.team.teamId)));
    if (!owned) throw new SheetRuleError("That project does not exist in this team.");
  }
  await db()
    .update(calcSheet)
    .set({ title: input.title, projectId: input.projectId, tags: input.tags, updatedAt: new Date() })
    .where(and(eq(calcSheet.id, sheetId), eq(calcSheet.teamId, me.team.teamId)));
  await indexSheet(db(), sheetId); // search: title, project and tags are searched
  await recordAudit({ teamId: me.team.teamId, actorId: me.user.id, action: "sheet.details-changed", subjectType: "sheet", subjectId: sheetId, detail: { title: input.title } });
}

/**
 * Reuses a revision in a project: a new sheet whose draft holds the revision's source
 * (and so its inputs), linked to where it came from. It has no revision yet and needs
 * its own check before anyone may rely on it.
 */
export async function reuseRevision(me: Member, revisionId: string, projectId: string | null) {
  const [origin] = await db()
    .select({ revision: sheetRevision, sheet: calcSheet })
    .from(sheetRevision)
    .innerJoin(calcSheet, eq(calcSheet.id, sheetRevision.sheetId))
    .where(and(eq(sheetRevision.id, revisionId), eq(sheetRevision.teamId, me.team.teamId)));
  if (!origin) throw new SheetRuleError("That revision does not exist in this team.");
  const sheet = await createSheet(me, { title: origin.sheet.title, projectId, tags: origin.sheet.tags, derivedFromRevisionId: origin.revision.id });
  await saveDraft(sheet.id, me.user.id, origin.revision.source, null);
  await recordAudit({
    teamId: me.team.teamId,
    actorId: me.user.id,
    action: "sheet.reused",
    subjectType: "sheet",
    subjectId: origin.sheet.id,
    detail: { label: origin.revision.label, into: sheetNumberLabel(sheet.number) },
  });
  return sheet;
}

/** Where a sheet came from, and where it has been reused. */
export async function sheetLineage(sheetId: string, derivedFromRevisionId: string | null) {
  const [from] = derivedFromRevisionId
    ? await db()
        .select({ number: calcSheet.number, title: calcSheet.title, label: sheetRevision.label })
        .from(sheetRevision)
        .innerJoin(calcSheet, eq(calcSheet.id, sheetRevision.sheetId))
        .where(eq(sheetRevision.id, derivedFromRevisionId))
    : [];
  const reusedIn = await db()
    .select({ number: calcSheet.number, title: calcSheet.title, projectCode: project.code, fromLabel: sheetRevision.label })
    .from(calcSheet)
    .innerJoin(sheetRevision, eq(sheetRevision.id, calcSheet.derivedFromRevisionId))
    .leftJoin(project, eq(project.id, calcSheet.projectId))
    .where(eq(sheetRevision.sheetId, sheetId))
    .orderBy(asc(calcSheet.number));
  return {
    derivedFrom: from ? { sheet: sheetNumberLabel(from.number), title: from.title, revision: from.label } : null,
    reusedIn: reusedIn.map((r) => ({ sheet: sheetNumberLabel(r.number), title: r.title, project: r.projectCode, fromRevision: r.fromLabel })),
  };
}
