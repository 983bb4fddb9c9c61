import { randomUUID } from "node:crypto";
import { existsSync, readFileSync } from "node:fs";
import path from "node:path";
import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  HeadObjectCommand,
  PutObjectCommand,
  S3Client,
  S3ServiceException,
} from "@aws-sdk/client-s3";
import { getSignedUrl } from "@aws-sdk/s3-request-presigner";
import { projectRoot } from "../db/database-url.server.ts";
import { PHOTO_TYPES, SNIFF_BYTES, sniffImageType, type PhotoType } from "./sniff.ts";

/**
 * Photo storage: objects in an S3-compatible bucket. Browsers upload straight to it with a
 * presigned PUT and show photos through short-lived presigned GETs, so no photo passes through
 * the app server; the server only looks at an uploaded object's size and first bytes.
 *
 * S3_ENDPOINT names real storage. Without it the app talks to the local fake
 * (scripts/s3-fake.ts) on S3_FAKE_PORT, else the port in .data/s3-fake.json, else 4569.
 */

export const DEFAULT_PHOTO_BUCKET = "visitwort-photos";
export const DEFAULT_S3_FAKE_PORT = 4569;
export const MAX_PHOTO_BYTES = 20 * 1024 * 1024;
export { PHOTO_TYPES, type PhotoType };

const UPLOAD_SECONDS = 10 * 60;
const DEFAULT_DOWNLOAD_SECONDS = 5 * 60;
// The fake's fixed credentials (s3rver's built-in account); never a default for real storage.
const FAKE_CREDENTIALS = { accessKeyId: "S3RVER", secretAccessKey: "S3RVER" };

/** Written by scripts/s3-fake.ts: where the local fake listens (git-ignored). */
export const s3FakeStateFile = path.join(projectRoot, ".data", "s3-fake.json");

export interface S3FakeState {
  port: number;
  pid?: number;
}

export function readS3FakeState(): S3FakeState | null {
  if (!existsSync(s3FakeStateFile)) return null;
  try {
    const state = JSON.parse(readFileSync(s3FakeStateFile, "utf8")) as Partial<S3FakeState>;
    return typeof state.port === "number" ? { port: state.port, pid: state.pid } : null;
  } catch {
    // Half-written by a fake starting right now: the next call reads it whole.
    return null;
  }
}

export interface StorageConfig {
  endpoint: string;
  region: string;
  bucket: string;
  /** Absent for real storage without S3_ACCESS_KEY_ID: the SDK's own chain (AWS_* variables, roles) applies. */
  credentials?: { accessKeyId: string; secretAccessKey: string };
  localFake: boolean;
}

// Empty counts as unset: the browser tests clear variables by setting them to "".
const env = (name: string) => process.env[name] || undefined;

/** Read on every call, so a fake restarted on another port is found without restarting the app. */
export function storageConfig(): StorageConfig {
  const region = env("S3_REGION") ?? "us-east-1";
  const bucket = env("S3_BUCKET") ?? DEFAULT_PHOTO_BUCKET;
  const accessKeyId = env("S3_ACCESS_KEY_ID");
  const secretAccessKey = env("S3_SECRET_ACCESS_KEY");
  const given = accessKeyId && secretAccessKey ? { accessKeyId, secretAccessKey } : undefined;
  const endpoint = env("S3_ENDPOINT");
  if (endpoint) return { endpoint: endpoint.replace(/\/+$/, ""), region, bucket, credentials: given, localFake: false };
  // S3_FAKE_PORT names a fake started by someone else (the browser tests' own).
  const fakePort = Number(env("S3_FAKE_PORT"));
  const port = (Number.isInteger(fakePort) && fakePort > 0 ? fakePort : undefined) ?? readS3FakeState()?.port ?? DEFAULT_S3_FAKE_PORT;
  return { endpoint: `http://127.0.0.1:${port}`, region, bucket, credentials: given ?? FAKE_CREDENTIALS, localFake: true };
}

