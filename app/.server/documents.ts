/**
 * Project documents: design reports, review packs and certification files written in
 * MDX through the same checked pipeline as sheets, saved as numbered versions that
 * never change, each citing exact calc-sheet revisions. A citation's state is decided
 * afresh on every view (lib/documents/citations.ts) from the cited sheet's revisions,
 * its stamp and the current engine.
 */
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import type { Root as HastRoot } from "hast";
import { citationKey, citationStatus, toCitationView, type CitableRevision, type CitationStatus, type CitationView } from "~/lib/documents/citations";
import { setCitationRevision } from "~/lib/mdx";
import type { SourceCitation, SourceProblem } from "~/lib/mdx/types";
import { documentNumberLabel, parseSheetNumber, sheetNumberLabel } from "~/lib/sheets/numbering";
import { prepareSheet } from "~/lib/sheets/pipeline";
import { prepareUntrustedSheet } from "./math-typesetter";
import type { Member } from "./access";
import { recordAudit } from "./audit";
import { db, type Database } from "./db/client";
import { calcSheet, documentCitation, documentDraft, documentVersion, organization, project, projectDocument, revisionBlock, sheetRevision, stamp, user } from "./db/schema";
import { checkIntegrity } from "./review";
import { indexDocument } from "./search/indexer";

export class DocumentRuleError extends Error {}

/** What a new document starts with. */
export const STARTER_DOCUMENT = `## Scope

What this document covers, for whom, and which design it describes.

## Design basis

Cite each checked calculation the design rests on with the palette, or by hand as \`<Cite sheet="CS-0001" rev="A" />\`.

## Conclusions
`;

type Tx = Parameters<Parameters<Database["transaction"]>[0]>[0];

export async function listProjectDocuments(teamId: string, projectId: string) {
  const rows = await db()
    .select({
      id: projectDocument.id,
      number: projectDocument.number,
      title: projectDocument.title,
      updatedAt: projectDocument.updatedAt,
      version: documentVersion.sequence,
      authorName: user.name,
    })
    .from(projectDocument)
    .leftJoin(documentVersion, eq(documentVersion.id, projectDocument.latestVersionId))
    .leftJoin(user, eq(user.id, documentVersion.authorId))
    .where(and(eq(projectDocument.teamId, teamId), eq(projectDocument.projectId, projectId)))
    .orderBy(asc(projectDocument.number));
  return rows.map((r) => ({ ...r, label: documentNumberLabel(r.number) }));
}

export async function createDocument(me: Member, input: { title: string; projectId: string }) {
  return db().transaction(async (tx) => {
    // Numbers are handed out one at a time per team, as for sheets.
    await tx.select({ id: organization.id }).from(organization).where(eq(organization.id, me.team.teamId)).for("update");
    const [owned] = await tx.select({ id: project.id }).from(project).where(and(eq(project.id, input.projectId), eq(project.teamId, me.team.teamId)));
    if (!owned) throw new DocumentRuleError("That project does not exist in this team.");
    const [{ next }] = (await tx
      .select({ next: sql<number>`coalesce(max(${projectDocument.number}), 0) + 1` })
      .from(projectDocument)
      .where(eq(projectDocument.teamId, me.team.teamId))) as [{ next: number }];
    const [document] = await tx
      .insert(projectDocument)
      .values({ teamId: me.team.teamId, number: next, projectId: input.projectId, title: input.title, createdBy: me.user.id })
      .returning();
    await recordAudit(
      { teamId: me.team.teamId, actorId: me.user.id, action: "document.created", subjectType: "document", subjectId: document!.id, detail: { number: documentNumberLabel(next), title: input.title } },
      tx,
    );
    await indexDocument(tx, document!.id);
    return { ...document!, label: documentNumberLabel(next) };
  });
}

export async function getDocument(teamId: string, number: number) {
  const [row] = await db()
    .select({ document: projectDocument, projectCode: project.code, projectName: project.name })
    .from(projectDocument)
    .innerJoin(project, eq(project.id, projectDocument.projectId))
    .where(and(eq(projectDocument.teamId, teamId), eq(projectDocument.number, number)))
    .limit(1);
  return row ? { ...row.document, label: documentNumberLabel(row.document.number), projectCode: row.projectCode, projectName: row.projectName } : undefined;
}

