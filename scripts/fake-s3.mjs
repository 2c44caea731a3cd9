#!/usr/bin/env node
// Test stand-in for an S3 service: s3rver (the S3 API over a folder) on 127.0.0.1, with
// one bucket. Never used in production. Started by `npm test`; by hand:
// `FAKE_S3_PORT=9000 FAKE_S3_DIR=/tmp/s3 FAKE_S3_BUCKET=sinewright node scripts/fake-s3.mjs`
// (access key and secret: S3RVER / S3RVER).
import S3rver from "s3rver";

const port = Number(process.env.FAKE_S3_PORT ?? 9000);
const directory = process.env.FAKE_S3_DIR ?? "/tmp/sinewright-fake-s3";
const bucket = process.env.FAKE_S3_BUCKET ?? "sinewright";

const server = new S3rver({ port, address: "127.0.0.1", directory, silent: true, configureBuckets: [{ name: bucket }] });
await server.run();
console.log(`[fake-s3] S3 API on http://127.0.0.1:${port}, bucket ${bucket}`);

const stop = async () => {
  await server.close().catch(() => {});
  process.exit(0);
};
process.on("SIGTERM", stop);
process.on("SIGINT", stop);
