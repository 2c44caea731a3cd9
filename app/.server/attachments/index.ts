/**
 * Attachments of calc sheets: upload (streamed, sniffed, size-limited, analysed when a
 * capture), listing, download, and the captures a sheet's measured blocks read.
 *
 * Nothing is half-stored: the bytes go to the object store only once the whole upload
 * has passed every check, the row is written after them, and a failed row write
 * removes the object again. The temporary file is always removed.
 */
import { mkdtemp, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import type { Readable } from "node:stream";
import { and, asc, eq, inArray } from "drizzle-orm";
import { numberedFileName, safeFileName, type AttachmentSummary } from "~/lib/attachments/files";
import type { CaptureAnalysis } from "~/lib/waveform/analyse";
import type { StoredCapture } from "~/lib/waveform/measurement";
import type { Member } from "../access";
import { recordAudit } from "../audit";
import { config } from "../config";
import { db, type Database } from "../db/client";
import { attachment, revisionAttachment, user } from "../db/schema";
import { objectStore } from "../storage";
import { AttachmentError, ingestUpload, limitMessage, type IngestProgress } from "./ingest";

export { AttachmentError, type IngestProgress } from "./ingest";

export function attachmentLimitBytes(): number {
  return Math.round(config().ATTACHMENT_MAX_MB * 1e6);
}

/** Where a team's attachment bytes live in the store. */
export function storageKeyFor(teamId: string, attachmentId: string): string {
  return `teams/${teamId}/attachments/${attachmentId}`;
}


const UNIQUE_VIOLATION = "23505";
const NAME_ATTEMPTS = 50;

/**
 * Stores one upload on a sheet. `declaredLength` (Content-Length) lets a too-large file be
 * refused before a byte is read; without it, reading stops at the limit.
 */
export async function uploadAttachment(
  me: Member,
  sheet: { id: string; teamId: string },
  input: { fileName: string; body: AsyncIterable<Uint8Array>; declaredLength?: number | undefined; onProgress?: (progress: IngestProgress) => void },
): Promise<AttachmentSummary> {
  const maxBytes = attachmentLimitBytes();
  if (input.declaredLength !== undefined && input.declaredLength > maxBytes) throw new AttachmentError(limitMessage(maxBytes), 413);
  const folder = await mkdtemp(path.join(tmpdir(), "sinewright-upload-"));
  const id = crypto.randomUUID();
  const storageKey = storageKeyFor(sheet.teamId, id);
  let stored = false;
  try {
    const tempPath = path.join(folder, "upload");
    const ingested = await ingestUpload(input.body, { maxBytes, tempPath, onProgress: input.onProgress });
    const baseName = safeFileName(input.fileName, ingested.type);
    input.onProgress?.({ phase: "storing", bytes: ingested.size, rows: ingested.analysis?.sampleCount ?? 0 });
    await objectStore().put(storageKey, tempPath, ingested.size, ingested.type.contentType);
    stored = true;
    const row = await insertWithFreeName(baseName, (fileName) => ({
      id,
      teamId: sheet.teamId,
      sheetId: sheet.id,
      uploaderId: me.user.id,
      fileName,
      contentType: ingested.type.contentType,
      size: ingested.size,
      sha256: ingested.sha256,
      storageKey,
      analysis: ingested.analysis,
    }));
    await recordAudit({
      teamId: sheet.teamId,
      actorId: me.user.id,
      action: "attachment.uploaded",
      subjectType: "sheet",
      subjectId: sheet.id,
      detail: { fileName: row.fileName, size: row.size, sha256: row.sha256, contentType: row.contentType },
    });
    return summarise({ ...row, uploaderName: me.user.name });
  } catch (error) {
    if (stored) await objectStore().delete(storageKey).catch(() => {});
    throw error;
  } finally {
    await rm(folder, { recursive: true, force: true });
  }
}

async function insertWithFreeName(baseName: string, values: (fileName: string) => typeof attachment.$inferInsert) {
  for (let n = 1; n <= NAME_ATTEMPTS; n++) {
    const fileName = n === 1 ? baseName : numberedFileName(baseName, n);
    try {
      const [row] = await db().insert(attachment).values(values(fileName)).returning();
      return row!;
    } catch (error) {
      if (pgCode(error) !== UNIQUE_VIOLATION) throw error;
    }
  }
  throw new AttachmentError(`This sheet already has ${NAME_ATTEMPTS} files called "${baseName}". Rename the file before attaching it.`, 409);
}

function pgCode(error: unknown): string | undefined {
  const seen = new Set<unknown>();
  let current: unknown = error;
  while (current && typeof current === "object" && !seen.has(current)) {
    seen.add(current);
    const code = (current as { code?: unknown }).code;
    if (typeof code === "string") return code;
    current = (current as { cause?: unknown }).cause;
  }
  return undefined;
}

type AttachmentRow = typeof attachment.$inferSelect & { uploaderName: string | null };

function summarise(row: AttachmentRow): AttachmentSummary {
  const analysis = row.analysis as CaptureAnalysis | null;
  return {
    id: row.id,
    fileName: row.fileName,
    contentType: row.contentType,
    kind: row.contentType === "application/pdf" ? "pdf" : row.contentType.startsWith("image/") ? "image" : "capture",
    size: row.size,
    sha256: row.sha256,
    createdAt: row.createdAt.toISOString(),
    uploaderName: row.uploaderName,
    channels: (analysis?.channels ?? []).map((c) => ({ name: c.channel, unit: c.unit, fundamentalFrequency: c.fundamentalFrequency, fundamentalRms: c.fundamentalRms, thd: c.thd })),
  };
}

async function attachmentRows(sheetId: string) {
  return db()
    .select({ attachment, uploaderName: user.name })
    .from(attachment)
    .leftJoin(user, eq(user.id, attachment.uploaderId))
    .where(eq(attachment.sheetId, sheetId))
    .orderBy(asc(attachment.createdAt), asc(attachment.fileName));
}

export async function listAttachments(sheetId: string): Promise<AttachmentSummary[]> {
  const rows = await attachmentRows(sheetId);
  return rows.map((r) => summarise({ ...r.attachment, uploaderName: r.uploaderName }));
}

/** The sheet's analysed captures by file name, as the pipeline reads them. */
export async function capturesForSheet(sheetId: string): Promise<Record<string, StoredCapture>> {
  const rows = await db()
    .select({ id: attachment.id, fileName: attachment.fileName, sha256: attachment.sha256, analysis: attachment.analysis })
    .from(attachment)
    .where(eq(attachment.sheetId, sheetId));
  const captures: Record<string, StoredCapture> = {};
  for (const row of rows) {
    if (row.analysis) captures[row.fileName] = { attachmentId: row.id, fileName: row.fileName, sha256: row.sha256, analysis: row.analysis as CaptureAnalysis };
  }
  return captures;
}

/** Records which attachments a revision measured (inside the save's transaction). */
export async function linkRevisionAttachments(tx: Pick<Database, "insert" | "select">, revisionId: string, sheetId: string, attachmentIds: string[]) {
  if (attachmentIds.length === 0) return;
  const rows = await tx
    .select({ id: attachment.id, sha256: attachment.sha256 })
    .from(attachment)
    .where(and(eq(attachment.sheetId, sheetId), inArray(attachment.id, attachmentIds)));
  if (rows.length > 0) await tx.insert(revisionAttachment).values(rows.map((r) => ({ revisionId, attachmentId: r.id, sha256: r.sha256 })));
}

/** One attachment of one sheet of the team, with its bytes as a stream; undefined when any of that does not hold. */
export async function openAttachment(teamId: string, sheetId: string, attachmentId: string): Promise<{ row: typeof attachment.$inferSelect; body: Readable; size: number } | undefined> {
  if (!/^[0-9a-f-]{36}$/i.test(attachmentId)) return undefined;
  const [row] = await db()
    .select()
    .from(attachment)
    .where(and(eq(attachment.id, attachmentId), eq(attachment.sheetId, sheetId), eq(attachment.teamId, teamId)))
    .limit(1);
  if (!row) return undefined;
  const { body, size } = await objectStore().get(row.storageKey);
  return { row, body, size };
}

/** Content-Disposition for a download: an ASCII fallback and the UTF-8 name (RFC 6266, RFC 5987). */
export function contentDisposition(fileName: string): string {
  const fallback = fileName.replace(/[^\x20-\x7e]/g, "_").replace(/["\\]/g, "_");
  return `attachment; filename="${fallback}"; filename*=UTF-8''${encodeURIComponent(fileName)}`;
}
