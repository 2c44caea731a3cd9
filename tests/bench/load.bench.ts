/**
 * Load benchmark: autocannon against the built server on loopback, one route at a
 * time — the bare health route, a verified sheet page for a signed-in viewer, the
 * search API and the evaluate API (both with a personal API key). Prints requests/s,
 * p50, p99 and errors for each beside the targets. Prints figures; asserts nothing.
 *
 * Beside them, the server's CPU time per request, read from /proc: the figure to compare
 * before and after a change on a machine that other work shares.
 *
 * Targets: the sheet page reaches at least half the health route's requests/s; every
 * route's p99 ≤ 100 ms; zero errors (connection errors, timeouts and non-2xx answers).
 *
 * Run: npm run bench:load (starts the private PostgreSQL if needed; the scratch
 * database sw_bench_load_* is seeded with the demo team, then dropped). The server runs
 * with RATE_LIMITS=off: this measures throughput, not the limiter.
 * CONNECTIONS=50 and DURATION=30 (seconds) by default; ONLY=sheet,health runs only those routes; PROFILE=1 writes a V8 CPU profile of the
 * server to .cache/profiles/ (open it in Chromium's DevTools).
 */
import autocannon from "autocannon";
import { spawn, type ChildProcess } from "node:child_process";
import { randomBytes, randomUUID } from "node:crypto";
import { mkdirSync, readFileSync } from "node:fs";
import { availableParallelism, loadavg } from "node:os";
import path from "node:path";
import pg from "pg";
import { hashApiKey } from "../../app/.server/api-keys";
// @ts-expect-error -- plain ES module scripts without types
import { dropDatabase, ensureBuild, ensureDatabase, freePort, localEnv, root, runNode, waitFor } from "../../scripts/local.mjs";
// @ts-expect-error -- a plain ES module script without types
import { privateDatabaseUrl, start as startPostgres, status as postgresStatus, stop as stopPostgres } from "../../scripts/postgres.mjs";

const CONNECTIONS = Number(process.env.CONNECTIONS ?? 50);
const SECONDS = Number(process.env.DURATION ?? 30);
const PROFILE = process.env.PROFILE === "1";
const VIEWER = "viewer@example.com";
const DEMO_PASSWORD = "sinewright-demo";
const SHEET = process.env.PAGE ?? "/sheets/CS-0001";

interface Target {
  name: string;
  path: string;
  method?: "GET" | "POST";
  headers: Record<string, string>;
  body?: string;
}

interface Figures {
  name: string;
  /** Server CPU time (user + system) per completed request: unlike requests/s, barely moved by other load on the machine. */
  cpuMsPerRequest: number;
  requestsPerSecond: number;
  p50: number;
  p99: number;
  errors: number;
  requests: number;
}

const hadPostgres = !process.env.DATABASE_URL && postgresStatus().running;
const databaseUrl = process.env.DATABASE_URL ? undefined : privateDatabaseUrl(`sw_bench_load_${Date.now().toString(36)}`);
let server: ChildProcess | undefined;

