import { afterAll } from "vitest";
import pg from "pg";

/**
 * Each integration test file gets its own database, copied from the migrated
 * template that `npm test` prepares, so files never see each other's rows.
 * Runs before the file's imports, so server modules connect to it.
 */
const template = process.env.TEST_TEMPLATE_DATABASE_URL;
if (!template) throw new Error("Integration tests run through `npm test`, which prepares PostgreSQL and TEST_TEMPLATE_DATABASE_URL.");

const templateName = new URL(template).pathname.slice(1);
const name = `sw_it_${process.env.TEST_RUN_TAG ?? "local"}_${Math.random().toString(36).slice(2, 8)}`;
const admin = new URL(template);
admin.pathname = "/postgres";

async function adminQuery(sql: string) {
  const client = new pg.Client({ connectionString: admin.toString() });
  await client.connect();
  try {
    await client.query(sql);
  } finally {
    await client.end();
  }
}

await adminQuery(`create database "${name}" template "${templateName}"`);
const url = new URL(template);
url.pathname = `/${name}`;
process.env.DATABASE_URL = url.toString();

afterAll(async () => {
  const { closeDb } = await import("../../app/.server/db/client");
  const { stopOutboxWorker } = await import("../../app/.server/mail/outbox");
  await stopOutboxWorker();
  await closeDb();
  await adminQuery(`drop database if exists "${name}" with (force)`);
});