/** The storage's origin, for the Content-Security-Policy's connect-src and img-src. */
export function storageOrigin(): string {
  return new URL(storageConfig().endpoint).origin;
}

/** Where photos go, in words without secrets, for log lines. */
export function describeStorageTarget(): string {
  const config = storageConfig();
  const where = `${config.endpoint}, bucket ${config.bucket}`;
  if (!config.localFake) return where;
  const state = env("S3_FAKE_PORT") ? "S3_FAKE_PORT" : readS3FakeState() ? null : `not started: no ${path.relative(projectRoot, s3FakeStateFile)}`;
  return `the local photo storage fake on ${where}${state ? ` (${state})` : ""}`;
}

const clients = new Map<string, S3Client>();

function clientFor(config: StorageConfig): S3Client {
  const id = JSON.stringify([config.endpoint, config.region, config.credentials?.accessKeyId ?? "", config.credentials?.secretAccessKey ?? ""]);
  let client = clients.get(id);
  if (!client) {
    client = new S3Client({
      endpoint: config.endpoint,
      region: config.region,
      credentials: config.credentials,
      // Bucket in the path: works with the fake, other S3-compatible servers and S3 itself, and keeps
      // the bucket name out of DNS and TLS certificates.
      forcePathStyle: true,
      // Only the checksums a request needs: by default this SDK puts the CRC32 of an empty
      // body (x-amz-checksum-crc32=AAAAAA==) into presigned PUTs, which storage that checks it
      // holds the browser's file against, and may send aws-chunked bodies, which some
      // S3-compatible servers (the fake among them) store framing and all.
      requestChecksumCalculation: "WHEN_REQUIRED",
      responseChecksumValidation: "WHEN_REQUIRED",
      // A storage that does not answer should fail a request within seconds, not hang it.
      requestHandler: { connectionTimeout: 3_000, requestTimeout: 15_000 },
      maxAttempts: 2,
    });
    clients.set(id, client);
  }
  return client;
}

function storage() {
  const config = storageConfig();
  return { config, client: clientFor(config), bucket: config.bucket };
}

// ---------------------------------------------------------------------------------------------
// Keys

const KEY_PATTERN = /^visits\/u(\d{1,18})\/([0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12})\.bin$/;

/**
 * A new key for one photo of this user: `visits/u<userId>/<random uuid>.bin`. Nothing the
 * browser sent (file name, extension, its own ids) goes into it: a key cannot be chosen to
 * overwrite another photo, and the stored name says nothing about the file. `clientId` is
 * accepted for the caller's bookkeeping and deliberately not used.
 */
export function photoKey({ userId }: { userId: number | string; clientId?: string }): string {
  const id = String(userId);
  if (!/^\d{1,18}$/.test(id) || /^0+$/.test(id)) throw new TypeError(`Not a user id: "${id}"`);
  return `visits/u${id}/${randomUUID()}.bin`;
}

/** The owner of a key made by photoKey, or null for anything else. */
export function photoKeyOwner(key: string): number | null {
  const match = KEY_PATTERN.exec(key);
  return match ? Number(match[1]) : null;
}

/** Keys come back from browsers; only the shape photoKey makes is ever sent to storage. */
function assertPhotoKey(key: string): void {
  if (!KEY_PATTERN.test(key)) throw new TypeError(`Not a photo key: "${key.slice(0, 100)}"`);
}

// ---------------------------------------------------------------------------------------------
// Refusals, in words for the person uploading

const MEBIBYTE = 1024 * 1024;

/** "21.0 MB": rounded up, so a file just over the limit never reads as exactly the limit. */
function megabytes(bytes: number): string {
  return `${(Math.ceil((bytes / MEBIBYTE) * 10) / 10).toFixed(1)} MB`;
}

