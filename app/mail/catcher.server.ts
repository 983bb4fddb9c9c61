import { randomBytes } from "node:crypto";
import { mkdirSync, renameSync, writeFileSync } from "node:fs";
import type { AddressInfo } from "node:net";
import path from "node:path";
import { simpleParser } from "mailparser";
import { SMTPServer, type SMTPServerDataStream, type SMTPServerSession } from "smtp-server";
import type { CaughtMail } from "./caught-mail.server.ts";

/**
 * A local SMTP server that accepts every message and keeps it instead of delivering it: for
 * development (scripts/mail-catcher.ts writes each message into .data/mail/) and for tests (an
 * in-process catcher on a free port). Development and test code only: smtp-server and
 * mailparser are dev dependencies, so the app must never import this module.
 */
export interface MailCatcherOptions {
  /** 0 takes any free port. */
  port: number;
  host?: string;
  /** Awaited before the message is acknowledged; a rejection becomes a temporary SMTP error. */
  onMessage?: (mail: CaughtMail) => void | Promise<void>;
  /** Folder for one JSON file per message; null keeps messages in memory only. */
  store?: string | null;
}

export interface MailCatcher {
  port: number;
  host: string;
  /** Every message received so far, oldest first. */
  messages: CaughtMail[];
  close(): Promise<void>;
}

// Large enough for any mail the app writes, small enough that a runaway sender cannot fill the
// memory of a development machine.
const MAX_MESSAGE_BYTES = 10 * 1024 * 1024;

let sequence = 0;

function messageId(receivedAt: Date): string {
  // Time first (compact ISO form, no characters a file system dislikes), then a per-process
  // counter and a random tail, so the file names sort by arrival and never collide.
  const time = receivedAt.toISOString().replace(/[-:.]/g, "");
  sequence = (sequence + 1) % 1_000_000;
  return `${time}-${String(sequence).padStart(6, "0")}-${randomBytes(3).toString("hex")}`;
}

function smtpError(message: string, responseCode: number) {
  return Object.assign(new Error(message), { responseCode });
}

async function readStream(stream: SMTPServerDataStream): Promise<Buffer> {
  const chunks: Buffer[] = [];
  for await (const chunk of stream) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks);
}

function storeMessage(folder: string, mail: CaughtMail) {
  mkdirSync(folder, { recursive: true });
  const file = path.join(folder, `${mail.id}.json`);
  // Written under another name, then renamed: a reader listing *.json never sees half a file.
  writeFileSync(`${file}.partial`, JSON.stringify(mail, null, 2) + "\n");
  renameSync(`${file}.partial`, file);
}

export function startMailCatcher(options: MailCatcherOptions): Promise<MailCatcher> {
  const host = options.host ?? "127.0.0.1";
  const store = options.store ?? null;
  const messages: CaughtMail[] = [];

  async function receive(stream: SMTPServerDataStream, session: SMTPServerSession): Promise<void> {
    const raw = await readStream(stream);
    if (stream.sizeExceeded) throw smtpError("Message exceeds the catcher's size limit", 552);
    const parsed = await simpleParser(raw);
    const receivedAt = new Date();
    const mail: CaughtMail = {
      id: messageId(receivedAt),
      receivedAt: receivedAt.toISOString(),
      from: parsed.from?.text ?? (session.envelope.mailFrom ? session.envelope.mailFrom.address : ""),
      to: session.envelope.rcptTo.map((recipient) => recipient.address),
      subject: parsed.subject ?? "",
      text: parsed.text ?? "",
      html: typeof parsed.html === "string" ? parsed.html : null,
      messageId: parsed.messageId ?? null,
    };
    if (store) storeMessage(store, mail);
    messages.push(mail);
    await options.onMessage?.(mail);
  }

  const server = new SMTPServer({
    secure: false,
    disabledCommands: ["STARTTLS"],
    authOptional: true,
    // Senders configured with a user name and password still get in: any login is accepted,
    // and without TLS (there is none on the loopback catcher).
    allowInsecureAuth: true,
    onAuth(auth, _session, callback) {
      callback(null, { user: auth.username ?? "anyone" });
    },
    size: MAX_MESSAGE_BYTES,
    logger: false,
    banner: "Visitwort mail catcher: messages are kept, never delivered",
    // Tests stop and restart the catcher often; do not wait the default half minute for
    // clients that hang on.
    closeTimeout: 1_000,
    onData(stream, session, callback) {
      receive(stream, session).then(
        () => callback(),
        (error: Error & { responseCode?: number }) => {
          // Drain whatever is left, or the client waits for an answer that never comes.
          stream.resume();
          callback(error.responseCode ? error : smtpError(`Catcher could not keep the message: ${error.message}`, 451));
        },
      );
    },
  });

  return new Promise((resolve, reject) => {
    const onStartError = (error: Error) => reject(error);
    server.once("error", onStartError);
    const listener = server.listen(options.port, host, () => {
      server.off("error", onStartError);
      // Later errors (a client resetting its connection) must not crash the process.
      server.on("error", () => {});
      const port = (listener.address() as AddressInfo).port;
      resolve({
        port,
        host,
        messages,
        close: () => new Promise<void>((done) => server.close(() => done())),
      });
    });
  });
}
