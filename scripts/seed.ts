// `npm run db:seed`: the invented demo team, on an empty database only.
import { closeDb } from "../app/.server/db/client";
import { stopOutboxWorker } from "../app/.server/mail/outbox";
import { seedDemo } from "../app/.server/seed";

const { seeded, demo } = await seedDemo();
console.log(seeded ? "[seed] demo team created:" : "[seed] database already has users; demo accounts (if seeded earlier):");
for (const m of demo.members) console.log(`         ${m.role.padEnd(9)} ${m.email.padEnd(22)} password: ${demo.password}`);
console.log("         (demo-only accounts: change or remove them before real use)");
await stopOutboxWorker();
await closeDb();
