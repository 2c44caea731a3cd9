import { bigint, boolean, customType, doublePrecision, index, integer, jsonb, pgTable, primaryKey, text, timestamp, uniqueIndex } from "drizzle-orm/pg-core";
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

/** A product or job of the team: its sheets and documents live under it. */
export const project = pgTable(
  "project",
  {
    id: id(),
    teamId: text("team_id")
      .notNull()
      .references(() => organization.id, { onDelete: "cascade" }),
    /** Short code the team uses for the job, e.g. "PUMP-3K"; unique in the team. */
    code: text("code").notNull(),
    name: text("name").notNull(),
    client: text("client").notNull().default(""),
    description: text("description").notNull().default(""),
    createdBy: text("created_by").references(() => user.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("project_team_code_idx").on(t.teamId, t.code)],
);

/** A calc sheet: one design calculation, numbered per team (CS-0001), in a project or in the team library. */
export const calcSheet = pgTable(
  "calc_sheet",
  {
    id: id(),
    teamId: text("team_id")
      .notNull()
      .references(() => organization.id, { onDelete: "cascade" }),
    number: integer("number").notNull(),
    title: text("title").notNull(),
    /** Null: the sheet lives in the team library rather than a project. */
    projectId: text("project_id").references(() => project.id, { onDelete: "set null" }),
    tags: text("tags").array().notNull().default(sql`'{}'::text[]`),
    latestRevisionId: text("latest_revision_id"),
    /** Lineage: the revision this sheet was reused from (it still needs its own check). */
    derivedFromRevisionId: text("derived_from_revision_id"),
    createdBy: text("created_by").references(() => user.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("calc_sheet_team_number_idx").on(t.teamId, t.number), index("calc_sheet_project_idx").on(t.projectId)],
);

/**
 * One saved revision of a sheet (A, B, C …). Its content — source, results, engine
 * version and hash — never changes once written (a trigger enforces it).
 */
export const sheetRevision = pgTable(
  "sheet_revision",
  {
    id: id(),
    sheetId: text("sheet_id")
      .notNull()
      .references(() => calcSheet.id, { onDelete: "restrict" }),
    teamId: text("team_id")
      .notNull()
      .references(() => organization.id, { onDelete: "cascade" }),
    sequence: integer("sequence").notNull(),
    label: text("label").notNull(),
    source: text("source").notNull(),
    /** The checked render tree (data, never code): the per-revision render cache. */
    renderTree: jsonb("render_tree").notNull(),
    engineVersion: text("engine_version").notNull(),
    /** SHA-256 of the canonical serialization of source, inputs, results and engine version. */
    contentHash: text("content_hash").notNull(),
    /** What changed, in the author's words. */
    note: text("note").notNull().default(""),
    state: text("state").notNull().default("draft"),
    authorId: text("author_id").references(() => user.id, { onDelete: "set null" }),
    /** Measured-waveform outcomes by block id (analysis summary and comparison; part of the hash); null when none. */
    measurements: jsonb("measurements"),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("sheet_revision_sheet_sequence_idx").on(t.sheetId, t.sequence), index("sheet_revision_team_idx").on(t.teamId)],
);

/** Rows that belong to one revision of one sheet of one team (blocks, checks, comments, stamps). */
const revisionScope = () => ({
  revisionId: text("revision_id")
    .notNull()
    .references(() => sheetRevision.id, { onDelete: "restrict" }),
  sheetId: text("sheet_id").notNull(),
  teamId: text("team_id").notNull(),
});

/** Each block of each revision as a row, so SQL can ask e.g. for every lc-filter with f0 between 1 and 3 kHz. */
export const revisionBlock = pgTable(
  "revision_block",
  {
    id: id(),
    ...revisionScope(),
    blockId: text("block_id").notNull(),
    calculator: text("calculator").notNull(),
    position: integer("position").notNull(),
    /** Inputs as the author typed them. */
    inputs: jsonb("inputs").notNull(),
    /** Inputs in SI units after parsing (absent when the block failed). */
    parsedInputs: jsonb("parsed_inputs"),
    /** Server-computed results (absent when the block failed). */
    results: jsonb("results"),
    ok: boolean("ok").notNull(),
    errors: jsonb("errors").notNull().default([]),
    warnings: jsonb("warnings").notNull().default([]),
  },
  (t) => [
    uniqueIndex("revision_block_revision_block_idx").on(t.revisionId, t.blockId),
    index("revision_block_team_calculator_idx").on(t.teamId, t.calculator),
  ],
);

/** The autosaved working copy of a sheet, one per author and sheet, with the revision it was started from. */
export const sheetDraft = pgTable(
  "sheet_draft",
  {
    id: id(),
    sheetId: text("sheet_id")
      .notNull()
      .references(() => calcSheet.id, { onDelete: "cascade" }),
    authorId: text("author_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    source: text("source").notNull(),
    baseRevisionId: text("base_revision_id"),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("sheet_draft_sheet_author_idx").on(t.sheetId, t.authorId)],
);

/** Who a revision was sent to for checking, and when; one row per submission. */
export const checkRequest = pgTable(
  "check_request",
  {
    id: id(),
    ...revisionScope(),
    requestedBy: text("requested_by").references(() => user.id, { onDelete: "set null" }),
    checkerId: text("checker_id").references(() => user.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    /** "open" until the checker verifies or returns the revision. */
    outcome: text("outcome").notNull().default("open"),
    closedAt: timestamp("closed_at", { withTimezone: true }),
  },
  (t) => [index("check_request_checker_idx").on(t.checkerId, t.outcome), index("check_request_revision_idx").on(t.revisionId)],
);

/** Review comments on a revision, anchored to a block or a paragraph, threaded by parentId. */
export const reviewComment = pgTable(
  "review_comment",
  {
    id: id(),
    ...revisionScope(),
    /** "block:qs1", "paragraph:3" or "sheet". */
    anchor: text("anchor").notNull(),
    parentId: text("parent_id"),
    authorId: text("author_id").references(() => user.id, { onDelete: "set null" }),
    body: text("body").notNull(),
    resolvedAt: timestamp("resolved_at", { withTimezone: true }),
    resolvedBy: text("resolved_by").references(() => user.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [index("review_comment_revision_idx").on(t.revisionId, t.createdAt), index("review_comment_sheet_idx").on(t.sheetId)],
);

/** A checker's independent re-run of one block with their own inputs, and whether it agrees. */
export const checkValue = pgTable(
  "check_value",
  {
    id: id(),
    revisionId: text("revision_id")
      .notNull()
      .references(() => sheetRevision.id, { onDelete: "restrict" }),
    teamId: text("team_id").notNull(),
    blockId: text("block_id").notNull(),
    checkerId: text("checker_id").references(() => user.id, { onDelete: "set null" }),
    inputs: jsonb("inputs").notNull(),
    results: jsonb("results"),
    /** Relative tolerance the checker accepted, e.g. 0.01 for 1 %. */
    tolerance: doublePrecision("tolerance").notNull(),
    agrees: boolean("agrees").notNull(),
    /** Per output: the author's value, the checker's, and the relative difference. */
    comparison: jsonb("comparison").notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("check_value_revision_idx").on(t.revisionId)],
);

/** The verification stamp: bound to the revision's content hash and engine version. One per revision. */
export const stamp = pgTable(
  "stamp",
  {
    id: id(),
    ...revisionScope(),
    checkerId: text("checker_id").references(() => user.id, { onDelete: "set null" }),
    contentHash: text("content_hash").notNull(),
    engineVersion: text("engine_version").notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("stamp_revision_idx").on(t.revisionId)],
);

/** The in-app list of things that happened to a member's work. */
export const notification = pgTable(
  "notification",
  {
    id: id(),
    userId: text("user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    teamId: text("team_id").notNull(),
    kind: text("kind").notNull(),
    message: text("message").notNull(),
    link: text("link").notNull(),
    readAt: timestamp("read_at", { withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [index("notification_user_idx").on(t.userId, t.createdAt)],
);

/** A project document (design report, review pack, certification file): MDX that cites calc-sheet revisions. */
export const projectDocument = pgTable(
  "project_document",
  {
    id: id(),
    teamId: text("team_id")
      .notNull()
      .references(() => organization.id, { onDelete: "cascade" }),
    /** Per team: PD-0001 … */
    number: integer("number").notNull(),
    projectId: text("project_id")
      .notNull()
      .references(() => project.id, { onDelete: "restrict" }),
    title: text("title").notNull(),
    latestVersionId: text("latest_version_id"),
    createdBy: text("created_by").references(() => user.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("project_document_team_number_idx").on(t.teamId, t.number), index("project_document_project_idx").on(t.projectId)],
);

/** One saved version of a document (1, 2, 3 …): its text never changes once written. */
export const documentVersion = pgTable(
  "document_version",
  {
    id: id(),
    documentId: text("document_id")
      .notNull()
      .references(() => projectDocument.id, { onDelete: "restrict" }),
    teamId: text("team_id").notNull(),
    sequence: integer("sequence").notNull(),
    source: text("source").notNull(),
    renderTree: jsonb("render_tree").notNull(),
    note: text("note").notNull().default(""),
    authorId: text("author_id").references(() => user.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("document_version_document_sequence_idx").on(t.documentId, t.sequence)],
);

/**
 * Each citation of each document version as a row, so a project can list its stale
 * citations and a sheet its citing documents without parsing every document.
 */
export const documentCitation = pgTable(
  "document_citation",
  {
    id: id(),
    versionId: text("version_id")
      .notNull()
      .references(() => documentVersion.id, { onDelete: "restrict" }),
    documentId: text("document_id").notNull(),
    teamId: text("team_id").notNull(),
    /** Order of first appearance: reference [1], [2] … */
    position: integer("position").notNull(),
    /** As written: "CS-0003" and "B". */
    sheet: text("sheet").notNull(),
    rev: text("rev").notNull(),
    /** The sheet's number, when the text names one in this team's numbering. */
    sheetNumber: integer("sheet_number"),
  },
  (t) => [uniqueIndex("document_citation_version_ref_idx").on(t.versionId, t.sheet, t.rev), index("document_citation_team_sheet_idx").on(t.teamId, t.sheetNumber)],
);

/** The autosaved working copy of a document, one per author and document. */
export const documentDraft = pgTable(
  "document_draft",
  {
    id: id(),
    documentId: text("document_id")
      .notNull()
      .references(() => projectDocument.id, { onDelete: "cascade" }),
    authorId: text("author_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    source: text("source").notNull(),
    baseVersionId: text("base_version_id"),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("document_draft_document_author_idx").on(t.documentId, t.authorId)],
);

const tsvector = customType<{ data: string }>({ dataType: () => "tsvector" });

/**
 * What search finds: one row per sheet (its latest revision) and, later, per project
 * document (`kind`). The app writes the text columns in the same transaction as the
 * change; the weighted tsvector follows from them (title A; tags, project and
 * calculators B; prose C; block values D). Search always filters by team_id.
 */
export const searchDocument = pgTable(
  "search_document",
  {
    /** The sheet's (or document's) own id, so a hit and a Meilisearch document point at it directly. */
    id: text("id").primaryKey(),
    /** "sheet" or "document". */
    kind: text("kind").notNull(),
    teamId: text("team_id")
      .notNull()
      .references(() => organization.id, { onDelete: "cascade" }),
    sheetId: text("sheet_id").references(() => calcSheet.id, { onDelete: "cascade" }),
    /** The sheet's (or document's) number in the team, e.g. 7 for CS-0007. */
    number: integer("number").notNull(),
    title: text("title").notNull(),
    projectId: text("project_id"),
    projectCode: text("project_code"),
    tags: text("tags").array().notNull().default(sql`'{}'::text[]`),
    calculators: text("calculators").array().notNull().default(sql`'{}'::text[]`),
    /** People who wrote any revision, for the author filter. */
    authorIds: text("author_ids").array().notNull().default(sql`'{}'::text[]`),
    revisionId: text("revision_id"),
    revisionLabel: text("revision_label"),
    /** The latest revision's review state ("draft", "submitted", "returned", "verified"), or "unsaved". */
    state: text("state").notNull(),
    /** Tags, project code and name, calculator ids and titles, as one text. */
    keywords: text("keywords").notNull(),
    /** The prose of the latest revision as plain text. */
    body: text("body").notNull(),
    /** Each block's inputs and results, as typed and in normalised spellings ("20 kHz", "20khz", "20000 Hz"). */
    blockValues: text("block_values").notNull(),
    search: tsvector("search")
      .notNull()
      .generatedAlwaysAs(
        sql`setweight(to_tsvector('sinewright'::regconfig, title), 'A') || setweight(to_tsvector('sinewright'::regconfig, keywords), 'B') || setweight(to_tsvector('sinewright'::regconfig, sinewright_words_once(body)), 'C') || setweight(to_tsvector('sinewright'::regconfig, block_values), 'D')`,
      ),
    /**
     * Title and keywords alone, weighted as in `search`: the few places a word makes a sheet
     * rank high. A query of common words is ranked within the sheets holding all its words
     * here first (app/.server/search/postgres.ts), a far shorter list than every match.
     */
    /** The SEARCH_TEXT_VERSION the row was written with; servers rebuild older rows at start. */
    textVersion: integer("text_version").notNull().default(1),
    searchHead: tsvector("search_head")
      .notNull()
      .generatedAlwaysAs(sql`setweight(to_tsvector('sinewright'::regconfig, title), 'A') || setweight(to_tsvector('sinewright'::regconfig, keywords), 'B')`),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull(),
  },
  (t) => [
    index("search_document_search_idx").using("gin", t.search),
    index("search_document_team_updated_idx").on(t.teamId, t.updatedAt),
    uniqueIndex("search_document_sheet_idx").on(t.sheetId),
  ],
);

/**
 * A file attached to a sheet: datasheet (PDF), picture or scope capture (CSV). The
 * bytes are in the object store under `storageKey`; a capture's analysis (summary,
 * never the samples) is kept here. Attachments are never changed: a new upload is a
 * new row, so a revision that measured one keeps pointing at the same bytes.
 */
export const attachment = pgTable(
  "attachment",
  {
    id: id(),
    teamId: text("team_id")
      .notNull()
      .references(() => organization.id, { onDelete: "cascade" }),
    sheetId: text("sheet_id")
      .notNull()
      .references(() => calcSheet.id, { onDelete: "restrict" }),
    uploaderId: text("uploader_id").references(() => user.id, { onDelete: "set null" }),
    /** Safe name, unique on the sheet; measured blocks name the file by it. */
    fileName: text("file_name").notNull(),
    /** From the bytes, not the name: application/pdf, image/png, image/jpeg, image/gif, image/webp, text/csv. */
    contentType: text("content_type").notNull(),
    size: bigint("size", { mode: "number" }).notNull(),
    sha256: text("sha256").notNull(),
    storageKey: text("storage_key").notNull(),
    /** CaptureAnalysis of a CSV capture; null for other files. */
    analysis: jsonb("analysis"),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("attachment_sheet_file_name_idx").on(t.sheetId, t.fileName), index("attachment_team_idx").on(t.teamId)],
);

/** The attachments a revision measured, by id and hash: such an attachment cannot be deleted. */
export const revisionAttachment = pgTable(
  "revision_attachment",
  {
    revisionId: text("revision_id")
      .notNull()
      .references(() => sheetRevision.id, { onDelete: "restrict" }),
    attachmentId: text("attachment_id")
      .notNull()
      .references(() => attachment.id, { onDelete: "restrict" }),
    sha256: text("sha256").notNull(),
  },
  (t) => [primaryKey({ columns: [t.revisionId, t.attachmentId] }), index("revision_attachment_attachment_idx").on(t.attachmentId)],
);

/**
 * API request counters, one row per API key or client, shared by every app server.
 * A fixed window: the row holds the current window's start and its count, both
 * moved forward by one atomic upsert per request (`app/.server/rate-limit.ts`).
 */
export const apiRateLimit = pgTable(
  "api_rate_limit",
  {
    key: text("key").primaryKey(),
    windowStart: timestamp("window_start", { withTimezone: true }).notNull(),
    count: integer("count").notNull(),
  },
  (t) => [index("api_rate_limit_window_idx").on(t.windowStart)],
);
