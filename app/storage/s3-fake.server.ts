import { mkdirSync } from "node:fs";
import http from "node:http";
import { createRequire } from "node:module";
import type { AddressInfo } from "node:net";
import { DEFAULT_PHOTO_BUCKET } from "./s3.server.ts";

/**
 * A local S3-compatible server (s3rver) for development and tests: scripts/s3-fake.ts runs one
 * on a fixed port with its data in .data/s3/, tests start one in-process on a free port.
 * Development and test code only: s3rver is a dev dependency, so the app must never import
 * this module.
 *
 * What the fake does not do, so tests must not rely on it: it verifies no Signature V4 (a PUT
 * with another Content-Type or length than presigned is stored anyway; s3rver 3.7.1,
 * lib/middleware/authentication.js), and it honours neither If-Match nor checksums.
 */
export interface S3FakeOptions {
  /** 0 takes any free port. */
  port: number;
  /** Where buckets and objects are kept; created when missing, kept after close. */
  directory: string;
  host?: string;
  bucket?: string;
  /** Browser origins that may PUT and GET with presigned URLs; "*" as one wildcard per entry. */
  allowedOrigins?: string[];
}

export interface S3Fake {
  port: number;
  host: string;
  /** http://host:port, what S3_ENDPOINT would be. */
  endpoint: string;
  bucket: string;
  close(): Promise<void>;
}

// A page of the app in development (Vite on 5173), production (3000) and the browser tests
// (any free port) is on the loopback interface under either name.
export const LOCAL_ORIGINS = ["http://127.0.0.1:*", "http://localhost:*", "http://127.0.0.1", "http://localhost"];

interface S3rverInstance {
  configureBuckets(): Promise<void>;
  callback(): http.RequestListener;
  logger: { close(): void };
}
type S3rverConstructor = new (options: Record<string, unknown>) => S3rverInstance;

// s3rver ships no types; loading it through require keeps the untyped module out of the
// type checker's way with one explicit shape for the little we use.
const S3rver = createRequire(import.meta.url)("s3rver") as S3rverConstructor;

function escapeXml(value: string): string {
  return value.replace(/[<>&'"]/g, (c) => `&#${c.charCodeAt(0)};`);
}

/**
 * The bucket's CORS rules. The browser PUTs the photo with its Content-Type header (a
 * preflighted request) and later shows it with a plain GET; ETag is exposed so a page could
 * tell which upload landed.
 */
export function corsConfiguration(origins: string[]): string {
  return [
    "<CORSConfiguration>",
    "  <CORSRule>",
    ...origins.map((origin) => `    <AllowedOrigin>${escapeXml(origin)}</AllowedOrigin>`),
    "    <AllowedMethod>PUT</AllowedMethod>",
    "    <AllowedMethod>GET</AllowedMethod>",
    "    <AllowedMethod>HEAD</AllowedMethod>",
    "    <AllowedHeader>*</AllowedHeader>",
    "    <ExposeHeader>ETag</ExposeHeader>",
    "    <MaxAgeSeconds>600</MaxAgeSeconds>",
    "  </CORSRule>",
    "</CORSConfiguration>",
  ].join("\n");
}

/**
 * Starts s3rver with the photo bucket created (when missing) and its CORS rules set. Rejects
 * with the listen error (EADDRINUSE …) rather than crashing: s3rver's own run() leaves the
 * server's error event unhandled, so the HTTP server is ours.
 */
export async function startS3Fake(options: S3FakeOptions): Promise<S3Fake> {
  const host = options.host ?? "127.0.0.1";
  const bucket = options.bucket ?? DEFAULT_PHOTO_BUCKET;
  mkdirSync(options.directory, { recursive: true });

  const fake = new S3rver({
    directory: options.directory,
    // Its request log would drown the app's output; the script prints where it listens.
    silent: true,
    // Path-style only: a Host header naming a bucket must not be taken for one.
    vhostBuckets: false,
    configureBuckets: [{ name: bucket, configs: [corsConfiguration(options.allowedOrigins ?? LOCAL_ORIGINS)] }],
  });
  await fake.configureBuckets();

  const server = http.createServer(fake.callback());
  await new Promise<void>((resolve, reject) => {
    const onError = (error: Error) => reject(error);
    server.once("error", onError);
    server.listen(options.port, host, () => {
      server.off("error", onError);
      // A client resetting its connection later must not crash the process.
      server.on("error", () => {});
      resolve();
    });
  });
  const port = (server.address() as AddressInfo).port;

  return {
    port,
    host,
    endpoint: `http://${host}:${port}`,
    bucket,
    close: () =>
      new Promise<void>((done) => {
        // Kept-alive connections from the SDK's agent would hold close() open until they time out.
        server.closeAllConnections();
        server.close(() => {
          fake.logger.close();
          done();
        });
      }),
  };
}
