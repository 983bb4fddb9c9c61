import { defineEntity, p, type InferEntity } from "@mikro-orm/core";
import { baseProperties } from "./base.ts";
import { ROLES } from "../auth/roles.ts";

/** A person in the programme. E-mail addresses are stored lower-cased so they match however typed. */
export const User = defineEntity({
  name: "User",
  tableName: "app_user",
  properties: {
    ...baseProperties,
    email: p.string().length(320).unique(),
    name: p.string().length(200),
    // scrypt parameters, salt and hash in one string (see app/auth/password.server.ts).
    passwordHash: p.string().length(400),
    roles: p.array<(typeof ROLES)[number]>().default([]),
    status: p.enum(["active", "deactivated"]).default("active"),
    emailConfirmedAt: p.datetime().nullable(),
    lastSignInAt: p.datetime().nullable(),
    // How a recorder hears what became of their visits: an e-mail each time, or one a day.
    noticePreference: p.enum(["each", "daily_digest", "none"]).default("each"),
    lastDigestAt: p.datetime().nullable(),
  },
});

export type User = InferEntity<typeof User>;
