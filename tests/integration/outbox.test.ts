import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { isNull, sql } from "drizzle-orm";
import { privateSmtp } from "../support/smtp";

// This file's server modules send to a private SMTP port we open and close at will.
const smtp = await privateSmtp();
process.env.SMTP_URL = smtp.url;

const { db } = await import("../../app/.server/db/client");
const { outbox } = await import("../../app/.server/db/schema");
const { drainOutbox, enqueueMail, retryDelayMs } = await import("../../app/.server/mail/outbox");

const received = smtp.received;

beforeAll(async () => {
  await db().delete(outbox);
});
afterAll(() => smtp.stop());

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

    await smtp.start();
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