try {
  if (!databaseUrl) throw new Error("bench:load seeds a scratch database on the private PostgreSQL; unset DATABASE_URL.");
  startPostgres();
  await ensureDatabase(databaseUrl);
  const port = await freePort();
  const appUrl = `http://127.0.0.1:${port}`;
  const env = {
    ...(await localEnv()),
    DATABASE_URL: databaseUrl,
    APP_URL: appUrl,
    HOST: "127.0.0.1",
    PORT: String(port),
    // Mail is not part of this measurement: a closed port, the outbox keeps it.
    SMTP_URL: `smtp://127.0.0.1:${await freePort()}`,
    RATE_LIMITS: "off",
    LOG_LEVEL: "warn",
    DEV_PAGES: "0",
  };
  await runNode(["scripts/migrate.ts"], env, "migrating the bench database");
  await runNode(["scripts/seed.ts"], env, "seeding the bench database");
  ensureBuild();

  const profileDir = path.join(root, ".cache", "profiles");
  if (PROFILE) mkdirSync(profileDir, { recursive: true });
  server = spawn(process.execPath, [...(PROFILE ? ["--cpu-prof", `--cpu-prof-dir=${profileDir}`] : []), "server.js"], {
    cwd: root,
    env: { ...process.env, ...env },
    stdio: ["ignore", "inherit", "inherit"],
  });
  await waitFor(async () => (await fetch(`${appUrl}/healthz`).catch(() => undefined))?.ok ?? false, "the app server", 60_000);

  const cookie = await signIn(appUrl);
  const apiKey = await makeApiKey(databaseUrl);
  const targets: Target[] = [
    { name: "health /healthz", path: "/healthz", headers: {} },
    // What a browser sends: every browser asks for compressed pages. The health route is asked
    // as a load balancer asks (nothing compressed), so it runs at its fastest.
    { name: `sheet page ${SHEET}`, path: SHEET, headers: { cookie, "accept-encoding": "gzip, deflate, br" } },
    { name: "search API", path: "/api/v1/search?q=filter", headers: { authorization: `Bearer ${apiKey}` } },
    {
      name: "evaluate API",
      path: "/api/v1/evaluate",
      method: "POST",
      headers: { authorization: `Bearer ${apiKey}`, "content-type": "application/json" },
      body: JSON.stringify({
        blocks: [
          { id: "qs1", calculator: "quasi-square", inputs: { vdc: "48 V", alpha: "30 deg" } },
          { id: "f1", calculator: "lc-filter", inputs: { l: "1 mH", c: "10 uF", rLoad: "10 ohm", fsw: "20 kHz", vout: "=qs1.v1Rms" } },
        ],
      }),
    },
  ];

  console.log(`\nbench:load — ${CONNECTIONS} connections for ${SECONDS} s per route against ${appUrl} (loopback), RATE_LIMITS=off (throughput, not the limiter)${PROFILE ? ", CPU profile on" : ""}\n`);
  const figures: Figures[] = [];
  const firstViewMs = new Map<string, number>();
  // ONLY=sheet,health runs just the routes whose names contain one of those words (for profiling one route).
  const only = process.env.ONLY?.split(",").map((w) => w.trim()).filter(Boolean);
  for (const target of targets.filter((t) => !only || only.some((w) => t.name.includes(w)))) {
    // The first request is the first view this server has of it (for the sheet: of the revision).
    const started = performance.now();
    const check = await fetch(appUrl + target.path, { method: target.method ?? "GET", headers: target.headers, body: target.body });
    await check.arrayBuffer();
    firstViewMs.set(target.name, performance.now() - started);
    if (!check.ok) throw new Error(`${target.name} answered ${check.status} before the run; fix that first`);
    await run(appUrl, target, Math.min(3, SECONDS)); // warm-up: JIT, pool, caches
    figures.push(await run(appUrl, target, SECONDS));
  }
  report(figures, firstViewMs);
} catch (error) {
  console.error(`bench:load failed: ${error instanceof Error ? error.message : String(error)}`);
  process.exitCode = 1;
} finally {
  if (server && server.exitCode === null) {
    const exited = new Promise((resolve) => server!.once("exit", resolve));
    server.kill("SIGTERM");
    await exited;
    if (PROFILE) console.log(`CPU profile written to ${path.join(root, ".cache", "profiles")}`);
  }
  if (databaseUrl) await dropDatabase(databaseUrl).catch(() => {});
  if (!hadPostgres && !process.env.DATABASE_URL) stopPostgres();
}

/** CPU time the server process has used so far, in ms (Linux /proc; clock ticks are 1/100 s). */
function serverCpuMs(): number {
  if (!server?.pid) return NaN;
  try {
    const fields = readFileSync(`/proc/${server.pid}/stat`, "utf8").split(") ")[1]!.split(" ");
    return (Number(fields[11]) + Number(fields[12])) * 10;
  } catch {
    return NaN;
  }
}

