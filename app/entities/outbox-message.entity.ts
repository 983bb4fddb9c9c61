import { defineEntity, p, type InferEntity } from "@mikro-orm/core";
import { baseProperties } from "./base.ts";

export const OUTBOX_STATUSES = ["pending", "sent", "failed"] as const;
export type OutboxStatus = (typeof OUTBOX_STATUSES)[number];

/**
 * An e-mail waiting to be sent, or sent, or given up on. It is written in the same transaction
 * as the change that caused it, so a rolled-back change sends nothing and an SMTP outage loses
 * nothing; the mail worker sends it later. Rows are kept after sending: they are the record of
 * what went out, and failed ones stay visible to the administrators.
 */
export const OutboxMessage = defineEntity({
  name: "OutboxMessage",
  tableName: "outbox_message",
  // The worker's only query: pending messages that are due. Sent rows keep their old times, so
  // an index on the time alone would grow slower as the record of sent mail grows.
  indexes: [{ name: "outbox_message_due_index", properties: ["status", "nextAttemptAt"] }],
  properties: {
    ...baseProperties,
    // 320 = a 64-octet local part, "@" and a 255-octet domain (RFC 5321 §4.5.3.1): the usual
    // upper bound for an address column.
    toAddress: p.string().length(320),
    subject: p.string().length(300),
    textBody: p.text(),
    htmlBody: p.text().nullable(),
    status: p.enum([...OUTBOX_STATUSES]).default("pending"),
    attempts: p.smallint().default(0),
    // The worker looks for pending messages due by now, oldest first.
    nextAttemptAt: p.datetime(),
    lastError: p.text().nullable(),
    sentAt: p.datetime().nullable(),
    // Which template built the message, so tests and the admin view can find a kind of mail
    // without matching on its wording.
    template: p.string().length(100),
  },
});

export type OutboxMessage = InferEntity<typeof OutboxMessage>;
