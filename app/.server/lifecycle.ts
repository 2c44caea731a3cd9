import { config } from "./config";
import { closeDb } from "./db/client";
import { migrateDatabase } from "./db/migrate";
import { logger, loggableError } from "./logger";
import { startOutboxWorker, stopOutboxWorker } from "./mail/outbox";
import { rebuildOutdatedSearchText } from "./search/reindex";

/** Runs once per server process before it accepts requests. Safe with several servers starting together. */
export async function startBackgroundWork(): Promise<void> {
  await migrateDatabase(config().DATABASE_URL);
  startOutboxWorker();
  // Not awaited: on a large team it takes a while, and search answers from the rows it has meanwhile.
  rebuildOutdatedSearchText((line) => logger().info(line)).catch((error) => logger().error({ err: loggableError(error) }, "rebuilding outdated search rows failed; run npm run search:reindex"));
}

/** Graceful stop: finish the outbox batch in hand, then close the pool. */
export async function stopBackgroundWork(): Promise<void> {
  await stopOutboxWorker();
  await closeDb();
}
