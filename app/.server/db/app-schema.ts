import { index, integer, jsonb, pgTable, text, timestamp, uniqueIndex } from "drizzle-orm/pg-core";
import { sql } from "drizzle-orm";
import { organization, user } from "./auth-schema";
import { createdAt, id } from "./columns";

/** Personal API keys: only a SHA-256 of the secret is stored; the secret is shown once. */
export const apiKey = pgTable(
  "api_key",
  {
    id: id(),
    userId: text("user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    /** A key acts for its owner in the one team it was made in. */
    teamId: text("team_id")
      .notNull()
      .references(() => organization.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    /** First characters of the key, shown in lists so members can tell keys apart. */
    prefix: text("prefix").notNull(),
    secretHash: text("secret_hash").notNull(),
    createdAt: createdAt(),
    lastUsedAt: timestamp("last_used_at", { withTimezone: true }),
    revokedAt: timestamp("revoked_at", { withTimezone: true }),
  },
  (t) => [uniqueIndex("api_key_secret_hash_idx").on(t.secretHash), index("api_key_user_idx").on(t.userId)],
);

/** Mail waiting to go out. Several app servers drain it at once, each taking rows with SKIP LOCKED. */
export const outbox = pgTable(
  "outbox",
  {
    id: id(),
    kind: text("kind").notNull(),
    payload: jsonb("payload").notNull(),
    attempts: integer("attempts").notNull().default(0),
    nextAttemptAt: timestamp("next_attempt_at", { withTimezone: true }).notNull().defaultNow(),
    lastError: text("last_error"),
    sentAt: timestamp("sent_at", { withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [index("outbox_due_idx").on(t.nextAttemptAt).where(sql`sent_at is null`)],
);

/** Append-only record of who did what; rows are never updated or deleted (enforced by a trigger). */
export const auditEvent = pgTable(
  "audit_event",
  {
    id: id(),
    teamId: text("team_id").references(() => organization.id, { onDelete: "cascade" }),
    actorId: text("actor_id").references(() => user.id, { onDelete: "set null" }),
    action: text("action").notNull(),
    subjectType: text("subject_type").notNull(),
    subjectId: text("subject_id"),
    detail: jsonb("detail").notNull().default({}),
    createdAt: createdAt(),
  },
  (t) => [index("audit_event_team_idx").on(t.teamId, t.createdAt), index("audit_event_subject_idx").on(t.subjectType, t.subjectId)],
);