async function run(appUrl: string, target: Target, seconds: number): Promise<Figures> {
  const cpuBefore = serverCpuMs();
  const result = await autocannon({
    url: appUrl + target.path,
    method: target.method ?? "GET",
    headers: target.headers,
    body: target.body,
    connections: CONNECTIONS,
    duration: seconds,
    timeout: 10,
  });
  return {
    name: target.name,
    cpuMsPerRequest: (serverCpuMs() - cpuBefore) / Math.max(1, result.requests.total),
    requestsPerSecond: result.requests.average,
    p50: result.latency.p50,
    p99: result.latency.p99,
    errors: result.errors + result.timeouts + result.non2xx,
    requests: result.requests.total,
  };
}

function report(figures: Figures[], firstViewMs: Map<string, number>) {
  const health = figures.find((f) => f.name.startsWith("health"));
  const row = (cells: string[]) => console.log(cells.map((c, i) => (i === 0 ? c.padEnd(28) : c.padStart(12))).join(" "));
  row(["route", "requests/s", "p50 ms", "p99 ms", "errors", "requests", "CPU ms/req", "first ms"]);
  for (const f of figures) row([f.name, f.requestsPerSecond.toFixed(0), String(f.p50), String(f.p99), String(f.errors), String(f.requests), f.cpuMsPerRequest.toFixed(1), (firstViewMs.get(f.name) ?? NaN).toFixed(0)]);
  console.log(`\n(CPU ms/req: the server's own CPU time per completed request; first ms: the first request's wall time on a fresh server; the machine's load average was ${loadavg()[0]!.toFixed(1)} on ${availableParallelism()} cores)`);
  const mark = (ok: boolean) => (ok ? "met" : "NOT met");
  console.log("\ntargets (ratios to the health route in this run):");
  for (const f of figures.filter((f) => f !== health)) {
    const isPage = f.name.startsWith("sheet page");
    const lines: string[] = [];
    if (health) {
      lines.push(`requests/s ${f.requestsPerSecond.toFixed(0)} ≥ 50 % of health ${(health.requestsPerSecond / 2).toFixed(0)} — ${mark(f.requestsPerSecond >= health.requestsPerSecond / 2)}`);
      if (isPage) lines.push(`p99 ${f.p99} ms ≤ 2 × health p99 ${2 * health.p99} ms — ${mark(f.requests > 0 && f.p99 <= 2 * health.p99)}`);
    }
    lines.push(`errors ${f.errors} = 0 — ${mark(f.errors === 0)}`);
    const cpuTarget = isPage ? 10 : 2.5;
    lines.push(`CPU ${f.cpuMsPerRequest.toFixed(1)} ms/req ≤ ${cpuTarget} ms — ${mark(f.cpuMsPerRequest <= cpuTarget)}`);
    if (isPage) lines.push(`first view ${(firstViewMs.get(f.name) ?? NaN).toFixed(0)} ms ≤ 150 ms — ${mark((firstViewMs.get(f.name) ?? Infinity) <= 150)}`);
    console.log(`  ${f.name}:\n    ${lines.join("\n    ")}`);
  }
}

async function signIn(appUrl: string): Promise<string> {
  const response = await fetch(`${appUrl}/api/auth/sign-in/email`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: appUrl },
    body: JSON.stringify({ email: VIEWER, password: DEMO_PASSWORD }),
  });
  if (!response.ok) throw new Error(`signing in as ${VIEWER} answered ${response.status}`);
  return response.headers
    .getSetCookie()
    .map((line) => line.split(";")[0])
    .join("; ");
}

/** A personal API key for the demo viewer in the demo team, made the way the Settings page makes one. */
async function makeApiKey(url: string): Promise<string> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    const { rows } = await client.query<{ user_id: string; team_id: string }>(
      `select m.user_id, m.organization_id as team_id from member m join "user" u on u.id = m.user_id where u.email = $1 limit 1`,
      [VIEWER],
    );
    if (!rows[0]) throw new Error(`the demo viewer ${VIEWER} was not seeded`);
    const secret = `swk_${randomBytes(24).toString("base64url")}`;
    await client.query(`insert into api_key (id, user_id, team_id, name, prefix, secret_hash) values ($1, $2, $3, 'bench:load', $4, $5)`, [
      randomUUID(),
      rows[0].user_id,
      rows[0].team_id,
      secret.slice(0, 10),
      hashApiKey(secret),
    ]);
    return secret;
  } finally {
    await client.end();
  }
}
