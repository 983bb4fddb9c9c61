import { defineEntity, p, type InferEntity } from "@mikro-orm/core";
import { User } from "./user.entity.ts";

/**
 * A signed-in browser. The cookie carries a random token; only its SHA-256 is stored, so a copy
 * of the table cannot be used to sign in. Deleting the row signs the browser out at once.
 */
export const Session = defineEntity({
  name: "Session",
  tableName: "user_session",
  properties: {
    id: p.string().length(64).primary(),
    user: () => p.manyToOne(User).deleteRule("cascade").index(),
    createdAt: p.datetime().onCreate(() => new Date()),
    lastSeenAt: p.datetime().onCreate(() => new Date()),
    expiresAt: p.datetime().index(),
    userAgent: p.string().length(300).default(""),
  },
});

export type Session = InferEntity<typeof Session>;
