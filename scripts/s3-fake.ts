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
import { mkdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import net from "node:net";
import path from "node:path";
import { startS3Fake, type S3Fake } from "../app/storage/s3-fake.server.ts";
import { DEFAULT_PHOTO_BUCKET, DEFAULT_S3_FAKE_PORT, readS3FakeState, s3FakeStateFile } from "../app/storage/s3.server.ts";
import { projectRoot } from "../app/db/database-url.server.ts";

const PORTS_TO_TRY = 21;
const dataFolder = path.join(projectRoot, ".data", "s3");

function refuse(message: string): never {
  console.error(`visitwort photo storage: ${message}`);
  process.exit(1);
}

function configuredPort(): number {
  const value = process.env.S3_FAKE_PORT;
  if (!value) return DEFAULT_S3_FAKE_PORT;
  const port = Number(value);
  if (!Number.isInteger(port) || port < 1024 || port > 65535) {
    refuse(`S3_FAKE_PORT must be a port number between 1024 and 65535 (got "${value}")`);
  }
  return port;
}

function exitWithPid(): number | null {
  const index = process.argv.indexOf("--exit-with");
  if (index === -1) return null;
  const pid = Number(process.argv[index + 1]);
  if (!Number.isInteger(pid) || pid <= 0) refuse("--exit-with needs a process id");
  return pid;
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    // EPERM: the process exists but belongs to another user.
    return (error as NodeJS.ErrnoException).code === "EPERM";
  }
}

function answers(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = net.connect({ port, host: "127.0.0.1", timeout: 1_000 });
    socket.once("connect", () => {
      socket.destroy();
      resolve(true);
    });
    socket.once("error", () => resolve(false));
    socket.once("timeout", () => {
      socket.destroy();
      resolve(false);
    });
  });
}

async function listen(first: number): Promise<S3Fake> {
  for (let port = first; port < first + PORTS_TO_TRY && port <= 65535; port++) {
    try {
      return await startS3Fake({ port, host: "127.0.0.1", directory: dataFolder, bucket: process.env.S3_BUCKET || DEFAULT_PHOTO_BUCKET });
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== "EADDRINUSE") throw error;
    }
  }
  refuse(`ports ${first}–${first + PORTS_TO_TRY - 1} on 127.0.0.1 are all taken; set S3_FAKE_PORT to a free port.`);
}

const firstPort = configuredPort();
const running = readS3FakeState();
if (running?.pid && running.pid !== process.pid && isAlive(running.pid) && (await answers(running.port))) {
  console.log(`· photo storage already running on http://127.0.0.1:${running.port} (pid ${running.pid})`);
  process.exit(0);
}

const fake = await listen(firstPort);
mkdirSync(path.dirname(s3FakeStateFile), { recursive: true });
writeFileSync(s3FakeStateFile, JSON.stringify({ port: fake.port, pid: process.pid }, null, 2) + "\n");
console.log(`· photo storage (local S3 fake) listening on ${fake.endpoint}, bucket ${fake.bucket}, keeping photos in ${path.relative(projectRoot, dataFolder)}/`);

let stopping = false;
async function stop() {
  if (stopping) return;
  stopping = true;
  // Only our own state file: a newer fake may already have replaced it.
  try {
    const current = JSON.parse(readFileSync(s3FakeStateFile, "utf8")) as { pid?: number };
    if (current.pid === process.pid) rmSync(s3FakeStateFile, { force: true });
  } catch {
    // Already gone.
  }
  await fake.close();
  process.exit(0);
}
process.once("SIGTERM", () => void stop());
process.once("SIGINT", () => void stop());

// Started in the background by a script that then becomes the server: when the server stops,
// however it was stopped, the fake should not linger on its port.
const owner = exitWithPid();
if (owner !== null) {
  setInterval(() => {
    if (!isAlive(owner)) void stop();
  }, 1_000);
}