export async function listVersions(documentId: string) {
  return db()
    .select({ id: documentVersion.id, sequence: documentVersion.sequence, note: documentVersion.note, createdAt: documentVersion.createdAt, authorName: user.name })
    .from(documentVersion)
    .leftJoin(user, eq(user.id, documentVersion.authorId))
    .where(eq(documentVersion.documentId, documentId))
    .orderBy(desc(documentVersion.sequence));
}

export async function getVersion(documentId: string, which: { id: string } | { sequence: number }) {
  const [row] = await db()
    .select({ version: documentVersion, authorName: user.name })
    .from(documentVersion)
    .leftJoin(user, eq(user.id, documentVersion.authorId))
    .where(and(eq(documentVersion.documentId, documentId), "id" in which ? eq(documentVersion.id, which.id) : eq(documentVersion.sequence, which.sequence)))
    .limit(1);
  return row ? { ...row.version, renderTree: row.version.renderTree as HastRoot, authorName: row.authorName } : undefined;
}

export async function getDocumentDraft(documentId: string, authorId: string) {
  const [row] = await db()
    .select()
    .from(documentDraft)
    .where(and(eq(documentDraft.documentId, documentId), eq(documentDraft.authorId, authorId)))
    .limit(1);
  return row;
}

export async function saveDocumentDraft(documentId: string, authorId: string, source: string, baseVersionId: string | null) {
  await db()
    .insert(documentDraft)
    .values({ documentId, authorId, source, baseVersionId })
    .onConflictDoUpdate({ target: [documentDraft.documentId, documentDraft.authorId], set: { source, baseVersionId, updatedAt: new Date() } });
}

export async function discardDocumentDraft(documentId: string, authorId: string) {
  await db().delete(documentDraft).where(and(eq(documentDraft.documentId, documentId), eq(documentDraft.authorId, authorId)));
}

export type DocumentSaveOutcome =
  | { ok: true; version: number; versionId: string }
  | { ok: false; reason: "invalid"; problems: SourceProblem[] }
  | { ok: false; reason: "conflict"; message: string };

/** Writes the next version and its citation rows; the caller holds the document's row lock. */
async function writeVersion(
  tx: Tx,
  me: Member,
  document: { id: string; teamId: string },
  input: { source: string; tree: HastRoot; citations: SourceCitation[]; note: string },
) {
  const [{ sequence }] = (await tx
    .select({ sequence: sql<number>`coalesce(max(${documentVersion.sequence}), 0) + 1` })
    .from(documentVersion)
    .where(eq(documentVersion.documentId, document.id))) as [{ sequence: number }];
  const [version] = await tx
    .insert(documentVersion)
    .values({ documentId: document.id, teamId: document.teamId, sequence, source: input.source, renderTree: input.tree, note: input.note, authorId: me.user.id })
    .returning({ id: documentVersion.id });
  const seen = new Set<string>();
  const rows = input.citations.flatMap((c) => {
    const key = citationKey(c.sheet, c.rev);
    if (seen.has(key)) return [];
    seen.add(key);
    return [{ versionId: version!.id, documentId: document.id, teamId: document.teamId, position: seen.size, sheet: c.sheet.trim().toUpperCase(), rev: c.rev.trim().toUpperCase(), sheetNumber: parseSheetNumber(c.sheet) ?? null }];
  });
  if (rows.length > 0) await tx.insert(documentCitation).values(rows);
  await tx.update(projectDocument).set({ latestVersionId: version!.id, updatedAt: new Date() }).where(eq(projectDocument.id, document.id));
  await indexDocument(tx, document.id);
  return { version: sequence, versionId: version!.id };
}

/**
 * Saves a new version: the server re-checks the source (the browser is never trusted)
 * and refuses to save over a version someone saved since the author opened the
 * document (their text is kept as their draft).
 */
