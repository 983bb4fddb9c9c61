import type { MikroORM } from "@mikro-orm/postgresql";
import { afterEach, describe, expect, it, vi } from "vitest";
import { OutboxMessage } from "~/entities/outbox-message.entity";
import { startMailCatcher, type MailCatcher } from "~/mail/catcher.server";
import {
  MAX_ATTEMPTS,
  deliverPendingMail,
  queueMail,
  queueMailAndFlush,
  retryDelayMs,
  startOutboxWorker,
  type QueuedMail,
} from "~/mail/outbox.server";
import { escapeHtml, invitationMail } from "~/mail/templates";
import { createMailTransport, mailSender } from "~/mail/transport.server";
import { useEmptyTestDatabase } from "../support/database";

let orm: MikroORM;
const catchers: MailCatcher[] = [];

useEmptyTestDatabase((opened) => (orm = opened));
afterEach(async () => {
  await Promise.all(catchers.splice(0).map((catcher) => catcher.close()));
  vi.unstubAllEnvs();
});

async function catcherOn(port: number, onMessage?: () => Promise<void>) {
  const catcher = await startMailCatcher({ port, host: "127.0.0.1", store: null, onMessage });
  catchers.push(catcher);
  return catcher;
}

/** A port on which nothing listens: a catcher's, closed again. */
async function deadPort() {
  const catcher = await startMailCatcher({ port: 0, host: "127.0.0.1", store: null });
  await catcher.close();
  return catcher.port;
}

const transportTo = (port: number) => createMailTransport({ host: "127.0.0.1", port });

const rows = () => orm.em.fork().find(OutboxMessage, {}, { orderBy: { id: "asc" } });

// Longer than a quoted-printable line (76 characters), with an ampersand: it arrives in soft
// line breaks and must come out whole.
const inviteUrl = "https://visitwort.test/invite/Zm9yYWdlLXJhbmtpbmctdGVzdC10b2tlbi0wMDAx?next=%2Fvisits%2Fnew&lang=en";

function invitation(to = "new.recorder@example.test"): QueuedMail {
  const content = invitationMail({
    inviteUrl,
    roles: ["recorder"],
    invitedByName: "Sam Example",
    expiresAt: new Date("2026-12-09T14:05:00Z"),
  });
  return { to, ...content, template: "invitation" };
}

function note(subject: string): QueuedMail {
  return { to: "someone@example.test", subject, text: `${subject}\n`, template: "test" };
}

