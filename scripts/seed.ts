// `npm run db:seed`: the invented demo team, its projects and calc sheets, on an empty database only.
import { closeDb } from "../app/.server/db/client";
import { stopOutboxWorker } from "../app/.server/mail/outbox";
import { seedDemo } from "../app/.server/seed";

try {
  const started = performance.now();
  const { seeded, demo, content } = await seedDemo();
  console.log(seeded ? "[seed] demo team created:" : "[seed] database already has users; demo accounts (if seeded earlier):");
  for (const m of demo.members) console.log(`         ${m.role.padEnd(9)} ${m.email.padEnd(22)} password: ${demo.password}`);
  console.log("         (demo-only accounts: change or remove them before real use)");
  if (content) {
    const seconds = ((performance.now() - started) / 1000).toFixed(1);
    console.log(`[seed] ${content.projects} projects, ${content.sheets} calc sheets, ${content.revisions} revisions, ${content.documents} project documents (${seconds} s)`);
  }
} catch (error) {
  console.error(error instanceof Error ? error.message : error);
  process.exitCode = 1;
} finally {
  await stopOutboxWorker();
  await closeDb();
}