export async function saveDocumentVersion(
  me: Member,
  document: { id: string },
  input: { source: string; baseVersionId: string | null; note: string },
): Promise<DocumentSaveOutcome> {
  const prepared = await prepareUntrustedSheet(input.source, "document");
  if (!prepared.ok) return { ok: false, reason: "invalid", problems: prepared.problems };
  const outcome = await db().transaction(async (tx) => {
    const [current] = await tx.select().from(projectDocument).where(eq(projectDocument.id, document.id)).for("update");
    if (!current) throw new DocumentRuleError("The document no longer exists.");
    if ((current.latestVersionId ?? null) !== (input.baseVersionId ?? null)) {
      const [latest] = current.latestVersionId ? await tx.select({ sequence: documentVersion.sequence }).from(documentVersion).where(eq(documentVersion.id, current.latestVersionId)) : [];
      return {
        ok: false as const,
        reason: "conflict" as const,
        message: `Version ${latest?.sequence ?? "?"} was saved after you opened this document, so yours was not saved over it. Your text is kept as your draft: open the latest version, compare, and save again.`,
      };
    }
    const saved = await writeVersion(tx, me, current, { source: input.source, tree: prepared.tree, citations: prepared.citations, note: input.note });
    await tx.delete(documentDraft).where(and(eq(documentDraft.documentId, document.id), eq(documentDraft.authorId, me.user.id)));
    await recordAudit(
      { teamId: current.teamId, actorId: me.user.id, action: "document.saved", subjectType: "document", subjectId: document.id, detail: { number: documentNumberLabel(current.number), version: saved.version, citations: prepared.citations.length } },
      tx,
    );
    return { ok: true as const, ...saved };
  });
  if (!outcome.ok) await saveDocumentDraft(document.id, me.user.id, input.source, input.baseVersionId);
  return outcome;
}

/** A citation as the page shows it: its state, the sheet's title, and where it links. */
export interface ResolvedCitation extends CitationStatus {
  key: string;
  sheet: string;
  rev: string;
  title: string | null;
  href: string | null;
  /** When the cited revision was stamped, and by whom. */
  stampedAt: string | null;
  checkerName: string | null;
  contentHash: string | null;
}

/**
 * Decides the state of each citation (given as "CS-0003"/"B" pairs) in one team: the
 * cited sheets' revisions, stamps, and an integrity and engine re-run of each cited
 * verified revision.
 */
export async function resolveCitations(teamId: string, citations: readonly { sheet: string; rev: string }[]): Promise<Map<string, ResolvedCitation>> {
  const numbers = [...new Set(citations.map((c) => parseSheetNumber(c.sheet)).filter((n): n is number => n !== undefined))];
  const sheets = numbers.length
    ? await db().select({ id: calcSheet.id, number: calcSheet.number, title: calcSheet.title }).from(calcSheet).where(and(eq(calcSheet.teamId, teamId), inArray(calcSheet.number, numbers)))
    : [];
  const revisions = sheets.length
    ? await db()
        .select({ id: sheetRevision.id, sheetId: sheetRevision.sheetId, label: sheetRevision.label, sequence: sheetRevision.sequence, state: sheetRevision.state })
        .from(sheetRevision)
        .where(inArray(sheetRevision.sheetId, sheets.map((s) => s.id)))
    : [];
  const bySheet = new Map<string, CitableRevision[]>();
  for (const r of revisions) bySheet.set(r.sheetId, [...(bySheet.get(r.sheetId) ?? []), r]);

  const resolved = new Map<string, ResolvedCitation>();
  for (const c of citations) {
    const key = citationKey(c.sheet, c.rev);
    if (resolved.has(key)) continue;
    const number = parseSheetNumber(c.sheet);
    const sheet = number === undefined ? undefined : sheets.find((s) => s.number === number);
    const label = sheet ? sheetNumberLabel(sheet.number) : c.sheet.trim().toUpperCase();
    const rev = c.rev.trim().toUpperCase();
    const facts = sheet ? { number: label, title: sheet.title, revisions: bySheet.get(sheet.id) ?? [] } : undefined;
    const first = citationStatus(facts, rev);
    let status = first;
    let stampFacts: { stampedAt: string | null; checkerName: string | null; contentHash: string | null } = { stampedAt: null, checkerName: null, contentHash: null };
    if (first.cited && first.cited.state === "verified") {
      const health = await stampHealth(first.cited.id);
      if (health) {
        status = citationStatus(facts, rev, health.health);
        stampFacts = health.stamp;
      }
    }
    resolved.set(key, {
      ...status,
      key,
      sheet: label,
      rev,
      title: sheet?.title ?? null,
      href: sheet ? (status.cited ? `/sheets/${label}/revisions/${status.cited.label}` : `/sheets/${label}`) : null,
      ...stampFacts,
    });
  }
  return resolved;
}

