/**
 * The content hash that binds a stamp to exactly what was checked. SHA-256 over a
 * canonical serialization (object keys sorted, no whitespace, undefined dropped)
 * of the source, every block's inputs and results, the engine version and, when the
 * sheet has measured-waveform blocks, their outcomes (each naming its attachment's
 * SHA-256, so the stamp binds the exact bytes measured).
 * Uses Web Crypto, present in browsers and in Node.
 */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== "object") {
    if (typeof value === "number" && !Number.isFinite(value)) throw new Error("non-finite numbers have no canonical form");
    return JSON.stringify(value) ?? "null";
  }
  if (Array.isArray(value)) return `[${value.map((item) => (item === undefined ? "null" : canonicalJson(item))).join(",")}]`;
  const entries = Object.entries(value as Record<string, unknown>)
    .filter(([, v]) => v !== undefined)
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(",")}}`;
}

export async function sha256Hex(text: string): Promise<string> {
  const digest = await crypto.subtle.digest("SHA-256", new TextEncoder().encode(text));
  return [...new Uint8Array(digest)].map((b) => b.toString(16).padStart(2, "0")).join("");
}

export interface HashedBlock {
  id: string;
  calculator: string;
  inputs: Record<string, string>;
  results: unknown;
}

export interface RevisionContent {
  source: string;
  blocks: HashedBlock[];
  engineVersion: string;
  /** Measured-waveform outcomes by block id; absent or empty for sheets without them (their hashes stay as they were). */
  measurements?: Record<string, unknown> | null | undefined;
}

export function revisionHash(content: RevisionContent): Promise<string> {
  const measurements = content.measurements && Object.keys(content.measurements).length > 0 ? content.measurements : undefined;
  return sha256Hex(canonicalJson({ source: content.source, blocks: content.blocks, engineVersion: content.engineVersion, measurements }));
}

/** The first characters of a hash, as printed on stamps and title blocks. */
export function shortHash(hash: string): string {
  return hash.slice(0, 12);
}
