/**
 * The local mail catcher: an SMTP server on 127.0.0.1 that keeps every message as JSON in
 * .data/mail/ instead of delivering it (shown by the dev page /dev/mail). Without SMTP_URL the
 * app sends its mail here.
 *
 *   tsx scripts/mail-catcher.ts                    listens on MAIL_CATCHER_PORT, default 2526
 *   tsx scripts/mail-catcher.ts --exit-with <pid>  and stops when that process has ended
 *
 * When the port is taken (another checkout's catcher), the next free one up to +20 is used and
 * written to .data/mail-catcher.json, where the app reads it. When this checkout's catcher is
 * already running, it says so and leaves it be.
 */
import { mkdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import net from "node:net";
import path from "node:path";
import { startMailCatcher, type MailCatcher } from "../app/mail/catcher.server.ts";
import { caughtMailFolder } from "../app/mail/caught-mail.server.ts";
import { DEFAULT_MAIL_CATCHER_PORT, mailCatcherStateFile, readMailCatcherState } from "../app/mail/transport.server.ts";
import { projectRoot } from "../app/db/database-url.server.ts";

const PORTS_TO_TRY = 21;

function refuse(message: string): never {
  console.error(`visitwort mail catcher: ${message}`);
  process.exit(1);
}

function configuredPort(): number {
  const value = process.env.MAIL_CATCHER_PORT;
  if (!value) return DEFAULT_MAIL_CATCHER_PORT;
  const port = Number(value);
  if (!Number.isInteger(port) || port < 1024 || port > 65535) {
    refuse(`MAIL_CATCHER_PORT must be a port number between 1024 and 65535 (got "${value}")`);
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

async function listen(first: number): Promise<MailCatcher> {
  for (let port = first; port < first + PORTS_TO_TRY && port <= 65535; port++) {
    try {
      return await startMailCatcher({ port, host: "127.0.0.1", store: caughtMailFolder });
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== "EADDRINUSE") throw error;
    }
  }
  refuse(`ports ${first}–${first + PORTS_TO_TRY - 1} on 127.0.0.1 are all taken; set MAIL_CATCHER_PORT to a free port.`);
}

const firstPort = configuredPort();
const running = readMailCatcherState();
if (running?.pid && running.pid !== process.pid && isAlive(running.pid) && (await answers(running.port))) {
  console.log(`· mail catcher already running on smtp://127.0.0.1:${running.port} (pid ${running.pid})`);
  process.exit(0);
}

const catcher = await listen(firstPort);
mkdirSync(path.dirname(mailCatcherStateFile), { recursive: true });
writeFileSync(mailCatcherStateFile, JSON.stringify({ port: catcher.port, pid: process.pid }, null, 2) + "\n");
console.log(`· mail catcher listening on smtp://127.0.0.1:${catcher.port}, keeping messages in ${path.relative(projectRoot, caughtMailFolder)}/`);

let stopping = false;
async function stop() {
  if (stopping) return;
  stopping = true;
  // Only our own state file: a newer catcher may already have replaced it.
  try {
    const current = JSON.parse(readFileSync(mailCatcherStateFile, "utf8")) as { pid?: number };
    if (current.pid === process.pid) rmSync(mailCatcherStateFile, { force: true });
  } catch {
    // Already gone.
  }
  await catcher.close();
  process.exit(0);
}
process.once("SIGTERM", () => void stop());
process.once("SIGINT", () => void stop());

// Started in the background by a script that then becomes the server: when the server stops,
// however it was stopped, the catcher should not linger on its port.
const owner = exitWithPid();
if (owner !== null) {
  setInterval(() => {
    if (!isAlive(owner)) void stop();
  }, 1_000);
}
