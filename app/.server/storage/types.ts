import type { Readable } from "node:stream";

/**
 * Where attachment bytes live. Keys are opaque paths such as
 * `teams/<team>/attachments/<id>`; PostgreSQL holds everything else about a file.
 * Two implementations behind this one contract: S3 (any S3-compatible service) and a
 * local folder for a single machine. `tests/integration/storage.test.ts` runs the same
 * suite against both.
 */
export interface ObjectStore {
  readonly kind: "s3" | "local";
  /** Stores the file at `filePath` (whose size is known) under `key`, replacing nothing: keys are fresh ids. */
  put(key: string, filePath: string, size: number, contentType: string): Promise<void>;
  /** The bytes under `key` as a stream; throws ObjectNotFoundError when there are none. */
  get(key: string): Promise<{ body: Readable; size: number }>;
  /** Removes `key`; removing a key that is not there is not an error. */
  delete(key: string): Promise<void>;
  /** Keys under `prefix`, for clean-up checks and tests. */
  list(prefix: string): Promise<string[]>;
}

export class ObjectNotFoundError extends Error {
  constructor(key: string) {
    super(`No stored object under "${key}".`);
    this.name = "ObjectNotFoundError";
  }
}
