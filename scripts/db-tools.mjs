// Shared by db-backup.mjs and db-restore.mjs: the target database and PostgreSQL's own client tools.
import { spawnSync } from "node:child_process";
import { ensureDependencies, localEnv } from "./local.mjs";

/** libpq reads the password from the environment, so it never appears on a command line or in `ps`. */
export function pgToolEnv(url) {
  const parsed = new URL(url);
  return {
    ...process.env,
    PGHOST: parsed.hostname.replace(/^\[|\]$/g, ""),
    PGPORT: parsed.port || "5432",
    PGUSER: decodeURIComponent(parsed.username),
    PGPASSWORD: decodeURIComponent(parsed.password),
    PGSSLMODE: parsed.searchParams.get("sslmode") ?? process.env.PGSSLMODE ?? "prefer",
  };
}

/** DATABASE_URL, or the private server's database (started if needed); connected once to learn its version. */
export async function prepareTarget() {
  ensureDependencies();
  let url = process.env.DATABASE_URL;
  if (!url) {
    const postgres = await import("./postgres.mjs");
    postgres.start();
    url = (await localEnv()).DATABASE_URL;
  }
  if (!/^postgres(ql)?:\/\//.test(url) || !URL.canParse(url)) throw new Error("DATABASE_URL must be a postgres:// URL");
  const parsed = new URL(url);
  const database = decodeURIComponent(parsed.pathname.slice(1));
  const { default: pg } = await import("pg");
  const query = async (text) => {
    const client = new pg.Client({ connectionString: url });
    await client.connect();
    try {
      return (await client.query(text)).rows;
    } finally {
      await client.end();
    }
  };
  const [{ server_version_num: versionNum }] = await query("show server_version_num");
  const { clientTool } = await import("./postgres.mjs");
  const summary = `database "${database}" on ${parsed.hostname}:${parsed.port || 5432}`;
  return {
    url,
    database,
    summary,
    run(tool, args, env, { quiet = false } = {}) {
      const result = spawnSync(clientTool(tool, versionNum), args, { env, encoding: "utf8", stdio: ["ignore", quiet ? "ignore" : "inherit", "pipe"] });
      if (result.status !== 0) throw new Error(`${tool} failed: ${result.stderr.trim() || `exit ${result.status}`}`);
    },
    async tableCount() {
      const [row] = await query("select count(*)::int as n from pg_tables where schemaname not in ('pg_catalog', 'information_schema')");
      return row.n;
    },
    async contentSummary() {
      const [row] = await query(
        "select (select count(*) from calc_sheet)::int as sheets, (select count(*) from sheet_revision)::int as revisions, (select count(*) from stamp)::int as stamps, (select count(*) from \"user\")::int as users",
      ).catch(() => [undefined]);
      return row ? `${row.sheets} sheets, ${row.revisions} revisions, ${row.stamps} stamps, ${row.users} accounts` : "restored (not a Sinewright database?)";
    },
  };
}

export function fail(label, error) {
  console.error(`[${label}] ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
}
