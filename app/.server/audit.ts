import { db, type Database } from "./db/client";
import { auditEvent } from "./db/schema";

export interface AuditEntry {
  teamId: string | null;
  actorId: string | null;
  action: string;
  subjectType: string;
  subjectId?: string | null;
  detail?: Record<string, unknown>;
}

/** Appends to the audit trail, inside the caller's transaction when given one. */
export async function recordAudit(entry: AuditEntry, tx: Pick<Database, "insert"> = db()): Promise<void> {
  await tx.insert(auditEvent).values({
    teamId: entry.teamId,
    actorId: entry.actorId,
    action: entry.action,
    subjectType: entry.subjectType,
    subjectId: entry.subjectId ?? null,
    detail: entry.detail ?? {},
  });
}
