/**
 * Rebuilds search from the sheets themselves: every PostgreSQL search row, then — when
 * Meilisearch is configured — its index, emptied and filled in batches. Safe to run
 * while servers work: a sheet saved meanwhile is queued through the outbox as usual.
 */
import { asc, lt, sql } from "drizzle-orm";
import { SEARCH_TEXT_VERSION } from "~/lib/search/document-text";
import { db, dbPool, type Database } from "../db/client";
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

/** Any number, the same on every server: the advisory lock one server holds while it rebuilds. */
const REBUILD_LOCK = 7_314_002;

/**
 * At server start: rebuilds every search row when some were written with an older
 * SEARCH_TEXT_VERSION (after an upgrade). One server does it, under a session advisory lock;
 * the others go on serving, and search keeps answering from the rows it has meanwhile.
 * Meilisearch keeps its copy (it reads the words as typed); `npm run search:reindex` renews it.
 */
export async function rebuildOutdatedSearchText(log: (line: string) => void): Promise<number> {
  const database = db();
  const [outdated] = await database.select({ id: searchDocument.id }).from(searchDocument).where(lt(searchDocument.textVersion, SEARCH_TEXT_VERSION)).limit(1);
  if (!outdated) return 0;
  const client = await dbPool().connect();
  try {
    const locked = await client.query<{ locked: boolean }>("select pg_try_advisory_lock($1) as locked", [REBUILD_LOCK]);
    if (!locked.rows[0]?.locked) return 0;
    try {
      log(`search rows from an older version: rebuilding (version ${SEARCH_TEXT_VERSION})`);
      const rebuilt = await rebuildSearchDocuments(database);
      log(`rebuilt ${rebuilt} search rows`);
      return rebuilt;
    } finally {
      await client.query("select pg_advisory_unlock($1)", [REBUILD_LOCK]);
    }
  } finally {
    client.release();
  }
}
