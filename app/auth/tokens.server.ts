import { createHash, randomBytes } from "node:crypto";

/** A random secret for a link or a token, URL-safe; 32 bytes = 256 bits. */
export function newSecret(bytes = 32): string {
  return randomBytes(bytes).toString("base64url");
}

/** What is stored in place of a secret: its SHA-256, hex. */
export function digest(secret: string): string {
  return createHash("sha256").update(secret).digest("hex");
}
