/**
 * What kind of file an upload is, judged from its first bytes (never from its name),
 * and a safe name to store and offer it under. Pure.
 *
 * Accepted: PDF, PNG, JPEG, GIF and WebP by their signatures, and CSV scope captures,
 * which have no signature: text that decodes as UTF-8 and parses as rows of numbers
 * (the capture reader decides that, line by line).
 */
export type AttachmentKind = "pdf" | "image" | "capture";

/** An attachment as lists and the API show it (no bytes). */
export interface AttachmentSummary {
  id: string;
  fileName: string;
  contentType: string;
  kind: AttachmentKind;
  size: number;
  sha256: string;
  createdAt: string;
  uploaderName: string | null;
  /** Channels of a capture with their fundamental and THD, for the list. */
  channels: { name: string; unit: string; fundamentalFrequency: number; fundamentalRms: number; thd: number }[];
}

export interface SniffedType {
  kind: AttachmentKind;
  contentType: string;
  /** The extension a file of this type carries, without the dot. */
  extension: string;
  /** Other extensions that mean the same type. */
  aliases: readonly string[];
}

/** Bytes needed to tell the types apart. */
export const SNIFF_BYTES = 16;

const PDF: SniffedType = { kind: "pdf", contentType: "application/pdf", extension: "pdf", aliases: [] };
const PNG: SniffedType = { kind: "image", contentType: "image/png", extension: "png", aliases: [] };
const JPEG: SniffedType = { kind: "image", contentType: "image/jpeg", extension: "jpg", aliases: ["jpeg"] };
const GIF: SniffedType = { kind: "image", contentType: "image/gif", extension: "gif", aliases: [] };
const WEBP: SniffedType = { kind: "image", contentType: "image/webp", extension: "webp", aliases: [] };
export const CSV_TYPE: SniffedType = { kind: "capture", contentType: "text/csv", extension: "csv", aliases: ["txt", "tsv"] };

export const ACCEPTED_FILES_SENTENCE = "Attach PDF datasheets, PNG, JPEG, GIF or WebP pictures, or scope captures as CSV text.";

function startsWith(head: Uint8Array, bytes: readonly number[], at = 0): boolean {
  if (head.length < at + bytes.length) return false;
  return bytes.every((byte, index) => head[at + index] === byte);
}

const ascii = (text: string) => [...text].map((c) => c.charCodeAt(0));

/**
 * The type of a file from its first bytes (at least SNIFF_BYTES of them, or the whole
 * file when shorter), or undefined when it is none of the accepted binary types and
 * not text. Text is only a candidate capture; the capture reader has the last word.
 */
export function sniffType(head: Uint8Array): SniffedType | undefined {
  if (startsWith(head, ascii("%PDF-"))) return PDF;
  if (startsWith(head, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return PNG;
  if (startsWith(head, [0xff, 0xd8, 0xff])) return JPEG;
  if (startsWith(head, ascii("GIF87a")) || startsWith(head, ascii("GIF89a"))) return GIF;
  if (startsWith(head, ascii("RIFF")) && startsWith(head, ascii("WEBP"), 8)) return WEBP;
  return looksLikeText(head) ? CSV_TYPE : undefined;
}

/** No NUL or other control bytes a text export never holds (tab, CR, LF and form feed are fine). */
function looksLikeText(head: Uint8Array): boolean {
  for (const byte of head) {
    if (byte === 0x09 || byte === 0x0a || byte === 0x0d || byte === 0x0c) continue;
    if (byte < 0x20 || byte === 0x7f) return false;
  }
  return true;
}

const MAX_NAME_LENGTH = 120;

/**
 * A name safe to store, show and send in Content-Disposition: the last path part only,
 * no control or reserved characters, no leading dots, at most 120 characters, and an
 * extension that matches the sniffed type (a PNG called "report.pdf" becomes
 * "report.pdf.png").
 */
export function safeFileName(original: string, type: SniffedType): string {
  const lastPart = original.split(/[\\/]/).pop() ?? "";
  let name = lastPart
    .normalize("NFC")
    .replace(/[\u0000-\u001f\u007f-\u009f]/g, "")
    .replace(/[<>:"|?*\u200b-\u200f\u202a-\u202e\u2066-\u2069]/g, "_")
    .replace(/\s+/g, " ")
    .trim()
    .replace(/^[.\s]+/, "");
  const dot = name.lastIndexOf(".");
  const extension = dot > 0 ? name.slice(dot + 1).toLowerCase() : "";
  const matches = extension === type.extension || type.aliases.includes(extension);
  let stem = matches ? name.slice(0, dot) : name;
  const suffix = matches ? extension : type.extension;
  stem = stem.replace(/[.\s]+$/, "") || (type.kind === "capture" ? "capture" : type.kind);
  const room = MAX_NAME_LENGTH - suffix.length - 1;
  if (stem.length > room) stem = stem.slice(0, room).trimEnd();
  name = `${stem}.${suffix}`;
  return name;
}

/** "capture.csv" → "capture (2).csv": the name for the n-th file of that name on a sheet. */
export function numberedFileName(name: string, n: number): string {
  const dot = name.lastIndexOf(".");
  return dot > 0 ? `${name.slice(0, dot)} (${n})${name.slice(dot)}` : `${name} (${n})`;
}

/** 52 428 800 → "52.4 MB": sizes in SI megabytes, as the limit is stated. */
export function formatBytes(bytes: number): string {
  if (bytes < 1000) return `${bytes} B`;
  if (bytes < 1e6) return `${Number((bytes / 1e3).toPrecision(3))} kB`;
  return `${Number((bytes / 1e6).toPrecision(3))} MB`;
}
