/**
 * Reads one upload as it arrives, in a single pass: counts the bytes (and stops at
 * the limit), hashes them (SHA-256), sniffs the type from the first bytes, writes
 * them to a temporary file for the object store, and — for a CSV capture — decodes
 * and parses it row by row, then analyses it. Nothing is kept in memory but the
 * capture's numbers. Used by uploads and by `npm run bench:waveform` alike.
 */
import { createHash } from "node:crypto";
import { open } from "node:fs/promises";
import { ACCEPTED_FILES_SENTENCE, formatBytes, SNIFF_BYTES, sniffType, type SniffedType } from "~/lib/attachments/files";
import { analyseCapture, type CaptureAnalysis } from "~/lib/waveform/analyse";
import { CaptureError, CaptureReader } from "~/lib/waveform/capture-csv";

export class AttachmentError extends Error {
  constructor(
    message: string,
    readonly status: 400 | 404 | 409 | 413 | 415 = 400,
  ) {
    super(message);
    this.name = "AttachmentError";
  }
}

export interface IngestProgress {
  phase: "receiving" | "analysing" | "storing";
  bytes: number;
  rows: number;
}

export interface IngestedFile {
  type: SniffedType;
  size: number;
  sha256: string;
  analysis: CaptureAnalysis | null;
}

const PROGRESS_EVERY_BYTES = 1_000_000;

export function limitMessage(maxBytes: number): string {
  return `The file is over the ${formatBytes(maxBytes)} limit for attachments. Attach a shorter capture (fewer samples or channels) or a smaller file.`;
}

export async function ingestUpload(
  body: AsyncIterable<Uint8Array>,
  options: { maxBytes: number; tempPath: string; onProgress?: (progress: IngestProgress) => void },
): Promise<IngestedFile> {
  const file = await open(options.tempPath, "w");
  const hash = createHash("sha256");
  let size = 0;
  let head = new Uint8Array(0);
  let type: SniffedType | undefined;
  let decoder: TextDecoder | undefined;
  let reader: CaptureReader | undefined;
  let nextProgress = PROGRESS_EVERY_BYTES;
  const progress = (phase: IngestProgress["phase"]) => options.onProgress?.({ phase, bytes: size, rows: reader?.rowsRead ?? 0 });

  const decide = (bytes: Uint8Array) => {
    type = sniffType(bytes);
    if (!type) throw new AttachmentError(`This file is not one Sinewright can take: its content is neither PDF, a picture nor text. ${ACCEPTED_FILES_SENTENCE}`, 415);
    if (type.kind === "capture") {
      decoder = new TextDecoder("utf-8", { fatal: true });
      reader = new CaptureReader();
    }
  };
  const parse = (bytes: Uint8Array, last: boolean) => {
    if (!reader) return;
    let text: string;
    try {
      text = decoder!.decode(bytes, { stream: !last });
    } catch {
      throw new AttachmentError(`This text is not UTF-8 (around byte ${size}). Export the capture as CSV in UTF-8 or plain ASCII. ${ACCEPTED_FILES_SENTENCE}`, 415);
    }
    try {
      reader.write(text);
    } catch (error) {
      throw asAttachmentError(error);
    }
  };

  // After a refusal the rest of the body is read and dropped (up to the limit again), so
  // the client, still sending, receives the message instead of a reset connection.
  let refusal: unknown;
  try {
    for await (const chunk of body) {
      size += chunk.byteLength;
      if (refusal) {
        if (size > 2 * options.maxBytes) break;
        continue;
      }
      try {
        if (size > options.maxBytes) throw new AttachmentError(limitMessage(options.maxBytes), 413);
        hash.update(chunk);
        await file.write(chunk);
        if (!type) {
          // The first bytes decide the type; hold them until there are enough.
          const joined = new Uint8Array(head.length + chunk.byteLength);
          joined.set(head);
          joined.set(chunk, head.length);
          head = joined;
          if (head.length < SNIFF_BYTES) continue;
          decide(head);
          parse(head, false);
          head = new Uint8Array(0);
        } else {
          parse(chunk, false);
        }
        if (size >= nextProgress) {
          progress("receiving");
          nextProgress = size + PROGRESS_EVERY_BYTES;
        }
      } catch (error) {
        refusal = error;
      }
    }
    if (refusal) throw refusal;
    if (size === 0) throw new AttachmentError("The file is empty. Choose the file again, or export the capture again from the scope.");
    if (!type) {
      decide(head);
      parse(head, false);
    }
    parse(new Uint8Array(0), true);
  } finally {
    await file.close();
  }

  let analysis: CaptureAnalysis | null = null;
  if (reader) {
    progress("analysing");
    try {
      analysis = analyseCapture(reader.finish());
    } catch (error) {
      throw asAttachmentError(error);
    }
  }
  return { type: type!, size, sha256: hash.digest("hex"), analysis };
}

function asAttachmentError(error: unknown): Error {
  if (error instanceof CaptureError) return new AttachmentError(`This CSV capture cannot be read. ${error.message}`, 400);
  return error instanceof Error ? error : new Error(String(error));
}