export const photoReasons = {
  tooLarge: (size: number, maxBytes: number) =>
    `The file is ${megabytes(size)}; photos may be at most ${Number((maxBytes / MEBIBYTE).toFixed(1))} MB.`,
  empty: "The file is empty; choose the photo again.",
  notAPhoto: "This file is not a JPEG, PNG, WebP or HEIC photo.",
  missing: "The photo did not arrive; try again.",
  unreachable: "Photo storage is not reachable just now; try again in a few minutes.",
} as const;

export type PhotoProblem = "too-large" | "empty" | "not-a-photo" | "missing" | "unreachable";

/** A photo refused before upload (presignPhotoUpload) with the reason to show. */
export class PhotoRefused extends Error {
  constructor(
    readonly problem: PhotoProblem,
    readonly reason: string,
  ) {
    super(reason);
    this.name = "PhotoRefused";
  }
}

/** No object under this key: never uploaded, upload not finished, or deleted. */
export class PhotoMissing extends Error {
  constructor(readonly key: string) {
    super(`No photo stored under ${key}`);
    this.name = "PhotoMissing";
  }
}

/** Storage could not be asked: unreachable, misconfigured bucket or credentials. */
export class StorageUnavailable extends Error {
  constructor(message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.name = "StorageUnavailable";
  }
}

const statusOf = (error: unknown) => (error instanceof S3ServiceException ? error.$metadata?.httpStatusCode : undefined);

function describeError(error: unknown): string {
  if (!(error instanceof Error)) return String(error);
  const code = (error as Error & { code?: string }).code;
  const status = statusOf(error);
  return [error.name, code, status, error.message].filter((part) => part !== undefined && part !== "").join(" ");
}

// ---------------------------------------------------------------------------------------------
// Upload

export interface PresignedUpload {
  url: string;
  /**
   * Headers the browser must send with the PUT, exactly. Content-Length is signed too, but
   * browsers set it themselves from the body, so it is not listed: the body must be the file
   * whose size was presigned.
   */
  headers: { "Content-Type": PhotoType };
  expiresAt: Date;
}

export interface PresignUploadInput {
  key: string;
  /** The browser's File.type; must be one of PHOTO_TYPES. */
  contentType: string;
  /** The browser's File.size. */
  contentLength: number;
  maxBytes?: number;
}

/**
 * A URL the browser PUTs one photo to, valid for 10 minutes. Content-Type and Content-Length
 * are part of the signature: storage that checks signatures (S3 and the usual compatible
 * servers; not the local fake) refuses a body of another type or size. A declared type or size
 * that would be refused anyway is refused here, before anything is uploaded.
 */
export async function presignPhotoUpload({ key, contentType, contentLength, maxBytes = MAX_PHOTO_BYTES }: PresignUploadInput): Promise<PresignedUpload> {
  assertPhotoKey(key);
  if (!(PHOTO_TYPES as readonly string[]).includes(contentType)) throw new PhotoRefused("not-a-photo", photoReasons.notAPhoto);
  if (!Number.isSafeInteger(contentLength) || contentLength < 0) throw new TypeError(`Not a file size: ${contentLength}`);
  if (contentLength === 0) throw new PhotoRefused("empty", photoReasons.empty);
  if (contentLength > maxBytes) throw new PhotoRefused("too-large", photoReasons.tooLarge(contentLength, maxBytes));

  const { client, bucket } = storage();
  const signedAt = new Date();
  const url = await getSignedUrl(client, new PutObjectCommand({ Bucket: bucket, Key: key, ContentType: contentType, ContentLength: contentLength }), {
    expiresIn: UPLOAD_SECONDS,
    signingDate: signedAt,
    // The presigner leaves Content-Type unsigned unless told; signing both pins the upload to
    // what was declared.
    signableHeaders: new Set(["content-type", "content-length"]),
  });
  return { url, headers: { "Content-Type": contentType as PhotoType }, expiresAt: new Date(signedAt.getTime() + UPLOAD_SECONDS * 1000) };
}

// ---------------------------------------------------------------------------------------------
// Inspection

