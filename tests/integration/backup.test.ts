import { spawnSync } from "node:child_process";
import { mkdtempSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { drizzle } from "drizzle-orm/node-postgres";
import { asc, eq } from "drizzle-orm";
import pg from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as schema from "../../app/.server/db/schema";
import { checkIntegrity } from "../../app/.server/review";
import { seedDemo } from "../../app/.server/seed";
import { serverQueryOn } from "../support/server-db";

// This file's database gets the demo team (sheets, revisions, stamps); it is backed up
// with `npm run db:backup`'s script and restored into a fresh database with `db:restore`'s.
const root = path.resolve(import.meta.dirname, "../..");
const sourceUrl = process.env.DATABASE_URL!;
const restoredUrl = (() => {
  const url = new URL(sourceUrl);
  url.pathname = `${url.pathname}_restored`;
  return url.toString();
})();
const adminUrl = (() => {
  const url = new URL(sourceUrl);
  url.pathname = "/postgres";
  return url.toString();
})();
const restoredName = new URL(restoredUrl).pathname.slice(1);
const backupDir = mkdtempSync(path.join(tmpdir(), "sw-backup-"));

function runScript(script: string, args: string[], env: Record<string, string>) {
  const result = spawnSync(process.execPath, [path.join("scripts", script), ...args], { cwd: root, env: { ...process.env, ...env }, encoding: "utf8" });
  return { code: result.status, output: `${result.stdout}${result.stderr}` };
}

beforeAll(async () => {
  await seedDemo();
  await serverQueryOn(adminUrl, `create database "${restoredName}"`);
});
afterAll(async () => {
  await serverQueryOn(adminUrl, `drop database if exists "${restoredName}" with (force)`);
  rmSync(backupDir, { recursive: true, force: true });
});

/** Every row of the tables that carry the evidence, in a stable order. */
async function evidence(url: string) {
  const tables = ["calc_sheet", "sheet_revision", "revision_block", "stamp", "check_value", "review_comment", "audit_event", '"user"', "member", "account"];
  const out: Record<string, unknown[]> = {};
  for (const table of tables) out[table] = await serverQueryOn(url, `select * from ${table} order by id`);
  return out;
}

describe("backup and restore", () => {
  let backupFile = "";

  it("backs up to a dated custom-format file in BACKUP_DIR", () => {
    const { code, output } = runScript("db-backup.mjs", [], { DATABASE_URL: sourceUrl, BACKUP_DIR: backupDir });
    expect(code, output).toBe(0);
    const files = readdirSync(backupDir);
    expect(files).toEqual([expect.stringMatching(/^sinewright-.+-\d{8}T\d{6}Z\.dump$/)]);
    backupFile = path.join(backupDir, files[0]!);
    expect(output).toContain(backupFile);
    // pg_dump's custom format starts with the magic "PGDMP".
    expect(spawnSync("head", ["-c", "5", backupFile], { encoding: "utf8" }).stdout).toBe("PGDMP");
    expect(output).not.toContain(new URL(sourceUrl).password + "@");
  });

  it("restores into a fresh database with every sheet, revision, block, stamp and hash intact", async () => {
    const { code, output } = runScript("db-restore.mjs", [backupFile], { DATABASE_URL: restoredUrl });
    expect(code, output).toBe(0);
    expect(output).toMatch(/\d+ sheets, \d+ revisions, [1-9]\d* stamps/);

    const before = await evidence(sourceUrl);
    const after = await evidence(restoredUrl);
    expect(before.calc_sheet!.length).toBeGreaterThanOrEqual(11);
    expect(before.stamp!.length).toBeGreaterThan(0);
    expect(after).toEqual(before);
  });

  it("passes the integrity check on every stamped revision of the restored database", async () => {
    const pool = new pg.Pool({ connectionString: restoredUrl, max: 2 });
    try {
      const restored = drizzle(pool, { schema });
      const stamps = await restored.select().from(schema.stamp);
      expect(stamps.length).toBeGreaterThan(0);
      for (const stamp of stamps) {
        const [revision] = await restored.select().from(schema.sheetRevision).where(eq(schema.sheetRevision.id, stamp.revisionId));
        const rows = await restored.select().from(schema.revisionBlock).where(eq(schema.revisionBlock.revisionId, stamp.revisionId)).orderBy(asc(schema.revisionBlock.position));
        const report = await checkIntegrity(revision!, rows, stamp.contentHash);
        expect({ revision: revision!.id, hashMatches: report.hashMatches, stampValid: report.stampValid, drift: report.drift }).toEqual({
          revision: revision!.id,
          hashMatches: true,
          stampValid: true,
          drift: [],
        });
      }
    } finally {
      await pool.end();
    }
  });

  it("keeps the immutability of verified revisions after a restore", async () => {
    const [verified] = await serverQueryOn<{ id: string }>(restoredUrl, `select id from sheet_revision where state = 'verified' limit 1`);
    await expect(serverQueryOn(restoredUrl, `update sheet_revision set source = source || ' ' where id = $1`, [verified!.id])).rejects.toThrow();
  });

  it("refuses to restore over a database that holds tables, unless told --clean", async () => {
    await serverQueryOn(restoredUrl, `delete from review_comment`);
    const refused = runScript("db-restore.mjs", [backupFile], { DATABASE_URL: restoredUrl });
    expect(refused.code).not.toBe(0);
    expect(refused.output).toMatch(/already holds \d+ tables; nothing was changed/);
    expect(refused.output).toContain("--clean");

    const replaced = runScript("db-restore.mjs", [backupFile, "--clean"], { DATABASE_URL: restoredUrl });
    expect(replaced.code, replaced.output).toBe(0);
    expect(replaced.output).toContain("previous contents replaced");
    expect(await evidence(restoredUrl)).toEqual(await evidence(sourceUrl));
  });

  it("says what is wrong with a missing or unreadable backup file and changes nothing", async () => {
    const missing = runScript("db-restore.mjs", [path.join(backupDir, "nope.dump")], { DATABASE_URL: restoredUrl });
    expect(missing.code).not.toBe(0);
    expect(missing.output).toContain("nope.dump does not exist");

    const junk = path.join(backupDir, "junk.dump");
    writeFileSync(junk, "not a backup");
    const unreadable = runScript("db-restore.mjs", [junk, "--clean"], { DATABASE_URL: restoredUrl });
    expect(unreadable.code).not.toBe(0);
    expect(unreadable.output).toMatch(/pg_restore failed: .*input file/i);
    expect(await evidence(restoredUrl)).toEqual(await evidence(sourceUrl));
  });
});
