/**
 * The content hash that binds a stamp to exactly what was checked. SHA-256 over a
 * canonical serialization (object keys sorted, no whitespace, undefined dropped)
 * of the source, every block's inputs and results, and the engine version.
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
}

export function revisionHash(content: RevisionContent): Promise<string> {
  return sha256Hex(canonicalJson({ source: content.source, blocks: content.blocks, engineVersion: content.engineVersion }));
}

/** The first characters of a hash, as printed on stamps and title blocks. */
export function shortHash(hash: string): string {
  return hash.slice(0, 12);
}