describe("the outbox", () => {
  it("delivers a queued message with its subject and link intact", async () => {
    const catcher = await catcherOn(0);
    const queued = invitation();
    await queueMailAndFlush(orm.em.fork(), queued);

    const result = await deliverPendingMail(orm.em.fork(), transportTo(catcher.port));

    expect(result).toEqual({ sent: 1, retried: 0, failed: 0 });
    expect(catcher.messages).toHaveLength(1);
    const [mail] = catcher.messages;
    // common practice, no source: what was queued is what arrives.
    expect(mail!.subject).toBe(queued.subject);
    expect(mail!.to).toEqual(["new.recorder@example.test"]);
    expect(mail!.from).toContain(/<(.+)>/.exec(mailSender())![1]);
    // RFC 2045 §6.7 rule 5: a soft line break ("=" at the end of an encoded line) is removed on
    // decoding, so a link longer than a line arrives in one piece.
    expect(mail!.text).toContain(inviteUrl);
    expect(mail!.html).toContain(`href="${escapeHtml(inviteUrl)}"`);

    const [row] = await rows();
    expect(row!.status).toBe("sent");
    expect(row!.sentAt).toBeInstanceOf(Date);
    expect(row!.attempts).toBe(0);
    expect(row!.template).toBe("invitation");
    // RFC 5322 §3.6.4: the Message-ID is the sender's to set; ours is fixed per outbox row.
    expect(mail!.messageId).toBe(`<outbox.${row!.id}.${row!.createdAt.getTime()}@visitwort.test>`);
  });

  it("keeps a message through an SMTP outage and delivers it once the relay is back", async () => {
    const port = await deadPort();
    await queueMailAndFlush(orm.em.fork(), invitation());
    const now = new Date();

    const during = await deliverPendingMail(orm.em.fork(), transportTo(port), { now });

    expect(during).toEqual({ sent: 0, retried: 1, failed: 0 });
    const [waiting] = await rows();
    expect(waiting!.status).toBe("pending");
    expect(waiting!.attempts).toBe(1);
    // Node.js net: a connection to a port nobody listens on fails with ECONNREFUSED.
    expect(waiting!.lastError).toMatch(/ECONNREFUSED/);
    expect(waiting!.nextAttemptAt.getTime()).toBe(now.getTime() + retryDelayMs(1));

    const catcher = await catcherOn(port);
    // Not due yet: the relay being back changes nothing before the retry time.
    expect(await deliverPendingMail(orm.em.fork(), transportTo(port), { now })).toEqual({ sent: 0, retried: 0, failed: 0 });
    expect(catcher.messages).toHaveLength(0);

    const later = new Date(waiting!.nextAttemptAt.getTime() + 1_000);
    expect(await deliverPendingMail(orm.em.fork(), transportTo(port), { now: later })).toEqual({ sent: 1, retried: 0, failed: 0 });
    // A further pass finds nothing: sent is sent.
    expect(await deliverPendingMail(orm.em.fork(), transportTo(port), { now: new Date(later.getTime() + 3_600_000) })).toEqual({
      sent: 0,
      retried: 0,
      failed: 0,
    });

    // common practice, no source: exactly once, link intact, record kept.
    expect(catcher.messages).toHaveLength(1);
    expect(catcher.messages[0]!.text).toContain(inviteUrl);
    const [delivered] = await rows();
    expect(delivered!.status).toBe("sent");
    expect(delivered!.sentAt!.getTime()).toBe(later.getTime());
    expect(delivered!.attempts).toBe(1);
    expect(delivered!.lastError).toMatch(/ECONNREFUSED/);
  });

  it("has two workers at once deliver every message exactly once", async () => {
    // A slow relay keeps each sender's row locked long enough for the other to run beside it.
    const catcher = await catcherOn(0, () => new Promise((resolve) => setTimeout(resolve, 100)));
    const subjects = ["one", "two", "three", "four", "five", "six"].map((n) => `Concurrent ${n}`);
    const em = orm.em.fork();
    for (const subject of subjects) queueMail(em, note(subject));
    await em.flush();

    const [a, b] = await Promise.all([
      deliverPendingMail(orm.em.fork(), transportTo(catcher.port)),
      deliverPendingMail(orm.em.fork(), transportTo(catcher.port)),
    ]);

    // PostgreSQL documentation, SELECT, "The Locking Clause": with SKIP LOCKED, rows that
    // cannot be locked immediately are skipped, so no row is taken by both workers.
    expect(a.sent + b.sent).toBe(subjects.length);
    expect(a.sent).toBeGreaterThan(0);
    expect(b.sent).toBeGreaterThan(0);
    expect(catcher.messages.map((m) => m.subject).sort()).toEqual([...subjects].sort());
    expect((await rows()).every((row) => row.status === "sent" && row.attempts === 0)).toBe(true);
  });

  it("waits longer after each failure, up to a cap, and keeps the message when it gives up", async () => {
    // Our own policy (capped exponential backoff is common practice, no source): 5 s doubling,
    // never more than 10 minutes.
    expect([1, 2, 3, 4, 5, 6, 7, 8, 9, 24].map(retryDelayMs)).toEqual([
      5_000, 10_000, 20_000, 40_000, 80_000, 160_000, 320_000, 600_000, 600_000, 600_000,
    ]);

    const port = await deadPort();
    await queueMailAndFlush(orm.em.fork(), note("Never arrives"));
    let now = new Date();
    const waits: number[] = [];
    let last = { sent: 0, retried: 0, failed: 0 };
    for (let attempt = 1; attempt <= MAX_ATTEMPTS; attempt++) {
      last = await deliverPendingMail(orm.em.fork(), transportTo(port), { now });
      const [row] = await rows();
      expect(row!.attempts).toBe(attempt);
      if (row!.status === "pending") {
        waits.push(row!.nextAttemptAt.getTime() - now.getTime());
        now = row!.nextAttemptAt;
      }
    }

    expect(waits).toHaveLength(MAX_ATTEMPTS - 1);
    for (let i = 1; i < waits.length; i++) expect(waits[i]).toBeGreaterThanOrEqual(waits[i - 1]!);
    expect(Math.max(...waits)).toBe(600_000);
    expect(last).toEqual({ sent: 0, retried: 0, failed: 1 });

    const [given] = await rows();
    expect(given!.status).toBe("failed");
    expect(given!.lastError).toMatch(/ECONNREFUSED/);
    // Failed is final: a later pass leaves it alone, and the row stays.
    expect(await deliverPendingMail(orm.em.fork(), transportTo(port), { now: new Date(now.getTime() + 86_400_000) })).toEqual({
      sent: 0,
      retried: 0,
      failed: 0,
    });
    expect(await rows()).toHaveLength(1);
  });

  it("writes nothing when the caller's transaction rolls back", async () => {
    await expect(
      orm.em.fork().transactional(async (tx) => {
        queueMail(tx, invitation());
        await tx.flush();
        throw new Error("the invitation could not be saved");
      }),
    ).rejects.toThrow("could not be saved");
    // PostgreSQL documentation, ROLLBACK: all the updates made by the transaction are
    // discarded, the queued message with them.
    expect(await rows()).toHaveLength(0);
  });

  it("refuses a recipient with a line break", () => {
    // RFC 5322 §2.2: a header field ends at CRLF, so a line break in a value would start a new
    // header.
    expect(() => queueMail(orm.em.fork(), { ...note("x"), to: "a@example.test\r\nBcc: b@example.test" })).toThrow(/recipient/);
  });
});

