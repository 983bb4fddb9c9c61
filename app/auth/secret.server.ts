import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { projectRoot } from "../db/database-url.server.ts";

/**
 * The key that signs session cookies: SESSION_SECRET from the environment in a deployment;
 * for local runs one is generated on first use into the git-ignored .data folder.
 */
export function sessionSecret(): string {
  if (process.env.SESSION_SECRET) return process.env.SESSION_SECRET;
  const file = path.join(projectRoot, ".data", "session-secret");
  if (!existsSync(file)) {
    mkdirSync(path.dirname(file), { recursive: true });
    writeFileSync(file, randomBytes(32).toString("base64url"), { mode: 0o600, flag: "wx" });
  }
  return readFileSync(file, "utf8").trim();
}