export interface UploadedPhoto {
  size: number;
  detectedType: PhotoType | null;
  /** Identifies this version of the object; a later PUT to the same key changes it. */
  etag: string | null;
}

async function firstBytes(body: unknown, limit: number): Promise<Uint8Array> {
  const chunks: Uint8Array[] = [];
  let length = 0;
  // Stop reading at the limit even if the server ignored the Range header and sent it all;
  // leaving the loop destroys the stream.
  for await (const chunk of body as AsyncIterable<Uint8Array>) {
    chunks.push(chunk);
    length += chunk.length;
    if (length >= limit) break;
  }
  const bytes = new Uint8Array(Math.min(length, limit));
  let offset = 0;
  for (const chunk of chunks) {
    const part = chunk.subarray(0, bytes.length - offset);
    bytes.set(part, offset);
    offset += part.length;
    if (offset >= bytes.length) break;
  }
  return bytes;
}

/**
 * The size (HeadObject) and real type (the first 64 bytes, by a ranged GetObject) of an
 * uploaded object; the object itself is never read whole. Throws PhotoMissing when there is no
 * such object, StorageUnavailable when storage cannot be asked.
 */
export async function inspectUploadedPhoto(key: string): Promise<UploadedPhoto> {
  assertPhotoKey(key);
  return inspect(key, 2);
}

async function inspect(key: string, attempts: number): Promise<UploadedPhoto> {
  const { client, bucket } = storage();
  let size: number;
  let etag: string | null;
  try {
    const head = await client.send(new HeadObjectCommand({ Bucket: bucket, Key: key }));
    size = head.ContentLength ?? 0;
    etag = head.ETag ?? null;
  } catch (error) {
    if (statusOf(error) === 404) {
      // A missing bucket answers a HEAD with the same bare 404: tell a configuration fault
      // from a photo that never arrived.
      await assertBucketReachable();
      throw new PhotoMissing(key);
    }
    throw new StorageUnavailable(`Could not look at ${key}: ${describeError(error)}`, { cause: error });
  }
  if (size === 0) return { size, detectedType: null, etag };

  try {
    const object = await client.send(
      new GetObjectCommand({ Bucket: bucket, Key: key, Range: `bytes=0-${SNIFF_BYTES - 1}`, ...(etag ? { IfMatch: etag } : {}) }),
    );
    const bytes = await firstBytes(object.Body, SNIFF_BYTES);
    return { size, detectedType: sniffImageType(bytes), etag };
  } catch (error) {
    // Deleted between the two requests; or replaced (If-Match failed: 412), so the size and
    // the first bytes would describe different uploads: look again, once.
    if (statusOf(error) === 404) throw new PhotoMissing(key);
    if (statusOf(error) === 412 && attempts > 1) return inspect(key, attempts - 1);
    throw new StorageUnavailable(`Could not read the start of ${key}: ${describeError(error)}`, { cause: error });
  }
}

async function assertBucketReachable(): Promise<void> {
  const status = await storageStatus();
  if (!status.ok) throw new StorageUnavailable(status.detail);
}

export type PhotoCheck =
  | { ok: true; size: number; contentType: PhotoType; etag: string | null }
  | { ok: false; problem: PhotoProblem; reason: string };

/**
 * Whether an uploaded object is a photo we keep: present, not empty, at most maxBytes, and a
 * JPEG, PNG, WebP or HEIC by its own first bytes. A refusal carries a reason for the person;
 * the caller decides whether to delete the object (deletePhoto).
 */
