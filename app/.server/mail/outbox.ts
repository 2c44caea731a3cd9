import { and, asc, eq, isNull, lte, sql } from "drizzle-orm";
import nodemailer, { type Transporter } from "nodemailer";
import { config } from "../config";
import { db, type Database } from "../db/client";
import { outbox } from "../db/schema";
import { SEARCH_OUTBOX_KIND } from "../search/indexer";
import { deliverSearchCopy } from "../search/sync";

export interface MailMessage {
  to: string;
  subject: string;
  text: string;
}

/** Backoff after the nth failed attempt: 5 s, 10 s, 20 s … capped at 10 minutes. */
export function retryDelayMs(attempts: number): number {
  return Math.min(5_000 * 2 ** Math.max(0, attempts - 1), 10 * 60_000);
}

/**
 * Queues a message. It goes into the same database as the change that caused it
 * (pass the transaction), so a mail outage or a crash loses nothing.
 */
export async function enqueueMail(message: MailMessage, tx: Pick<Database, "insert"> = db()): Promise<void> {
  await tx.insert(outbox).values({ kind: "mail", payload: message });
  kickOutbox();
}

let transporter: Transporter | undefined;
function mailTransport(): Transporter {
  transporter ??= nodemailer.createTransport(config().SMTP_URL, { from: config().MAIL_FROM });
  return transporter;
}

/**
 * Sends what is due. Each row is taken under FOR UPDATE SKIP LOCKED inside its own
 * transaction, so any number of app servers can run this at once and a message
 * is sent by exactly one of them.
 */
export async function drainOutbox(limit = 20): Promise<{ sent: number; failed: number }> {
  let sent = 0;
  let failed = 0;
  for (let i = 0; i < limit; i++) {
    const outcome = await db().transaction(async (tx) => {
      const [row] = await tx
        .select()
        .from(outbox)
        .where(and(isNull(outbox.sentAt), lte(outbox.nextAttemptAt, sql`now()`)))
        .orderBy(asc(outbox.nextAttemptAt))
        .limit(1)
        .for("update", { skipLocked: true });
      if (!row) return "empty" as const;
      try {
        // Search: the outbox also carries copies of search documents to Meilisearch.
        if (row.kind === SEARCH_OUTBOX_KIND) await deliverSearchCopy(tx, row.payload as { id: string });
        else {
          const message = row.payload as MailMessage;
          await mailTransport().sendMail({ to: message.to, subject: message.subject, text: message.text });
        }
        await tx.update(outbox).set({ sentAt: new Date(), attempts: row.attempts + 1, lastError: null }).where(eq(outbox.id, row.id));
        return "sent" as const;
      } catch (error) {
        const attempts = row.attempts + 1;
        await tx
          .update(outbox)
          .set({ attempts, lastError: String(error).slice(0, 500), nextAttemptAt: new Date(Date.now() + retryDelayMs(attempts)) })
          .where(eq(outbox.id, row.id));
        return "failed" as const;
      }
    });
    if (outcome === "empty") break;
    if (outcome === "sent") sent++;
    else failed++;
  }
  return { sent, failed };
}

let timer: NodeJS.Timeout | undefined;
let running = false;
let kickPending = false;

async function runOnce(): Promise<void> {
  if (running) {
    kickPending = true;
    return;
  }
  running = true;
  try {
    do {
      kickPending = false;
      await drainOutbox();
    } while (kickPending);
  } catch {
    // Database unreachable: the next tick tries again; nothing is lost.
  } finally {
    running = false;
  }
}

/** Asks the worker in this process to look at the outbox now rather than at its next tick. */
export function kickOutbox(): void {
  if (timer) setImmediate(() => void runOnce());
}

export function startOutboxWorker(intervalMs = 2_000): void {
  if (timer) return;
  timer = setInterval(() => void runOnce(), intervalMs);
  timer.unref();
  void runOnce();
}

export async function stopOutboxWorker(): Promise<void> {
  if (timer) clearInterval(timer);
  timer = undefined;
  while (running) await new Promise((resolve) => setTimeout(resolve, 20));
  transporter?.close();
  transporter = undefined;
}
