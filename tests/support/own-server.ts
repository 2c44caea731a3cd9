import { runNode } from "../../scripts/local.mjs";
import { freePort, spawnServer, type SpawnedServer } from "./app-server";

/** Long enough to seed the demo team and start a server on a loaded machine; it only guards against a hang. */
export const SEEDED_SERVER_TIMEOUT_MS = 120_000;

/**
 * The built server (spawnServer) on this test file's own database (integration-db.ts), with
 * the suite's settings plus `env`, seeded with the demo team when `seed` is set: for tests
 * that need other settings (rate limits on) or a database no other test writes to.
 */
export async function startOwnServer(options: { env?: Record<string, string>; seed?: boolean } = {}): Promise<SpawnedServer> {
  const databaseUrl = process.env.DATABASE_URL!;
  if (options.seed) await runNode(["scripts/seed.ts"], { DATABASE_URL: databaseUrl, SEED_DEMO: "1", LOG_LEVEL: "warn" }, "seeding the test file's database");
  const port = String(await freePort());
  return spawnServer({ ...process.env, DATABASE_URL: databaseUrl, PORT: port, APP_URL: `http://127.0.0.1:${port}`, LOG_LEVEL: "warn", ...options.env });
}
