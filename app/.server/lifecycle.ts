import { config } from "./config";
import { closeDb } from "./db/client";
import { migrateDatabase } from "./db/migrate";
import { startOutboxWorker, stopOutboxWorker } from "./mail/outbox";

/** Runs once per server process before it accepts requests. Safe with several servers starting together. */
export async function startBackgroundWork(): Promise<void> {
  await migrateDatabase(config().DATABASE_URL);
  startOutboxWorker();
}

/** Graceful stop: finish the outbox batch in hand, then close the pool. */
export async function stopBackgroundWork(): Promise<void> {
  await stopOutboxWorker();
  await closeDb();
}
