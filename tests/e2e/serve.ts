import { spawn, type ChildProcess } from "node:child_process";
import { existsSync } from "node:fs";
import net from "node:net";
import path from "node:path";
import { mkdtempSync } from "node:fs";
import os from "node:os";
import type { TestProject } from "vitest/node";
import { MikroORM } from "@mikro-orm/postgresql";
import config from "../../mikro-orm.config.ts";
import { startMailCatcher } from "../../app/mail/catcher.server.ts";
import { startS3Fake } from "../../app/storage/s3-fake.server.ts";
import { databaseUrl } from "../../app/db/database-url.server.ts";

declare module "vitest" {
  export interface ProvidedContext {
    baseUrl: string;
    /** Where the browser tests' own mail catcher keeps what the app sent (one JSON file each). */
    mailFolder: string;
  }
}

const root = path.resolve(import.meta.dirname, "../..");

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const { port } = server.address() as net.AddressInfo;
      server.close(() => resolve(port));
    });
  });
}

async function waitUntilServing(url: string, server: ChildProcess, log: () => string) {
  const deadline = Date.now() + 30_000;
  while (Date.now() < deadline) {
    if (server.exitCode !== null) throw new Error(`The app server exited early:\n${log()}`);
    try {
      const response = await fetch(url);
      if (response.ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`The app server did not answer within 30 s:\n${log()}`);
}

/** Serves the built app against the e2e database for the browser tests. */
export default async function serve(project: TestProject) {
  if (!existsSync(path.join(root, "build/server/index.js"))) {
    throw new Error("No build: run `npx react-router build` (npm test does) before the browser tests.");
  }
  // Failed sign-ins of earlier runs would still count for 15 minutes and lock the demo accounts.
  const orm = await MikroORM.init({ ...config, clientUrl: databaseUrl("e2e") });
  await orm.em.getConnection().execute("DELETE FROM sign_in_attempt");
  await orm.close(true);

  const port = await freePort();
  const mailFolder = mkdtempSync(path.join(os.tmpdir(), "visitwort-e2e-mail-"));
  const catcher = await startMailCatcher({ host: "127.0.0.1", port: 0, store: mailFolder });
  const storage = await startS3Fake({ port: 0, directory: mkdtempSync(path.join(os.tmpdir(), "visitwort-e2e-s3-")) });
  let output = "";
  const server = spawn(process.execPath, [path.join(root, "scripts/serve.js")], {
    cwd: root,
    env: { ...process.env, NODE_ENV: "production", HOST: "127.0.0.1", PORT: String(port), VISITWORT_DB: "e2e",
      MAIL_CATCHER_PORT: String(catcher.port),
      SMTP_URL: "",
      S3_ENDPOINT: "",
      S3_FAKE_PORT: String(storage.port),
      S3_ACCESS_KEY_ID: "",
      S3_SECRET_ACCESS_KEY: "",
      S3_BUCKET: "",
      MAIL_CATCHER_FOLDER: mailFolder,
    },
    stdio: ["ignore", "pipe", "pipe"],
  });
  server.stdout!.on("data", (chunk) => (output += chunk));
  server.stderr!.on("data", (chunk) => (output += chunk));
  const baseUrl = `http://127.0.0.1:${port}`;
  await waitUntilServing(`${baseUrl}/checklist`, server, () => output);
  project.provide("baseUrl", baseUrl);
  project.provide("mailFolder", mailFolder);
  return async () => {
    server.kill("SIGTERM");
    await new Promise((r) => server.once("exit", r));
    await catcher.close();
    await storage.close();
  };
}
