// One contract for both object stores: the S3 implementation against the fake S3 service
// that `npm test` starts (scripts/fake-s3.mjs), and the local-folder implementation.
import { mkdtemp, readFile, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { LocalObjectStore, ObjectNotFoundError, S3ObjectStore, type ObjectStore } from "../../app/.server/storage";

let scratch: string;
beforeAll(async () => {
  scratch = await mkdtemp(path.join(tmpdir(), "sinewright-store-test-"));
});
afterAll(async () => {
  await rm(scratch, { recursive: true, force: true });
});

function s3Store(): ObjectStore {
  const endpoint = process.env.S3_ENDPOINT;
  if (!endpoint) throw new Error("S3_ENDPOINT is not set: run the suite through `npm test`, which starts the fake S3 service.");
  return new S3ObjectStore({
    endpoint,
    bucket: process.env.S3_BUCKET!,
    region: process.env.S3_REGION ?? "us-east-1",
    accessKeyId: process.env.S3_ACCESS_KEY_ID!,
    secretAccessKey: process.env.S3_SECRET_ACCESS_KEY!,
  });
}

const stores: [string, () => ObjectStore][] = [
  ["S3 (fake S3 service)", s3Store],
  ["local folder", () => new LocalObjectStore(path.join(scratch, "local"))],
];

async function text(store: ObjectStore, key: string): Promise<string> {
  const { body } = await store.get(key);
  const parts: Buffer[] = [];
  for await (const chunk of body) parts.push(Buffer.from(chunk as Uint8Array));
  return Buffer.concat(parts).toString("utf8");
}

describe.each(stores)("object store contract: %s", (_name, make) => {
  const prefix = `contract-${Math.random().toString(36).slice(2, 8)}`;

  it("stores a file under a key and gives the same bytes and size back", async () => {
    const store = make();
    const file = path.join(scratch, `${prefix}-a.csv`);
    const content = "Time (s),V (V)\n0,1.5\n0.001,-1.5\n";
    await writeFile(file, content);
    await store.put(`${prefix}/teams/t1/attachments/one`, file, Buffer.byteLength(content), "text/csv");
    expect(await text(store, `${prefix}/teams/t1/attachments/one`)).toBe(content);
    expect((await store.get(`${prefix}/teams/t1/attachments/one`)).size).toBe(Buffer.byteLength(content));
    expect(await readFile(file, "utf8")).toBe(content); // the source file is left alone
  });

  it("lists keys under a prefix, and no others", async () => {
    const store = make();
    const file = path.join(scratch, `${prefix}-b.bin`);
    await writeFile(file, Buffer.from([0, 1, 2, 3]));
    await store.put(`${prefix}/teams/t2/attachments/a`, file, 4, "application/octet-stream");
    await store.put(`${prefix}/teams/t2/attachments/b`, file, 4, "application/octet-stream");
    expect(await store.list(`${prefix}/teams/t2/`)).toEqual([`${prefix}/teams/t2/attachments/a`, `${prefix}/teams/t2/attachments/b`]);
    expect(await store.list(`${prefix}/teams/none/`)).toEqual([]);
  });

  it("deletes a key (twice is fine) and then answers not found", async () => {
    const store = make();
    const file = path.join(scratch, `${prefix}-c.txt`);
    await writeFile(file, "x");
    await store.put(`${prefix}/teams/t3/attachments/gone`, file, 1, "text/plain");
    await store.delete(`${prefix}/teams/t3/attachments/gone`);
    await store.delete(`${prefix}/teams/t3/attachments/gone`);
    await expect(store.get(`${prefix}/teams/t3/attachments/gone`)).rejects.toBeInstanceOf(ObjectNotFoundError);
    expect(await store.list(`${prefix}/teams/t3/`)).toEqual([]);
  });
});
