import { defineEntity, p, type InferEntity } from "@mikro-orm/core";
import { baseProperties } from "./base.ts";
import { User } from "./user.entity.ts";

/** A personal token for the JSON API, shown once; only its SHA-256 is kept. */
export const ApiToken = defineEntity({
  name: "ApiToken",
  tableName: "api_token",
  properties: {
    ...baseProperties,
    user: () => p.manyToOne(User).deleteRule("cascade").index(),
    label: p.string().length(100),
    tokenHash: p.string().length(64).unique(),
    // The first characters, so a person can tell their tokens apart in the list.
    prefix: p.string().length(16),
    lastUsedAt: p.datetime().nullable(),
    revokedAt: p.datetime().nullable(),
  },
});

export type ApiToken = InferEntity<typeof ApiToken>;
