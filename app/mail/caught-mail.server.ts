import { existsSync } from "node:fs";
import { readdir, readFile } from "node:fs/promises";
import path from "node:path";
import { projectRoot } from "../db/database-url.server.ts";

/** One message received by the local mail catcher, as stored in .data/mail/<id>.json. */
export interface CaughtMail {
  /** Starts with the receiving time (UTC, to the millisecond), so names sort by time. */
  id: string;
  receivedAt: string;
  from: string;
  /** The envelope recipients: who the message was actually handed over for. */
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  messageId: string | null;
}

export const caughtMailFolder = process.env.MAIL_CATCHER_FOLDER ?? path.join(projectRoot, ".data", "mail");

/** The newest caught messages first; none when the catcher never ran. */
export async function listCaughtMail(limit = 50, folder = caughtMailFolder): Promise<CaughtMail[]> {
  if (!existsSync(folder)) return [];
  const names = (await readdir(folder))
    .filter((name) => name.endsWith(".json"))
    .sort()
    .reverse()
    .slice(0, Math.max(0, limit));
  const messages: CaughtMail[] = [];
  for (const name of names) {
    try {
      messages.push(JSON.parse(await readFile(path.join(folder, name), "utf8")) as CaughtMail);
    } catch {
      // A file removed by hand while we list, or edited into invalid JSON: leave it out
      // rather than break the dev page.
    }
  }
  return messages;
}
