import { LockMode, type EntityManager } from "@mikro-orm/postgresql";
import type { SendMailOptions } from "nodemailer";
import { OutboxMessage } from "../entities/outbox-message.entity.ts";
import { createMailTransport, describeMailTarget, mailSender } from "./transport.server.ts";

/** What the outbox needs of a transport; a nodemailer transporter is one. */
export interface MailSender {
  sendMail(message: SendMailOptions): Promise<unknown>;
}

export interface QueuedMail {
  to: string;
  subject: string;
  text: string;
  html?: string | null;
  /** Which template built it ("invitation", "password_reset", …), for tests and the admin view. */
  template: string;
}

/** After this many failed attempts a message is marked failed: kept and shown, no longer tried. */
export const MAX_ATTEMPTS = 25;
const FIRST_RETRY_MS = 5_000;
const LONGEST_RETRY_MS = 10 * 60_000;

/**
 * The wait after the given number of failed attempts: 5 s, 10 s, 20 s … doubling up to 10 min.
 * Short at first so a relay that restarts costs seconds; capped so a long outage is still
 * retried every few minutes. With 25 attempts a message survives about three hours of outage.
 */
export function retryDelayMs(failedAttempts: number): number {
  const exponent = Math.max(0, failedAttempts - 1);
  // 2^7 × 5 s is already past the cap; stop there rather than compute huge powers.
  return Math.min(FIRST_RETRY_MS * 2 ** Math.min(exponent, 16), LONGEST_RETRY_MS);
}

const LIMITS = { to: 320, subject: 300, template: 100 };

function checkMail(mail: QueuedMail): QueuedMail {
  const to = mail.to.trim();
  // A line break in an address or subject would let a value end the header and start another;
  // nodemailer encodes headers, but such a value is a bug upstream, and should be refused there.
  if (!to.includes("@") || /[\r\n]/.test(to) || to.length > LIMITS.to) throw new Error(`Not a usable recipient address: "${mail.to}"`);
  if (/[\r\n]/.test(mail.subject) || mail.subject.length > LIMITS.subject) throw new Error(`Subject too long or with line breaks: "${mail.subject.slice(0, 80)}"`);
  if (!mail.template || mail.template.length > LIMITS.template) throw new Error(`Template name missing or too long: "${mail.template}"`);
  return { ...mail, to };
}

/**
 * Puts a message into the outbox with the caller's unit of work: it is written by the caller's
 * flush or transaction, together with the change that caused it, so a rolled-back change sends
 * nothing. Sending happens later, in the mail worker.
 */
export function queueMail(em: EntityManager, mail: QueuedMail): OutboxMessage {
  const checked = checkMail(mail);
  const message = em.create(OutboxMessage, {
    toAddress: checked.to,
    subject: checked.subject,
    textBody: checked.text,
    htmlBody: checked.html ?? null,
    template: checked.template,
    nextAttemptAt: new Date(),
  });
  em.persist(message);
  return message;
}

/** queueMail for a caller with nothing else to write. */
export async function queueMailAndFlush(em: EntityManager, mail: QueuedMail): Promise<OutboxMessage> {
  const message = queueMail(em, mail);
  await em.flush();
  return message;
}

export interface DeliveryOptions {
  /** The clock: what is due, and when a retry is due (tests move it forward). */
  now?: Date;
  /** At most this many messages in one call. */
  batchSize?: number;
}

export interface DeliveryResult {
  sent: number;
  retried: number;
  failed: number;
}

function describeError(error: unknown): string {
  if (!(error instanceof Error)) return String(error).slice(0, 2000);
  const { code, responseCode } = error as Error & { code?: string; responseCode?: number };
  return [code, responseCode, error.message].filter((part) => part !== undefined && part !== "").join(" ").slice(0, 2000);
}

// The host part of the sender address; Message-IDs carry it so they are unique to this sender.
function senderDomain(): string {
  return /@([^>\s]+)/.exec(mailSender())?.[1] ?? "visitwort.test";
}

/**
 * Sends at most one due message. Its row stays locked (FOR UPDATE SKIP LOCKED) from the moment
 * it is chosen until its new state is committed: a second worker skips it and takes the next
 * one, and if this process dies mid-send the lock goes with its connection and the message is
 * tried again. One transaction per message keeps each lock short and lets one failure never
 * undo the record of messages already sent.
 */
