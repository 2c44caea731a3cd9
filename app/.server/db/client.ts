import { drizzle, type NodePgDatabase } from "drizzle-orm/node-postgres";
import pg from "pg";
import { config } from "../config";
import * as schema from "./schema";

export type Database = NodePgDatabase<typeof schema>;

let pool: pg.Pool | undefined;
let database: Database | undefined;

/** The process-wide connection pool; app servers keep no other state. */
export function db(): Database {
  if (!database) {
    pool = new pg.Pool({ connectionString: config().DATABASE_URL, max: 10, idleTimeoutMillis: 30_000 });
    // A dropped connection (e.g. PostgreSQL restarting) must not crash the server; the pool reconnects.
    // Idle clients report through the pool; a client checked out (between a transaction's statements)
    // reports on itself, and its next query fails instead — the pool discards it on release.
    pool.on("error", () => {});
    pool.on("connect", (client) => client.on("error", () => {}));
    database = drizzle(pool, { schema });
  }
  return database;
}

/** The pool itself, for what needs one connection throughout (a session advisory lock). */
export function dbPool(): pg.Pool {
  db();
  return pool!;
}

export async function closeDb(): Promise<void> {
  const current = pool;
  pool = undefined;
  database = undefined;
  await current?.end();
}
