#!/usr/bin/env node
// `npm run db:backup`: pg_dump in PostgreSQL's custom format (-Fc) of DATABASE_URL's database
// (the private server's when unset) to a dated file in BACKUP_DIR (default backups/, git-ignored).
// Restore with `npm run db:restore -- FILE`.
import { mkdirSync, statSync } from "node:fs";
import path from "node:path";
import { fail, pgToolEnv, prepareTarget } from "./db-tools.mjs";
import { root } from "./local.mjs";

try {
  const target = await prepareTarget();
  const folder = path.resolve(root, process.env.BACKUP_DIR ?? "backups");
  mkdirSync(folder, { recursive: true });
  const stamp = new Date().toISOString().replace(/[-:]/g, "").replace(/\.\d+Z$/, "Z");
  const file = path.join(folder, `sinewright-${target.database}-${stamp}.dump`);
  target.run("pg_dump", ["--format=custom", "--compress=6", `--file=${file}`, `--dbname=${target.database}`], pgToolEnv(target.url));
  const megabytes = (statSync(file).size / 1_048_576).toFixed(2);
  const shown = path.relative(process.cwd(), file).startsWith("..") ? file : path.relative(process.cwd(), file);
  console.log(`[backup] ${target.summary} backed up to ${shown} (${megabytes} MB)`);
  console.log(`[backup] restore with: npm run db:restore -- ${shown}`);
} catch (error) {
  fail("backup", error);
}
