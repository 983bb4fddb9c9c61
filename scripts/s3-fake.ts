/**
 * The local photo storage: an S3-compatible server (s3rver) on 127.0.0.1 keeping its bucket in
 * .data/s3/. Without S3_ENDPOINT the app stores photos here, and browsers on 127.0.0.1 or
 * localhost may upload and show them through presigned URLs (the bucket's CORS rules).
 *
 *   tsx scripts/s3-fake.ts                    listens on S3_FAKE_PORT, default 4569
 *   tsx scripts/s3-fake.ts --exit-with <pid>  and stops when that process has ended
 *
 * When the port is taken (another checkout's fake), the next free one up to +20 is used and
 * written to .data/s3-fake.json, where the app reads it. When this checkout's fake is already
 * running, it says so and leaves it be.
 */
import path from "node:path";
import { startS3Fake } from "../app/storage/s3-fake.server.ts";
import { DEFAULT_PHOTO_BUCKET, DEFAULT_S3_FAKE_PORT, readS3FakeState, s3FakeStateFile } from "../app/storage/s3.server.ts";
import { projectRoot } from "../app/db/database-url.server.ts";
import { runLocalService } from "./local-service.ts";

const dataFolder = path.join(projectRoot, ".data", "s3");

await runLocalService({
  label: "photo storage",
  portVariable: "S3_FAKE_PORT",
  defaultPort: DEFAULT_S3_FAKE_PORT,
  stateFile: s3FakeStateFile,
  readState: readS3FakeState,
  start: (port) => startS3Fake({ port, host: "127.0.0.1", directory: dataFolder, bucket: process.env.S3_BUCKET || DEFAULT_PHOTO_BUCKET }),
  describe: (fake) => `· photo storage (local S3 fake) listening on ${fake.endpoint}, bucket ${fake.bucket}, keeping photos in ${path.relative(projectRoot, dataFolder)}/`,
});
