/**
 * What the local fakes started by `npm start` share: a port from an environment variable or a
 * default, the next free one when that is taken (another checkout's), a state file in .data/
 * telling the app where it listens, a second start that finds the first one running, and
 * stopping with the process that started it (`--exit-with <pid>`).
 */
import { mkdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import net from "node:net";
import path from "node:path";

const PORTS_TO_TRY = 21;

export interface LocalService {
  port: number;
  close(): Promise<void>;
}

export interface LocalServiceOptions<S extends LocalService> {
  /** "mail catcher", "photo storage": for messages. */
  label: string;
  portVariable: string;
  defaultPort: number;
  stateFile: string;
  readState: () => { port: number; pid?: number } | null;
  start: (port: number) => Promise<S>;
  /** The line printed once it listens. */
  describe: (service: S) => string;
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

export async function runLocalService<S extends LocalService>(options: LocalServiceOptions<S>): Promise<void> {
  const refuse = (message: string): never => {
    console.error(`visitwort ${options.label}: ${message}`);
    process.exit(1);
  };

  const value = process.env[options.portVariable];
  const firstPort = value ? Number(value) : options.defaultPort;
  if (!Number.isInteger(firstPort) || firstPort < 1024 || firstPort > 65535) {
    refuse(`${options.portVariable} must be a port number between 1024 and 65535 (got "${value}")`);
  }

  const running = options.readState();
  if (running?.pid && running.pid !== process.pid && isAlive(running.pid) && (await answers(running.port))) {
    console.log(`· ${options.label} already running on 127.0.0.1:${running.port} (pid ${running.pid})`);
    process.exit(0);
  }

  let service: S | undefined;
  for (let port = firstPort; !service && port < firstPort + PORTS_TO_TRY && port <= 65535; port++) {
    try {
      service = await options.start(port);
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== "EADDRINUSE") throw error;
    }
  }
  if (!service) return refuse(`ports ${firstPort}–${firstPort + PORTS_TO_TRY - 1} on 127.0.0.1 are all taken; set ${options.portVariable} to a free port.`);
  const started = service;

  mkdirSync(path.dirname(options.stateFile), { recursive: true });
  writeFileSync(options.stateFile, JSON.stringify({ port: started.port, pid: process.pid }, null, 2) + "\n");
  console.log(options.describe(started));

  let stopping = false;
  async function stop() {
    if (stopping) return;
    stopping = true;
    // Only our own state file: a newer instance may already have replaced it.
    try {
      const current = JSON.parse(readFileSync(options.stateFile, "utf8")) as { pid?: number };
      if (current.pid === process.pid) rmSync(options.stateFile, { force: true });
    } catch {
      // Already gone.
    }
    await started.close();
    process.exit(0);
  }
  process.once("SIGTERM", () => void stop());
  process.once("SIGINT", () => void stop());

  // Started in the background by a script that then becomes the server: when the server stops,
  // however it was stopped, the service should not linger on its port.
  const index = process.argv.indexOf("--exit-with");
  if (index !== -1) {
    const owner = Number(process.argv[index + 1]);
    if (!Number.isInteger(owner) || owner <= 0) refuse("--exit-with needs a process id");
    setInterval(() => {
      if (!isAlive(owner)) void stop();
    }, 1_000);
  }
}
