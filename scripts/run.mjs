#!/usr/bin/env node
// Runs one command with the local environment and the private PostgreSQL started:
// `node scripts/run.mjs tsx scripts/migrate.ts` (used by npm run db:*).
import { spawn } from "node:child_process";
import { ensureDatabase, ensureDependencies, localEnv, root } from "./local.mjs";

ensureDependencies();
const postgres = await import("./postgres.mjs");
const env = await localEnv();
postgres.start();
await ensureDatabase(env.DATABASE_URL);
const [command, ...args] = process.argv.slice(2);
const child = spawn("npx", [command, ...args], { cwd: root, env: { ...process.env, ...env }, stdio: "inherit" });
child.on("exit", (code) => process.exit(code ?? 1));
