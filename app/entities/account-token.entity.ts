import { defineEntity, p, type InferEntity } from "@mikro-orm/core";
import { baseProperties } from "./base.ts";
import { User } from "./user.entity.ts";
import { ROLES } from "../auth/roles.ts";

/**
 * A single-use link sent by e-mail: an invitation (carrying the roles chosen by the
 * coordinator), a password reset, or the confirmation of a self-made account.
 */
export const AccountToken = defineEntity({
  name: "AccountToken",
  tableName: "account_token",
  properties: {
    ...baseProperties,
    purpose: p.enum(["invitation", "password_reset", "email_confirmation"]),
    email: p.string().length(320).index(),
    roles: p.array<(typeof ROLES)[number]>().default([]),
    user: () => p.manyToOne(User).nullable().deleteRule("cascade"),
    createdBy: () => p.manyToOne(User).nullable().deleteRule("set null"),
    tokenHash: p.string().length(64).unique(),
    expiresAt: p.datetime(),
    usedAt: p.datetime().nullable(),
  },
});

export type AccountToken = InferEntity<typeof AccountToken>;
