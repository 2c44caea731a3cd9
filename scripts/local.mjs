// Shared steps of `npm start`, `npm run dev` and `npm test`. Uses only Node's
// own modules until dependencies are installed, so it runs on a fresh clone.
import { execFileSync, spawn } from "node:child_process";
import { createHash, randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, readdirSync, statSync, writeFileSync } from "node:fs";
import net from "node:net";
import path from "node:path";
import { fileURLToPath } from "node:url";

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const stamp = path.join(root, "node_modules", ".sinewright-deps");

function fileHash(files) {
  const hash = createHash("sha256");
  for (const file of files) if (existsSync(file)) hash.update(readFileSync(file));
  return hash.digest("hex");
}

/** Installs dependencies when node_modules is missing or older than package-lock.json. */
export function ensureDependencies() {
  const wanted = fileHash([path.join(root, "package.json"), path.join(root, "package-lock.json")]);
  if (existsSync(stamp) && readFileSync(stamp, "utf8") === wanted) return;
  console.log("[setup] installing dependencies (npm ci)…");
  execFileSync("npm", ["ci", "--no-audit", "--no-fund"], { cwd: root, stdio: "inherit" });
  writeFileSync(stamp, wanted);
}

/** A per-checkout secret for local runs, kept in the git-ignored .data folder. */
function localSecret() {
  const file = path.join(root, ".data", "auth-secret");
  if (!existsSync(file)) {
    mkdirSync(path.dirname(file), { recursive: true });
    writeFileSync(file, randomBytes(32).toString("hex"), { mode: 0o600 });
  }
  return readFileSync(file, "utf8").trim();
}

/** Environment for local runs; anything already set in the environment wins. */
export async function localEnv(overrides = {}) {
  const { privateDatabaseUrl } = await import("./postgres.mjs");
  const port = process.env.PORT ?? "3000";
  return {
    NODE_ENV: "production",
    DATABASE_URL: privateDatabaseUrl(),
    APP_URL: `http://localhost:${port}`,
    BETTER_AUTH_SECRET: localSecret(),
    SMTP_URL: "smtp://127.0.0.1:1025",
    MAIL_CATCHER_URL: "http://127.0.0.1:1080",
    DEV_PAGES: "1",
    PORT: port,
    ...overrides,
    ...Object.fromEntries(
      ["DATABASE_URL", "APP_URL", "BETTER_AUTH_SECRET", "SMTP_URL", "MAIL_CATCHER_URL", "DEV_PAGES", "HOST", "PORT", "LOG_LEVEL", "SEED_DEMO", "TRUSTED_ORIGINS"]
        .filter((k) => process.env[k] !== undefined)
        .map((k) => [k, process.env[k]]),
    ),
  };
}

/** Creates the database named in `url` on its server when it does not exist yet. */
export async function ensureDatabase(url) {
  const { default: pg } = await import("pg");
  const target = new URL(url);
  const name = decodeURIComponent(target.pathname.slice(1));
  const admin = new URL(url);
  admin.pathname = "/postgres";
  const client = new pg.Client({ connectionString: admin.toString() });
  await client.connect();
  try {
    const found = await client.query("select 1 from pg_database where datname = $1", [name]);
    if (found.rowCount === 0) await client.query(`create database "${name.replaceAll('"', '""')}"`);
  } finally {
    await client.end();
  }
}

export async function dropDatabase(url) {
  const { default: pg } = await import("pg");
  const name = decodeURIComponent(new URL(url).pathname.slice(1));
  const admin = new URL(url);
  admin.pathname = "/postgres";
  const client = new pg.Client({ connectionString: admin.toString() });
  await client.connect();
  try {
    await client.query(`drop database if exists "${name.replaceAll('"', '""')}" with (force)`);
  } finally {
    await client.end();
  }
}

export function freePort() {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.unref();
    server.on("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const { port } = server.address();
      server.close(() => resolve(port));
    });
  });
}

export function portOpen(port, host = "127.0.0.1") {
  return new Promise((resolve) => {
    const socket = net.connect(port, host);
    socket.once("connect", () => {
      socket.destroy();
      resolve(true);
    });
    socket.once("error", () => resolve(false));
  });
}

export async function waitFor(check, what, timeoutMs = 30_000) {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (await check()) return;
    await new Promise((r) => setTimeout(r, 150));
  }
  throw new Error(`timed out waiting for ${what}`);
}

/** Runs a TypeScript or JS script with tsx and the given environment; rejects on non-zero exit. */
export function runNode(args, env, label) {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ["--import", "tsx", ...args], { cwd: root, env: { ...process.env, ...env }, stdio: "inherit" });
    child.on("exit", (code) => (code === 0 ? resolve() : reject(new Error(`${label} failed (exit ${code})`))));
  });
}

/** Starts the mail catcher as a child process; resolves when it answers. */
export async function startMailCatcher(smtpPort, httpPort) {
  if (await portOpen(smtpPort)) {
    console.log(`[mail-catcher] something already listens on ${smtpPort}; using it`);
    return undefined;
  }
  const child = spawn(process.execPath, [path.join(root, "scripts", "mail-catcher.mjs")], {
    cwd: root,
    env: { ...process.env, MAIL_CATCHER_SMTP_PORT: String(smtpPort), MAIL_CATCHER_HTTP_PORT: String(httpPort) },
    stdio: "inherit",
  });
  await waitFor(() => portOpen(httpPort), "the mail catcher");
  return child;
}

/** The fake S3 service (scripts/fake-s3.mjs) on `port`, keeping its objects in `directory`. */
export async function startFakeS3(port, directory, bucket) {
  const child = spawn(process.execPath, [path.join(root, "scripts", "fake-s3.mjs")], {
    cwd: root,
    env: { ...process.env, FAKE_S3_PORT: String(port), FAKE_S3_DIR: directory, FAKE_S3_BUCKET: bucket },
    stdio: "inherit",
  });
  await waitFor(() => portOpen(port), "the fake S3 service");
  return child;
}

function newestMtime(dir) {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) newest = Math.max(newest, newestMtime(full));
    else newest = Math.max(newest, statSync(full).mtimeMs);
  }
  return newest;
}

/** Builds the app unless build/ is newer than every source it is made from. */
export function ensureBuild() {
  const marker = path.join(root, "build", "server", "index.js");
  const sources = ["app", "public", "content"].map((d) => path.join(root, d)).filter(existsSync);
  const configs = ["package-lock.json", "vite.config.ts", "scripts/vite-plugins.ts", "react-router.config.ts", "tsconfig.json"].map((f) => path.join(root, f));
  const newestSource = Math.max(...sources.map(newestMtime), ...configs.filter(existsSync).map((f) => statSync(f).mtimeMs));
  if (existsSync(marker) && statSync(marker).mtimeMs > newestSource) return;
  console.log("[build] building the app…");
  execFileSync("npx", ["react-router", "build"], { cwd: root, stdio: "inherit" });
}
