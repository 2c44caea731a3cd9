// `npm run db:migrate`: applies the committed migrations to DATABASE_URL.
import { migrateDatabase } from "../app/.server/db/migrate";

const url = process.env.DATABASE_URL;
if (!url) {
  console.error("DATABASE_URL is not set (npm run db:migrate sets it for the private server).");
  process.exit(1);
}
await migrateDatabase(url);
console.log("[migrate] database is up to date");
