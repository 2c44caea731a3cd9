/**
 * Keeps `search_document` current. Called inside the transaction that changes a sheet
 * (save, details, submit, return, stamp), so PostgreSQL search is never behind; when
 * Meilisearch is configured, the same transaction queues an outbox row that copies the
 * document there, so an outage delays the copy and loses nothing.
 */
import { asc, eq, sql } from "drizzle-orm";
import type { Root as HastRoot } from "hast";
import { getCalculator } from "~/lib/calc/registry";
import { blockValuesText, proseText, SEARCH_TEXT_VERSION, type IndexedBlock } from "~/lib/search/document-text";
import { config } from "../config";
import type { Database } from "../db/client";
import { calcSheet, documentCitation, documentVersion, outbox, project, projectDocument, revisionBlock, searchDocument, sheetRevision } from "../db/schema";
import { kickOutbox } from "../mail/outbox";
import type { SearchDocument } from "./types";

type Tx = Pick<Database, "select" | "selectDistinct" | "insert" | "delete" | "execute">;

export const SEARCH_OUTBOX_KIND = "search-index";

/** Builds a sheet's search document from its latest revision; undefined when the sheet is gone. */
export async function buildSheetDocument(tx: Tx, sheetId: string): Promise<SearchDocument | undefined> {
  const [sheet] = await tx
    .select({ sheet: calcSheet, projectCode: project.code, projectName: project.name })
    .from(calcSheet)
    .leftJoin(project, eq(project.id, calcSheet.projectId))
    .where(eq(calcSheet.id, sheetId));
  if (!sheet) return undefined;
  const { sheet: s } = sheet;
  const [revision] = s.latestRevisionId
    ? await tx
        .select({ id: sheetRevision.id, label: sheetRevision.label, state: sheetRevision.state, renderTree: sheetRevision.renderTree, createdAt: sheetRevision.createdAt })
        .from(sheetRevision)
        .where(eq(sheetRevision.id, s.latestRevisionId))
    : [];
  const blocks = revision
    ? await tx
        .select({ blockId: revisionBlock.blockId, calculator: revisionBlock.calculator, inputs: revisionBlock.inputs, parsedInputs: revisionBlock.parsedInputs, results: revisionBlock.results })
        .from(revisionBlock)
        .where(eq(revisionBlock.revisionId, revision.id))
        .orderBy(asc(revisionBlock.position))
    : [];
  const authors = await tx
    .selectDistinct({ authorId: sheetRevision.authorId })
    .from(sheetRevision)
    .where(eq(sheetRevision.sheetId, sheetId));
  const calculators = [...new Set(blocks.map((b) => b.calculator))].sort();
  const keywords = [
    ...s.tags,
    sheet.projectCode ?? "",
    sheet.projectName ?? "",
    ...calculators.flatMap((id) => [id, getCalculator(id)?.title ?? ""]),
  ]
    .filter(Boolean)
    .join("\n");
  return {
    id: s.id,
    kind: "sheet",
    textVersion: SEARCH_TEXT_VERSION,
    teamId: s.teamId,
    sheetId: s.id,
    number: s.number,
    title: s.title,
    projectId: s.projectId,
    projectCode: sheet.projectCode,
    tags: s.tags,
    calculators,
    authorIds: authors.map((a) => a.authorId).filter((id): id is string => Boolean(id)).sort(),
    revisionId: revision?.id ?? null,
    revisionLabel: revision?.label ?? null,
    state: revision?.state ?? "unsaved",
    keywords,
    body: revision ? proseText(revision.renderTree as HastRoot) : "",
    blockValues: blockValuesText(blocks as IndexedBlock[], getCalculator),
    updatedAt: s.updatedAt > (revision?.createdAt ?? s.updatedAt) ? s.updatedAt : (revision?.createdAt ?? s.updatedAt),
  };
}

/**
 * Builds a project document's search document from its latest version: title, project,
 * prose, and the citations it holds ("CS-0003 rev B"), so searching a sheet's number
 * finds the documents that cite it.
 */