async function deliverOne(em: EntityManager, transport: MailSender, now: Date): Promise<keyof DeliveryResult | null> {
  return em.fork().transactional(async (tx) => {
    const [message] = await tx.find(
      OutboxMessage,
      { status: "pending", nextAttemptAt: { $lte: now } },
      { orderBy: { nextAttemptAt: "asc", id: "asc" }, limit: 1, lockMode: LockMode.PESSIMISTIC_PARTIAL_WRITE },
    );
    if (!message) return null;
    try {
      await transport.sendMail({
        to: message.toAddress,
        subject: message.subject,
        text: message.textBody,
        html: message.htmlBody ?? undefined,
        // Fixed per outbox row: if the commit below is lost after the relay took the message,
        // the retry carries the same Message-ID and the duplicate can be recognised.
        messageId: `<outbox.${message.id}.${message.createdAt.getTime()}@${senderDomain()}>`,
      });
      message.status = "sent";
      message.sentAt = now;
      return "sent";
    } catch (error) {
      message.attempts += 1;
      message.lastError = describeError(error);
      if (message.attempts >= MAX_ATTEMPTS) {
        message.status = "failed";
        return "failed";
      }
      message.nextAttemptAt = new Date(now.getTime() + retryDelayMs(message.attempts));
      return "retried";
    }
  });
}

/**
 * Sends the messages that are due, oldest first. Safe to run from several processes at once:
 * each message is sent by one of them. A failed send is rescheduled with a growing delay and
 * recorded in lastError; nothing is deleted.
 */
export async function deliverPendingMail(
  em: EntityManager,
  transport: MailSender,
  { now, batchSize = 20 }: DeliveryOptions = {},
): Promise<DeliveryResult> {
  const result: DeliveryResult = { sent: 0, retried: 0, failed: 0 };
  for (let i = 0; i < batchSize; i++) {
    const outcome = await deliverOne(em, transport, now ?? new Date());
    if (!outcome) break;
    result[outcome]++;
  }
  return result;
}

export interface OutboxWorkerOptions {
  /** Default: a fresh createMailTransport() per pass, so a restarted catcher's new port is found. */
  transport?: MailSender;
  intervalMs?: number;
  batchSize?: number;
  logger?: Pick<Console, "info" | "warn" | "error">;
}

/**
 * Polls the outbox and sends what is due, in this process, until the returned stop function is
 * called. Passes never overlap; a pass that fails (database down) is logged and the next one
 * tries again. The timer does not keep the process alive. VISITWORT_MAIL_WORKER=off disables it
 * (a second server process that should leave sending to the first, say).
 */
export function startOutboxWorker(
  getEm: () => EntityManager | Promise<EntityManager>,
  { transport, intervalMs = 2_000, batchSize = 20, logger = console }: OutboxWorkerOptions = {},
): () => Promise<void> {
  if (process.env.VISITWORT_MAIL_WORKER === "off") {
    logger.info("· mail worker off (VISITWORT_MAIL_WORKER=off): queued e-mail stays in the outbox");
    return async () => {};
  }
  logger.info(`· mail worker on: sending to ${describeMailTarget()}`);

  let stopped = false;
  let timer: ReturnType<typeof setTimeout> | undefined;
  let running: Promise<void> | undefined;
  let lastProblem = { text: "", at: 0 };

  async function pass(): Promise<boolean> {
    const sender = transport ?? createMailTransport();
    try {
      const result = await deliverPendingMail(await getEm(), sender, { batchSize });
      if (result.sent || result.retried || result.failed) {
        logger.info(`· mail: ${result.sent} sent, ${result.retried} to retry, ${result.failed} failed for good`);
      }
      if (result.failed) logger.warn(`· mail: ${result.failed} message(s) gave up after ${MAX_ATTEMPTS} attempts; see the outbox`);
      lastProblem = { text: "", at: 0 };
      return result.sent + result.retried + result.failed >= batchSize;
    } catch (error) {
      // Every two seconds during a database outage would bury the log: repeat a message at
      // most once a minute.
      const text = describeError(error);
      if (text !== lastProblem.text || Date.now() - lastProblem.at > 60_000) {
        logger.error(`· mail worker: ${text}`);
        lastProblem = { text, at: Date.now() };
      }
      return false;
    } finally {
      if (!transport && "close" in sender) (sender as { close(): void }).close();
    }
  }

  function schedule(delay: number) {
    if (stopped) return;
    timer = setTimeout(() => {
      running = pass().then((moreWaiting) => {
        running = undefined;
        // A full batch means more are due: go on at once instead of waiting a whole interval.
        schedule(moreWaiting ? 0 : intervalMs);
      });
    }, delay);
    timer.unref();
  }
  schedule(intervalMs);

  return async () => {
    stopped = true;
    clearTimeout(timer);
    await running;
  };
}
