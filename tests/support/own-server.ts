import { spawn, type ChildProcess } from "node:child_process";
import { freePort, root, runNode, waitFor } from "../../scripts/local.mjs";

export interface OwnServer {
  url: string;
  stop(): Promise<void>;
}

/**
 * A second app server (the built server.js) on a free port, for tests that need settings
 * the shared test server does not have (rate limits on, a TLS proxy) or a database of
 * their own. It uses this test file's database (integration-db.ts), seeded with the
 * demo team when `seed` is set.
 */
export async function startOwnServer(options: { env?: Record<string, string>; seed?: boolean } = {}): Promise<OwnServer> {
  const databaseUrl = process.env.DATABASE_URL!;
  if (options.seed) await runNode(["scripts/seed.ts"], { DATABASE_URL: databaseUrl, SEED_DEMO: "1", LOG_LEVEL: "warn" }, "seeding the test file's database");
  const port = await freePort();
  const url = `http://localhost:${port}`;
  const child: ChildProcess = spawn(process.execPath, ["server.js"], {
    cwd: root,
    env: { ...process.env, DATABASE_URL: databaseUrl, PORT: String(port), APP_URL: url, LOG_LEVEL: "warn", ...options.env },
    stdio: ["ignore", "inherit", "inherit"],
  });
  const exited = new Promise<void>((resolve) => child.once("exit", () => resolve()));
  await waitFor(async () => {
    try {
      return (await fetch(`${url}/healthz`)).ok;
    } catch {
      return false;
    }
  }, "the test file's own app server", 60_000);
  return {
    url,
    async stop() {
      child.kill("SIGTERM");
      await exited;
    },
  };
}
