/**
 * Rebuilds search from the sheets themselves: every PostgreSQL search row, then — when
 * Meilisearch is configured — its index, emptied and filled in batches. Safe to run
 * while servers work: a sheet saved meanwhile is queued through the outbox as usual.
 */
import { asc, sql } from "drizzle-orm";
import type { Database } from "../db/client";
import { searchDocument } from "../db/schema";
import { meilisearchEngine } from "./engine";
import { rebuildSearchDocuments } from "./indexer";

export async function reindexSearch(database: Database, log: (line: string) => void = () => {}): Promise<{ documents: number; meilisearch: boolean }> {
  const documents = await rebuildSearchDocuments(database, (done) => log(`rebuilt ${done} sheet rows`));
  const meili = meilisearchEngine();
  if (!meili) return { documents, meilisearch: false };
  await meili.removeAll();
  let after = "";
  let sent = 0;
  for (;;) {
    const rows = await database.select().from(searchDocument).where(sql`${searchDocument.id} > ${after}`).orderBy(asc(searchDocument.id)).limit(1000);
    if (rows.length === 0) break;
    await meili.indexMany(rows.map(({ search: _vector, searchHead: _head, ...doc }) => doc));
    sent += rows.length;
    after = rows.at(-1)!.id;
    log(`sent ${sent} documents to Meilisearch`);
  }
  return { documents, meilisearch: true };
}