/** The cited revision's stamp, re-hashed and re-run through the current engine. */
async function stampHealth(revisionId: string) {
  const [row] = await db()
    .select({ revision: sheetRevision, stamp: stamp, checkerName: user.name })
    .from(sheetRevision)
    .leftJoin(stamp, eq(stamp.revisionId, sheetRevision.id))
    .leftJoin(user, eq(user.id, stamp.checkerId))
    .where(eq(sheetRevision.id, revisionId));
  if (!row) return undefined;
  const rows = await db().select().from(revisionBlock).where(eq(revisionBlock.revisionId, revisionId)).orderBy(asc(revisionBlock.position));
  const report = await checkIntegrity(row.revision, rows, row.stamp?.contentHash ?? null);
  return {
    health: {
      intact: report.hashMatches && report.stampValid !== false,
      stampEngineVersion: row.stamp?.engineVersion ?? row.revision.engineVersion,
      engineVersion: report.engineVersion,
      driftCount: report.drift.length,
    },
    stamp: { stampedAt: row.stamp?.createdAt.toISOString() ?? null, checkerName: row.checkerName, contentHash: row.revision.contentHash },
  };
}

/** What the browser needs of a resolved citation. */
export function citationView(c: ResolvedCitation): CitationView {
  return toCitationView(c, c);
}

/** The citations of a document version in reference order, with their states. */
export async function versionCitations(teamId: string, versionId: string): Promise<ResolvedCitation[]> {
  const rows = await db()
    .select({ sheet: documentCitation.sheet, rev: documentCitation.rev })
    .from(documentCitation)
    .where(eq(documentCitation.versionId, versionId))
    .orderBy(asc(documentCitation.position));
  const resolved = await resolveCitations(teamId, rows);
  return rows.map((r) => resolved.get(citationKey(r.sheet, r.rev))!);
}

/** Every citation in the latest versions of a project's documents that needs attention. */
export async function staleCitations(teamId: string, projectId: string) {
  const rows = await db()
    .select({ documentId: projectDocument.id, number: projectDocument.number, title: projectDocument.title, version: documentVersion.sequence, sheet: documentCitation.sheet, rev: documentCitation.rev })
    .from(projectDocument)
    .innerJoin(documentVersion, eq(documentVersion.id, projectDocument.latestVersionId))
    .innerJoin(documentCitation, eq(documentCitation.versionId, documentVersion.id))
    .where(and(eq(projectDocument.teamId, teamId), eq(projectDocument.projectId, projectId)))
    .orderBy(asc(projectDocument.number), asc(documentCitation.position));
  const resolved = await resolveCitations(teamId, rows);
  return rows.flatMap((r) => {
    const citation = resolved.get(citationKey(r.sheet, r.rev))!;
    return citation.stale ? [{ document: { id: r.documentId, label: documentNumberLabel(r.number), title: r.title, version: r.version }, citation: citationView(citation) }] : [];
  });
}

