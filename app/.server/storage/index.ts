/**
 * The app's object store: S3 when S3_ENDPOINT is set, else a local folder
 * (STORAGE_DIR). One per process, made on first use.
 */
import path from "node:path";
import { config } from "../config";
import { LocalObjectStore } from "./local";
import { S3ObjectStore } from "./s3";
import type { ObjectStore } from "./types";

export { ObjectNotFoundError, type ObjectStore } from "./types";
export { LocalObjectStore } from "./local";
export { S3ObjectStore } from "./s3";

let store: ObjectStore | undefined;

export function objectStore(): ObjectStore {
  if (store) return store;
  const cfg = config();
  store = cfg.S3_ENDPOINT
    ? new S3ObjectStore({
        endpoint: cfg.S3_ENDPOINT,
        bucket: cfg.S3_BUCKET!,
        region: cfg.S3_REGION,
        accessKeyId: cfg.S3_ACCESS_KEY_ID!,
        secretAccessKey: cfg.S3_SECRET_ACCESS_KEY!,
      })
    : new LocalObjectStore(path.resolve(cfg.STORAGE_DIR));
  return store;
}
