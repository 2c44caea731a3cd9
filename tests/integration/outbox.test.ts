import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { SMTPServer } from "smtp-server";
import { simpleParser } from "mailparser";
import { isNull, sql } from "drizzle-orm";
import net from "node:net";

// This file's server modules send to a private SMTP port we open and close at will.
const port = await new Promise<number>((resolve) => {
  const probe = net.createServer().listen(0, "127.0.0.1", () => {
    const { port } = probe.address() as net.AddressInfo;
    probe.close(() => resolve(port));
  });
});
process.env.SMTP_URL = `smtp://127.0.0.1:${port}`;

const { db } = await import("../../app/.server/db/client");
const { outbox } = await import("../../app/.server/db/schema");
const { drainOutbox, enqueueMail, retryDelayMs } = await import("../../app/.server/mail/outbox");

const received: { to: string; subject: string }[] = [];
let server: SMTPServer | undefined;

function startSmtp(): Promise<void> {
  server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    logger: false,
    onData(stream, session, callback) {
      simpleParser(stream).then((mail) => {
        received.push({ to: session.envelope.rcptTo[0]!.address, subject: mail.subject ?? "" });
        callback();
      }, callback);
    },
  });
  return new Promise((resolve) => server!.listen(port, "127.0.0.1", () => resolve()));
}
function stopSmtp(): Promise<void> {
  return new Promise((resolve) => (server ? server.close(() => resolve()) : resolve()));
}

beforeAll(async () => {
  await db().delete(outbox);
});
afterAll(stopSmtp);

describe("mail outbox", () => {
  it("keeps mail through an SMTP outage and delivers it once the server is back", async () => {
    await enqueueMail({ to: "outage@example.org", subject: "Check requested", text: "A sheet waits for you." });
    const down = await drainOutbox();
    expect(down).toEqual({ sent: 0, failed: 1 });
    const [row] = await db().select().from(outbox);
    expect(row!.attempts).toBe(1);
    expect(row!.sentAt).toBeNull();
    expect(row!.lastError).toBeTruthy();
    expect(row!.nextAttemptAt.getTime()).toBeGreaterThan(Date.now());

    await startSmtp();
    // Not due yet: the backoff holds it.
    expect(await drainOutbox()).toEqual({ sent: 0, failed: 0 });
    await db().update(outbox).set({ nextAttemptAt: sql`now()` });
    expect(await drainOutbox()).toEqual({ sent: 1, failed: 0 });
    expect(received.filter((m) => m.to === "outage@example.org")).toHaveLength(1);
  });

  it("sends each message exactly once when several workers drain at the same time", async () => {
    const before = received.length;
    for (let i = 0; i < 12; i++) await enqueueMail({ to: `crowd${i}@example.org`, subject: `Message ${i}`, text: "x" });
    const results = await Promise.all([drainOutbox(), drainOutbox(), drainOutbox()]);
    const sent = results.reduce((sum, r) => sum + r.sent, 0);
    expect(sent).toBe(12);
    expect(received.length - before).toBe(12);
    expect(new Set(received.slice(before).map((m) => m.to)).size).toBe(12);
    expect(await db().select().from(outbox).where(isNull(outbox.sentAt))).toHaveLength(0);
  });

  it("backs off exponentially, capped at ten minutes", () => {
    expect(retryDelayMs(1)).toBe(5_000);
    expect(retryDelayMs(2)).toBe(10_000);
    expect(retryDelayMs(3)).toBe(20_000);
    expect(retryDelayMs(20)).toBe(600_000);
  });
});
