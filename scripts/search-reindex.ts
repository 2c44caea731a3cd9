// `npm run search:reindex`: rebuilds search from the sheets — every PostgreSQL search row
// and, when MEILI_HOST is set, the Meilisearch index. Safe while servers run.
import { closeDb, db } from "../app/.server/db/client";
import { migrateDatabase } from "../app/.server/db/migrate";
import { reindexSearch } from "../app/.server/search/reindex";

const started = Date.now();
try {
  // The search table comes with the migrations; servers apply them at start, so may we.
  await migrateDatabase(process.env.DATABASE_URL!);
  const outcome = await reindexSearch(db(), (line) => console.log(`[search] ${line}`));
  console.log(`[search] ${outcome.documents} sheets re-indexed${outcome.meilisearch ? " in PostgreSQL and Meilisearch" : " in PostgreSQL (MEILI_HOST is not set)"} in ${((Date.now() - started) / 1000).toFixed(1)} s`);
} finally {
  await closeDb();
}