describe("the outbox worker", () => {
  const quiet = { info: () => {}, warn: () => {}, error: () => {} };

  it("sends what is queued while it runs, and stops", async () => {
    const catcher = await catcherOn(0);
    const stop = startOutboxWorker(() => orm.em.fork(), { transport: transportTo(catcher.port), intervalMs: 50, logger: quiet });
    try {
      await queueMailAndFlush(orm.em.fork(), invitation());
      await vi.waitFor(() => expect(catcher.messages).toHaveLength(1), { timeout: 5_000, interval: 50 });
    } finally {
      await stop();
    }
    // common practice, no source
    expect((await rows())[0]!.status).toBe("sent");
  });

  it("does nothing when VISITWORT_MAIL_WORKER=off", async () => {
    vi.stubEnv("VISITWORT_MAIL_WORKER", "off");
    const catcher = await catcherOn(0);
    await queueMailAndFlush(orm.em.fork(), invitation());
    const stop = startOutboxWorker(() => orm.em.fork(), { transport: transportTo(catcher.port), intervalMs: 20, logger: quiet });
    await new Promise((resolve) => setTimeout(resolve, 200));
    await stop();
    // common practice, no source
    expect(catcher.messages).toHaveLength(0);
    expect((await rows())[0]!.status).toBe("pending");
  });

  it("logs a failing pass and goes on", async () => {
    const errors: string[] = [];
    let calls = 0;
    const stop = startOutboxWorker(
      async () => {
        calls++;
        throw new Error("database unreachable");
      },
      { transport: transportTo(await deadPort()), intervalMs: 20, logger: { ...quiet, error: (m: string) => errors.push(m) } },
    );
    await vi.waitFor(() => expect(calls).toBeGreaterThanOrEqual(3), { timeout: 5_000, interval: 20 });
    await stop();
    // common practice, no source: one line for a repeated problem, not one per pass.
    expect(errors).toEqual(["· mail worker: database unreachable"]);
  });
});
