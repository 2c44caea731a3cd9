#!/usr/bin/env node
// `npm run db:restore -- FILE [--clean]`: pg_restore of a custom-format backup into
// DATABASE_URL's database (the private server's when unset). Refuses a database that
// already holds tables unless told `--clean` (or `--force`): then its contents are replaced.
import { existsSync } from "node:fs";
import path from "node:path";
import { fail, pgToolEnv, prepareTarget } from "./db-tools.mjs";

const args = process.argv.slice(2);
const replace = args.includes("--clean") || args.includes("--force");
const files = args.filter((a) => !a.startsWith("--"));

try {
  if (files.length !== 1) throw new Error("give one backup file: npm run db:restore -- backups/sinewright-….dump [--clean]");
  const file = path.resolve(files[0]);
  if (!existsSync(file)) throw new Error(`${files[0]} does not exist`);
  const target = await prepareTarget();
  const tables = await target.tableCount();
  if (tables > 0 && !replace) {
    throw new Error(
      `the database "${target.database}" already holds ${tables} tables; nothing was changed. ` +
        "Restore into an empty database (create one and point DATABASE_URL at it), or add --clean to replace its contents.",
    );
  }
  // The backup's own object list: a file that is not a custom-format dump fails here, before anything is touched.
  target.run("pg_restore", ["--list", file], pgToolEnv(target.url), { quiet: true });
  const options = ["--no-owner", "--no-privileges", "--exit-on-error", "--single-transaction", `--dbname=${target.database}`];
  if (tables > 0) options.push("--clean", "--if-exists");
  target.run("pg_restore", [...options, file], pgToolEnv(target.url));
  console.log(`[restore] ${path.basename(file)} restored into ${target.summary}${tables > 0 ? " (previous contents replaced)" : ""}`);
  console.log(`[restore] ${await target.contentSummary()}`);
} catch (error) {
  fail("restore", error);
}
