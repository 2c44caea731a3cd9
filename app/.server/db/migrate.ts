import { sql } from "drizzle-orm";
import { drizzle } from "drizzle-orm/node-postgres";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import path from "node:path";
import pg from "pg";

// Any fixed number: several servers starting together take turns migrating.
const MIGRATION_LOCK = 7_351_042;

/** Applies the committed migrations in `drizzle/`, one server at a time. */
export async function migrateDatabase(databaseUrl: string, migrationsFolder = path.resolve("drizzle")): Promise<void> {
  const client = new pg.Client({ connectionString: databaseUrl });
  await client.connect();
  try {
    const database = drizzle(client);
    await database.execute(sql`select pg_advisory_lock(${MIGRATION_LOCK})`);
    try {
      await migrate(database, { migrationsFolder });
    } finally {
      await database.execute(sql`select pg_advisory_unlock(${MIGRATION_LOCK})`);
    }
  } finally {
    await client.end();
  }
}