export async function buildProjectDocument(tx: Tx, documentId: string): Promise<SearchDocument | undefined> {
  const [row] = await tx
    .select({ document: projectDocument, projectCode: project.code, projectName: project.name })
    .from(projectDocument)
    .innerJoin(project, eq(project.id, projectDocument.projectId))
    .where(eq(projectDocument.id, documentId));
  if (!row) return undefined;
  const { document: d } = row;
  const [version] = d.latestVersionId
    ? await tx
        .select({ id: documentVersion.id, sequence: documentVersion.sequence, renderTree: documentVersion.renderTree, createdAt: documentVersion.createdAt })
        .from(documentVersion)
        .where(eq(documentVersion.id, d.latestVersionId))
    : [];
  const citations = version
    ? await tx.select({ sheet: documentCitation.sheet, rev: documentCitation.rev }).from(documentCitation).where(eq(documentCitation.versionId, version.id)).orderBy(asc(documentCitation.position))
    : [];
  const authors = await tx.selectDistinct({ authorId: documentVersion.authorId }).from(documentVersion).where(eq(documentVersion.documentId, documentId));
  return {
    id: d.id,
    kind: "document",
    textVersion: SEARCH_TEXT_VERSION,
    teamId: d.teamId,
    sheetId: null,
    number: d.number,
    title: d.title,
    projectId: d.projectId,
    projectCode: row.projectCode,
    tags: [],
    calculators: [],
    authorIds: authors.map((a) => a.authorId).filter((id): id is string => Boolean(id)).sort(),
    revisionId: version?.id ?? null,
    revisionLabel: version ? String(version.sequence) : null,
    state: version ? "document" : "unsaved",
    keywords: ["project document", row.projectCode, row.projectName].join("\n"),
    body: version ? proseText(version.renderTree as HastRoot) : "",
    blockValues: citations.map((c) => `cites ${c.sheet} rev ${c.rev}`).join("\n"),
    updatedAt: d.updatedAt,
  };
}

/** Re-indexes one project document inside the caller's transaction. */
export async function indexDocument(tx: Tx, documentId: string): Promise<void> {
  const doc = await buildProjectDocument(tx, documentId);
  if (!doc) return removeFromSearch(tx, documentId);
  await upsertSearchDocument(tx, doc);
  await queueCopy(tx, doc.id);
}

/** Writes a search document row (insert or replace). */
export async function upsertSearchDocument(tx: Pick<Database, "insert">, doc: SearchDocument): Promise<void> {
  const { id, ...rest } = doc;
  await tx.insert(searchDocument).values(doc).onConflictDoUpdate({ target: searchDocument.id, set: rest });
}

async function queueCopy(tx: Pick<Database, "insert">, id: string) {
  if (!config().MEILI_HOST) return;
  await tx.insert(outbox).values({ kind: SEARCH_OUTBOX_KIND, payload: { id } });
  kickOutbox();
}

/** Re-indexes one sheet inside the caller's transaction. */
export async function indexSheet(tx: Tx, sheetId: string): Promise<void> {
  const doc = await buildSheetDocument(tx, sheetId);
  if (!doc) return removeFromSearch(tx, sheetId);
  await upsertSearchDocument(tx, doc);
  await queueCopy(tx, doc.id);
}

/** Takes a sheet or document out of search (for when it is deleted). */
export async function removeFromSearch(tx: Tx, id: string): Promise<void> {
  await tx.delete(searchDocument).where(eq(searchDocument.id, id));
  await queueCopy(tx, id);
}

/** Rebuilds every sheet's row in PostgreSQL, in batches; returns how many. */
export async function rebuildSearchDocuments(db: Database, onProgress?: (done: number) => void): Promise<number> {
  let done = 0;
  let after = "";
  for (;;) {
    const batch = await db
      .select({ id: calcSheet.id })
      .from(calcSheet)
      .where(sql`${calcSheet.id} > ${after}`)
      .orderBy(asc(calcSheet.id))
      .limit(200);
    if (batch.length === 0) break;
    await db.transaction(async (tx) => {
      for (const { id } of batch) {
        const doc = await buildSheetDocument(tx, id);
        if (doc) await upsertSearchDocument(tx, doc);
      }
    });
    done += batch.length;
    after = batch.at(-1)!.id;
    onProgress?.(done);
  }
  const documents = await db.select({ id: projectDocument.id }).from(projectDocument).orderBy(asc(projectDocument.id));
  for (let i = 0; i < documents.length; i += 200) {
    await db.transaction(async (tx) => {
      for (const { id } of documents.slice(i, i + 200)) {
        const doc = await buildProjectDocument(tx, id);
        if (doc) await upsertSearchDocument(tx, doc);
      }
    });
    done += Math.min(200, documents.length - i);
    onProgress?.(done);
  }
  // Rows whose sheet or document is gone.
  await db.delete(searchDocument).where(sql`${searchDocument.kind} = 'sheet' and not exists (select 1 from calc_sheet s where s.id = ${searchDocument.sheetId})`);
  await db.delete(searchDocument).where(sql`${searchDocument.kind} = 'document' and not exists (select 1 from project_document p where p.id = ${searchDocument.id})`);
  return done;
}