/** Documents whose latest version cites a revision of this sheet (for the sheet page). */
export async function citingDocuments(teamId: string, sheetNumber: number) {
  const rows = await db()
    .selectDistinct({ number: projectDocument.number, title: projectDocument.title, rev: documentCitation.rev, projectCode: project.code })
    .from(documentCitation)
    .innerJoin(projectDocument, eq(projectDocument.latestVersionId, documentCitation.versionId))
    .innerJoin(project, eq(project.id, projectDocument.projectId))
    .where(and(eq(documentCitation.teamId, teamId), eq(documentCitation.sheetNumber, sheetNumber)))
    .orderBy(asc(projectDocument.number), asc(documentCitation.rev));
  return rows.map((r) => ({ ...r, label: documentNumberLabel(r.number) }));
}

/**
 * Moves one citation of a document to the cited sheet's newest verified revision by
 * saving a new version with only that rev changed, and records it in the audit trail.
 */
export async function updateCitation(me: Member, documentId: string, citation: { sheet: string; rev: string }) {
  return db().transaction(async (tx) => {
    const [current] = await tx.select().from(projectDocument).where(and(eq(projectDocument.id, documentId), eq(projectDocument.teamId, me.team.teamId))).for("update");
    if (!current?.latestVersionId) throw new DocumentRuleError("That document does not exist in this team.");
    const [latest] = await tx.select().from(documentVersion).where(eq(documentVersion.id, current.latestVersionId));
    const key = citationKey(citation.sheet, citation.rev);
    const status = (await resolveCitations(me.team.teamId, [citation])).get(key)!;
    if (!status.updateTo) {
      throw new DocumentRuleError(
        status.latestVerified
          ? `${status.sheet} revision ${status.rev} is already its newest verified revision; there is nothing to update to.`
          : `${status.sheet} has no verified revision yet; the citation can be updated once one is stamped.`,
      );
    }
    // Only the citations are read here: the formulas are not typeset.
    const checked = prepareSheet(latest!.source, "document", {}, null);
    if (!checked.ok) throw new DocumentRuleError("The document's latest version no longer passes the source check; open it in the editor.");
    let source: string;
    try {
      source = setCitationRevision(latest!.source, checked.citations, citation.sheet, citation.rev, status.updateTo.label);
    } catch (error) {
      throw new DocumentRuleError(error instanceof Error ? error.message : String(error));
    }
    const next = await prepareUntrustedSheet(source, "document");
    if (!next.ok) throw new DocumentRuleError("The updated citation did not pass the source check; edit the document instead.");
    const note = `Citation ${status.sheet} moved from revision ${status.rev} (${status.state}) to ${status.updateTo.label}, its newest verified revision.`;
    const saved = await writeVersion(tx, me, current, { source, tree: next.tree, citations: next.citations, note });
    await recordAudit(
      {
        teamId: current.teamId,
        actorId: me.user.id,
        action: "document.citation-updated",
        subjectType: "document",
        subjectId: current.id,
        detail: { sheet: status.sheet, from: status.rev, to: status.updateTo.label, reason: status.state, version: saved.version },
      },
      tx,
    );
    return { ...saved, sheet: status.sheet, from: status.rev, to: status.updateTo.label, document: documentNumberLabel(current.number) };
  });
}

/** The team's sheets with their revisions' states: the editor's citation palette and its preview. */
export async function citableSheets(teamId: string) {
  const rows = await db()
    .select({ number: calcSheet.number, title: calcSheet.title, projectCode: project.code, id: sheetRevision.id, label: sheetRevision.label, sequence: sheetRevision.sequence, state: sheetRevision.state })
    .from(calcSheet)
    .innerJoin(sheetRevision, eq(sheetRevision.sheetId, calcSheet.id))
    .leftJoin(project, eq(project.id, calcSheet.projectId))
    .where(eq(calcSheet.teamId, teamId))
    .orderBy(asc(calcSheet.number), asc(sheetRevision.sequence));
  const sheets = new Map<number, { number: string; title: string; projectCode: string | null; revisions: CitableRevision[] }>();
  for (const r of rows) {
    const sheet = sheets.get(r.number) ?? { number: sheetNumberLabel(r.number), title: r.title, projectCode: r.projectCode, revisions: [] };
    sheet.revisions.push({ id: r.id, label: r.label, sequence: r.sequence, state: r.state });
    sheets.set(r.number, sheet);
  }
  return [...sheets.values()];
}
