/**
 * Copies search documents to Meilisearch for the outbox worker. A row only names the
 * document; delivery reads its current state, so retries and duplicates converge.
 * A per-document advisory lock keeps two servers from sending one document's states
 * out of order (Meilisearch applies tasks in the order they arrive).
 */
import { eq, sql } from "drizzle-orm";
import type { Database } from "../db/client";
import { searchDocument } from "../db/schema";
import { meilisearchEngine } from "./engine";

type Tx = Pick<Database, "select" | "execute">;

export async function deliverSearchCopy(tx: Tx, payload: { id: string }): Promise<void> {
  const meili = meilisearchEngine();
  // Queued while Meilisearch was configured, delivered by a server where it is not: nothing to copy to.
  if (!meili) return;
  await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${`search-copy:${payload.id}`}))`);
  const [row] = await tx.select().from(searchDocument).where(eq(searchDocument.id, payload.id));
  if (row) {
    const { search: _vector, searchHead: _head, ...doc } = row;
    await meili.index(doc);
  } else {
    await meili.remove(payload.id);
  }
}
