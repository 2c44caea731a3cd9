#!/usr/bin/env node
// `npm start`: install what is missing, start PostgreSQL and the mail catcher,
// migrate, seed the demo, build and serve. `npm run dev` does the same with Vite's dev server.
import { spawn } from "node:child_process";
import { ensureBuild, ensureDatabase, ensureDependencies, localEnv, root, runNode, startMailCatcher } from "./local.mjs";

const dev = process.argv.includes("--dev");
ensureDependencies();
const postgres = await import("./postgres.mjs");
const env = await localEnv(dev ? { NODE_ENV: "development" } : {});
const children = [];

function stopAll(code) {
  for (const child of children) child?.kill("SIGTERM");
  setTimeout(() => process.exit(code), 500).unref();
}
process.once("SIGINT", () => stopAll(0));
process.once("SIGTERM", () => stopAll(0));

try {
  postgres.start();
  await ensureDatabase(env.DATABASE_URL);
  if (!process.env.SMTP_URL) children.push(await startMailCatcher(1025, 1080));
  await runNode(["scripts/migrate.ts"], env, "migration");
  if (env.SEED_DEMO !== "0") await runNode(["scripts/seed.ts"], env, "seeding");
  if (!dev) ensureBuild();
} catch (error) {
  console.error(`\nSinewright could not start: ${error.message}`);
  stopAll(1);
  await new Promise(() => {});
}

// The same server either way; with NODE_ENV=development it takes the app from Vite (hot reload).
const server = spawn(process.execPath, ["server.js"], { cwd: root, env: { ...process.env, ...env }, stdio: "inherit" });
children.push(server);
server.on("exit", (code) => stopAll(code ?? 0));