export async function checkPhoto(key: string, { maxBytes = MAX_PHOTO_BYTES }: { maxBytes?: number } = {}): Promise<PhotoCheck> {
  let photo: UploadedPhoto;
  try {
    photo = await inspectUploadedPhoto(key);
  } catch (error) {
    if (error instanceof PhotoMissing) return { ok: false, problem: "missing", reason: photoReasons.missing };
    if (error instanceof StorageUnavailable) {
      console.error(`· photo storage: ${error.message}`);
      return { ok: false, problem: "unreachable", reason: photoReasons.unreachable };
    }
    throw error;
  }
  if (photo.size === 0) return { ok: false, problem: "empty", reason: photoReasons.empty };
  if (photo.size > maxBytes) return { ok: false, problem: "too-large", reason: photoReasons.tooLarge(photo.size, maxBytes) };
  if (!photo.detectedType) return { ok: false, problem: "not-a-photo", reason: photoReasons.notAPhoto };
  return { ok: true, size: photo.size, contentType: photo.detectedType, etag: photo.etag };
}

// ---------------------------------------------------------------------------------------------
// Download, delete, seed

/**
 * A URL that shows the photo for a few minutes to whoever holds it: hand it only to people
 * allowed to see the photo. `contentType` (the type checkPhoto found) overrides whatever the
 * uploader declared, so the browser is told what the bytes really are.
 */
export async function presignPhotoDownload(
  key: string,
  { expiresInSeconds = DEFAULT_DOWNLOAD_SECONDS, contentType }: { expiresInSeconds?: number; contentType?: PhotoType } = {},
): Promise<string> {
  assertPhotoKey(key);
  if (!Number.isInteger(expiresInSeconds) || expiresInSeconds < 1 || expiresInSeconds > 7 * 24 * 3600) {
    throw new RangeError(`expiresInSeconds must be 1 s to 7 days (got ${expiresInSeconds})`);
  }
  const { client, bucket } = storage();
  return getSignedUrl(client, new GetObjectCommand({ Bucket: bucket, Key: key, ...(contentType ? { ResponseContentType: contentType } : {}) }), {
    expiresIn: expiresInSeconds,
  });
}

/** Removes the photo; a key with no object is not an error. */
export async function deletePhoto(key: string): Promise<void> {
  assertPhotoKey(key);
  const { client, bucket } = storage();
  await client.send(new DeleteObjectCommand({ Bucket: bucket, Key: key }));
}

/** Stores bytes from the server itself: for the demo seed, never for people's uploads. */
export async function putPhotoBytes(key: string, bytes: Uint8Array, contentType: PhotoType): Promise<void> {
  assertPhotoKey(key);
  const { client, bucket } = storage();
  await client.send(new PutObjectCommand({ Bucket: bucket, Key: key, Body: bytes, ContentType: contentType, ContentLength: bytes.byteLength }));
}

// ---------------------------------------------------------------------------------------------
// Status

export type StorageStatus =
  | { ok: true; endpoint: string; bucket: string }
  | { ok: false; endpoint: string; bucket: string; reason: string; detail: string };

/**
 * Whether photo storage answers and the bucket is there, within a few seconds. `reason` is for
 * the person filling in the form; `detail` is for the log.
 */
export async function storageStatus({ timeoutMs = 3_000 }: { timeoutMs?: number } = {}): Promise<StorageStatus> {
  const { config, client, bucket } = storage();
  const where = { endpoint: config.endpoint, bucket };
  try {
    await client.send(new HeadBucketCommand({ Bucket: bucket }), { abortSignal: AbortSignal.timeout(timeoutMs) });
    return { ok: true, ...where };
  } catch (error) {
    const status = statusOf(error);
    const problem =
      status === 404
        ? `the bucket ${bucket} does not exist`
        : status === 403 || status === 401
          ? `access to the bucket ${bucket} was refused (check S3_ACCESS_KEY_ID / S3_SECRET_ACCESS_KEY)`
          : `no answer (${describeError(error)})`;
    const hint = config.localFake ? "; start it with `npx tsx scripts/s3-fake.ts` (npm start and npm run dev do)" : "";
    return {
      ok: false,
      ...where,
      reason: "Photo storage is not reachable just now, so photos cannot be added; try again in a few minutes.",
      detail: `photo storage at ${describeStorageTarget()}: ${problem}${hint}`,
    };
  }
}
