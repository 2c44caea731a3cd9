import { createReadStream } from "node:fs";
import { Readable } from "node:stream";
import { DeleteObjectCommand, GetObjectCommand, ListObjectsV2Command, NoSuchKey, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import { ObjectNotFoundError, type ObjectStore } from "./types";

export interface S3Settings {
  endpoint: string;
  bucket: string;
  region: string;
  accessKeyId: string;
  secretAccessKey: string;
}

/**
 * Objects in an S3-compatible bucket through @aws-sdk/client-s3, path-style (what
 * self-hosted S3 services expect). Checksums only where the API requires them: the
 * SDK's default trailing checksums are not understood by every compatible service.
 */
export class S3ObjectStore implements ObjectStore {
  readonly kind = "s3" as const;
  private readonly client: S3Client;

  constructor(private readonly settings: S3Settings) {
    this.client = new S3Client({
      endpoint: settings.endpoint,
      region: settings.region,
      forcePathStyle: true,
      credentials: { accessKeyId: settings.accessKeyId, secretAccessKey: settings.secretAccessKey },
      requestChecksumCalculation: "WHEN_REQUIRED",
      responseChecksumValidation: "WHEN_REQUIRED",
    });
  }

  async put(key: string, filePath: string, size: number, contentType: string): Promise<void> {
    await this.client.send(
      new PutObjectCommand({ Bucket: this.settings.bucket, Key: key, Body: createReadStream(filePath), ContentLength: size, ContentType: contentType }),
    );
  }

  async get(key: string): Promise<{ body: Readable; size: number }> {
    try {
      const answer = await this.client.send(new GetObjectCommand({ Bucket: this.settings.bucket, Key: key }));
      if (!answer.Body) throw new ObjectNotFoundError(key);
      return { body: answer.Body as Readable, size: answer.ContentLength ?? 0 };
    } catch (error) {
      if (error instanceof NoSuchKey || (error as { name?: string }).name === "NoSuchKey") throw new ObjectNotFoundError(key);
      throw error;
    }
  }

  async delete(key: string): Promise<void> {
    await this.client.send(new DeleteObjectCommand({ Bucket: this.settings.bucket, Key: key }));
  }

  async list(prefix: string): Promise<string[]> {
    const keys: string[] = [];
    let token: string | undefined;
    do {
      const page = await this.client.send(new ListObjectsV2Command({ Bucket: this.settings.bucket, Prefix: prefix, ContinuationToken: token }));
      for (const item of page.Contents ?? []) if (item.Key) keys.push(item.Key);
      token = page.IsTruncated ? page.NextContinuationToken : undefined;
    } while (token);
    return keys.sort();
  }
}
