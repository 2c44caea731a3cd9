import { afterAll, describe, expect, it } from "vitest";
import { privateSmtp } from "../support/smtp";

// This file's server modules send to a private SMTP port that starts closed: the mail server is down.
const smtp = await privateSmtp();
process.env.SMTP_URL = smtp.url;

const { db } = await import("../../app/.server/db/client");
const { member, organization, outbox, sheetRevision } = await import("../../app/.server/db/schema");
const { auth } = await import("../../app/.server/auth");
const { createSheet, saveRevision } = await import("../../app/.server/sheets");
const { stampRevision, submitForCheck } = await import("../../app/.server/review");
const { drainOutbox } = await import("../../app/.server/mail/outbox");
const { eq, isNull } = await import("drizzle-orm");
type Member = import("../../app/.server/access").Member;

const received = smtp.received;
afterAll(() => smtp.stop());

async function person(email: string, name: string) {
  const created = await auth().api.signUpEmail({ body: { email, password: "long-enough-password", name } });
  return { id: created.user.id, name, email };
}

describe("check mail during a mail-server outage", () => {
  it("stamps while SMTP is down and delivers the verification mail once it is back", async () => {
    const author = await person("author@outage.example", "Ana Author");
    const checker = await person("checker@outage.example", "Cai Checker");
    const teamId = crypto.randomUUID();
    await db().insert(organization).values({ id: teamId, name: "Outage team", slug: `outage-${teamId.slice(0, 6)}`, createdAt: new Date() });
    await db().insert(member).values([
      { id: crypto.randomUUID(), organizationId: teamId, userId: author.id, role: "engineer", createdAt: new Date() },
      { id: crypto.randomUUID(), organizationId: teamId, userId: checker.id, role: "checker", createdAt: new Date() },
    ]);
    const as = (u: { id: string; name: string; email: string }, role: "engineer" | "checker"): Member => {
      const team = { teamId, teamName: "Outage team", teamSlug: "outage", role };
      return { user: u, team, teams: [team], via: "session" };
    };

    const sheet = await createSheet(as(author, "engineer"), { title: "Outage sheet", projectId: null, tags: [] });
    const saved = await saveRevision(as(author, "engineer"), sheet, { source: `<DcLink id="dc1" p="1 kW" vdc="200 V" f="50 Hz" rippleVpp="5 V" />`, baseRevisionId: null, note: "" });
    if (!saved.ok) throw new Error(JSON.stringify(saved));
    await submitForCheck(as(author, "engineer"), saved.revisionId, checker.id);
    await stampRevision(as(checker, "checker"), saved.revisionId);
    const [revision] = await db().select({ state: sheetRevision.state }).from(sheetRevision).where(eq(sheetRevision.id, saved.revisionId));
    expect(revision!.state).toBe("verified");

    // SMTP is down: nothing goes out, nothing is lost.
    expect(await drainOutbox()).toMatchObject({ sent: 0 });
    const pending = await db().select().from(outbox).where(isNull(outbox.sentAt));
    expect(pending.map((p) => (p.payload as { subject: string }).subject)).toEqual(expect.arrayContaining([expect.stringMatching(/^Check requested/), expect.stringMatching(/^Verified: CS-0001 rev A/)]));

    await smtp.start();
    await db().update(outbox).set({ nextAttemptAt: new Date() });
    await drainOutbox();
    expect(received).toEqual(expect.arrayContaining([{ to: author.email, subject: "Verified: CS-0001 rev A" }]));
  });
});
