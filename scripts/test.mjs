#!/usr/bin/env node
// `npm test`: the same preparation as `npm start`, then the whole suite —
// unit, integration (real PostgreSQL, one database per test file) and browser
// tests (Debian's Chromium driven by playwright-core) against the built server.
// Everything it starts, it stops; a fresh set of databases each run.
import { execFileSync, spawn } from "node:child_process";
import { existsSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { dropDatabase, ensureBuild, ensureDatabase, ensureDependencies, freePort, localEnv, root, runNode, startFakeS3, startMailCatcher, waitFor } from "./local.mjs";

ensureDependencies();
ensureChromium();
const postgres = await import("./postgres.mjs");

const wasRunning = !process.env.DATABASE_URL && postgres.status().running;
const runTag = `${Date.now().toString(36)}_${process.pid}`;
const children = [];
const databases = [];
const scratch = mkdtempSync(path.join(tmpdir(), "sinewright-test-"));
let exitCode = 1;

try {
  postgres.start();
  const base = await localEnv();
  const dbUrl = (name) => {
    const url = new URL(base.DATABASE_URL);
    url.pathname = `/${name}`;
    return url.toString();
  };
  const smtpPort = await freePort();
  const catcherPort = await freePort();
  children.push(await startMailCatcher(smtpPort, catcherPort));
  // Attachments: the test server stores them through the S3 API, in a fake S3 service.
  const s3Port = await freePort();
  children.push(await startFakeS3(s3Port, path.join(scratch, "s3"), "sinewright-test"));
  const appPort = await freePort();
  const appUrl = `http://localhost:${appPort}`;

  // The template every integration test file copies its own database from.
  const templateUrl = dbUrl(`sw_template_${runTag}`);
  const serverDbUrl = dbUrl(`sw_server_${runTag}`);
  for (const url of [templateUrl, serverDbUrl]) {
    await ensureDatabase(url);
    databases.push(url);
  }
  const testEnv = {
    ...base,
    NODE_ENV: "production",
    APP_URL: appUrl,
    PORT: String(appPort),
    SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
    MAIL_CATCHER_URL: `http://127.0.0.1:${catcherPort}`,
    RATE_LIMITS: "off",
    LOG_LEVEL: process.env.LOG_LEVEL ?? "warn",
    SEED_DEMO: "1",
    S3_ENDPOINT: `http://127.0.0.1:${s3Port}`,
    S3_BUCKET: "sinewright-test",
    S3_ACCESS_KEY_ID: "S3RVER",
    S3_SECRET_ACCESS_KEY: "S3RVER",
    S3_REGION: "us-east-1",
    // Local-folder store for the contract suite's second implementation.
    STORAGE_DIR: path.join(scratch, "local-store"),
  };
  await runNode(["scripts/migrate.ts"], { ...testEnv, DATABASE_URL: templateUrl }, "migrating the test template");
  await runNode(["scripts/migrate.ts"], { ...testEnv, DATABASE_URL: serverDbUrl }, "migrating the test server's database");
  await runNode(["scripts/seed.ts"], { ...testEnv, DATABASE_URL: serverDbUrl }, "seeding the test server's database");

  ensureBuild();
  const server = spawn(process.execPath, ["server.js"], { cwd: root, env: { ...process.env, ...testEnv, DATABASE_URL: serverDbUrl }, stdio: "inherit" });
  children.push(server);
  await waitFor(async () => {
    try {
      return (await fetch(`${appUrl}/healthz`)).ok;
    } catch {
      return false;
    }
  }, "the app server");

  const vitestArgs = process.argv.slice(2);
  exitCode = await new Promise((resolve) => {
    const vitest = spawn("npx", ["vitest", "run", ...vitestArgs], {
      cwd: root,
      stdio: "inherit",
      env: {
        ...process.env,
        ...testEnv,
        DATABASE_URL: serverDbUrl,
        TEST_TEMPLATE_DATABASE_URL: templateUrl,
        TEST_SERVER_DATABASE_URL: serverDbUrl,
        TEST_RUN_TAG: runTag,
        SINEWRIGHT_TEST_URL: appUrl,
      },
    });
    vitest.on("exit", (code) => resolve(code ?? 1));
  });
} catch (error) {
  console.error(`\nThe test run could not be prepared: ${error.message}`);
  exitCode = 1;
} finally {
  for (const child of children) child?.kill("SIGTERM");
  await new Promise((r) => setTimeout(r, 500));
  for (const url of databases) await dropDatabase(url).catch(() => {});
  rmSync(scratch, { recursive: true, force: true });
  await dropLeftoverTestDatabases().catch(() => {});
  if (!wasRunning) postgres.stop();
}
process.exit(exitCode);

/** Per-file databases made by the integration tests of this run. */
async function dropLeftoverTestDatabases() {
  if (process.env.DATABASE_URL) return;
  const { default: pg } = await import("pg");
  const base = await localEnv();
  const admin = new URL(base.DATABASE_URL);
  admin.pathname = "/postgres";
  const client = new pg.Client({ connectionString: admin.toString() });
  await client.connect();
  try {
    const { rows } = await client.query("select datname from pg_database where datname like $1", [`sw_%${runTag}%`]);
    for (const row of rows) await client.query(`drop database if exists "${row.datname}" with (force)`);
  } finally {
    await client.end();
  }
}

function ensureChromium() {
  if (existsSync("/usr/bin/chromium")) return;
  if (process.getuid?.() !== 0) {
    console.error("Browser tests need Debian's chromium: sudo apt-get install chromium");
    process.exit(1);
  }
  console.log("[setup] installing Debian's chromium for the browser tests…");
  execFileSync("apt-get", ["update"], { stdio: "inherit" });
  execFileSync("apt-get", ["install", "-y", "--no-install-recommends", "chromium", "fonts-dejavu-core"], {
    stdio: "inherit",
    env: { ...process.env, DEBIAN_FRONTEND: "noninteractive" },
  });
}
