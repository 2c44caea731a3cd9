import { describe, expect, it } from "vitest";
import { eq, sql } from "drizzle-orm";
import { db } from "../../app/.server/db/client";
import { auditEvent } from "../../app/.server/db/schema";
import { recordAudit } from "../../app/.server/audit";

describe("audit trail", () => {
  it("is append-only in the database itself: UPDATE and DELETE are refused", async () => {
    await recordAudit({ teamId: null, actorId: null, action: "test.event", subjectType: "test", subjectId: "1", detail: { n: 1 } });
    const [row] = await db().select().from(auditEvent).where(eq(auditEvent.action, "test.event"));
    expect(row).toBeTruthy();
    const refusal = (query: Promise<unknown>) => query.then(() => "accepted", (error: Error & { cause?: Error }) => String(error.cause?.message ?? error.message));
    expect(await refusal(db().execute(sql`update audit_event set action = 'forged' where id = ${row!.id}`))).toMatch(/append-only: UPDATE refused/);
    expect(await refusal(db().execute(sql`delete from audit_event where id = ${row!.id}`))).toMatch(/append-only: DELETE refused/);
    const [after] = await db().select().from(auditEvent).where(eq(auditEvent.id, row!.id));
    expect(after!.action).toBe("test.event");
  });
});
