import { defineEntity, p, type InferEntity } from "@mikro-orm/core";

/**
 * Failed sign-ins counted by rate-limiter-flexible, in the table layout that package expects.
 * The app never writes it through the ORM; the entity exists so that migrations know the table
 * belongs here.
 */
export const SignInAttempt = defineEntity({
  name: "SignInAttempt",
  tableName: "sign_in_attempt",
  properties: {
    key: p.string().length(255).primary(),
    points: p.integer().default(0),
    expire: p.bigint().nullable(),
  },
});

export type SignInAttempt = InferEntity<typeof SignInAttempt>;
