import type { EntityManager } from "@mikro-orm/postgresql";
import { RateLimiterPostgres } from "rate-limiter-flexible";
import { Authenticator } from "remix-auth";
import { FormStrategy } from "remix-auth-form";
import { User } from "../entities/index.ts";
import { decoyPasswordHash, verifyPassword } from "./password.server.ts";
import { fieldErrors, signInForm, formToObject, type FieldErrors } from "./account-schemas.ts";

/**
 * Failed sign-ins are counted per account and per client address in PostgreSQL (table
 * sign_in_attempt, created by a migration), so the limit holds across restarts and processes.
 * Five failures in fifteen minutes lock an account for the rest of the window (common practice,
 * no source; NIST SP 800-63B §5.2.2 asks for a limit of at most 100). One address gets more,
 * since a workshop may share one.
 */
export const ACCOUNT_FAILURES_ALLOWED = 5;
export const ADDRESS_FAILURES_ALLOWED = 20;
const WINDOW_SECONDS = 15 * 60;

export class SignInRefused extends Error {
  constructor(
    message: string,
    readonly fields: FieldErrors = {},
    readonly retryAfterSeconds?: number,
  ) {
    super(message);
    this.name = "SignInRefused";
  }
}

function limiters(em: EntityManager) {
  const knex = em.getKnex();
  const common = { storeClient: knex, storeType: "knex", tableName: "sign_in_attempt", tableCreated: true, duration: WINDOW_SECONDS, clearExpiredByTimeout: false };
  return {
    account: new RateLimiterPostgres({ ...common, keyPrefix: "account", points: ACCOUNT_FAILURES_ALLOWED }),
    address: new RateLimiterPostgres({ ...common, keyPrefix: "address", points: ADDRESS_FAILURES_ALLOWED }),
  };
}

/** The client's address as the server in front of the app saw it. */
export function clientAddress(request: Request): string {
  return request.headers.get("x-visitwort-client-address") ?? "unknown";
}

const minutes = (ms: number) => Math.max(1, Math.ceil(ms / 60_000));

async function checkSignIn(em: EntityManager, form: FormData, address: string): Promise<User> {
  const parsed = signInForm.safeParse(formToObject(form));
  if (!parsed.success) throw new SignInRefused("Check the highlighted fields.", fieldErrors(parsed.error));
  const { email, password } = parsed.data;
  const limit = limiters(em);

  const [accountState, addressState] = await Promise.all([limit.account.get(email), limit.address.get(address)]);
  const blocked = [
    accountState && accountState.consumedPoints >= ACCOUNT_FAILURES_ALLOWED ? accountState : null,
    addressState && addressState.consumedPoints >= ADDRESS_FAILURES_ALLOWED ? addressState : null,
  ].filter((s) => s !== null);
  if (blocked.length > 0) {
    const wait = Math.max(...blocked.map((s) => s.msBeforeNext));
    throw new SignInRefused(
      `Too many failed sign-ins. Wait ${minutes(wait)} minute${minutes(wait) === 1 ? "" : "s"} and try again, or reset your password.`,
      {},
      Math.ceil(wait / 1000),
    );
  }

  const user = await em.findOne(User, { email });
  const matches = await verifyPassword(password, user?.passwordHash ?? (await decoyPasswordHash()));
  if (!user || !matches) {
    // Consuming past the limit rejects with the limiter's state; the count is what matters.
    await Promise.allSettled([limit.account.penalty(email, 1), limit.address.penalty(address, 1)]);
    throw new SignInRefused("That e-mail address and password do not match an account.");
  }
  if (user.status !== "active") {
    throw new SignInRefused("This account has been deactivated. Ask a coordinator if you think this is a mistake.");
  }
  if (!user.emailConfirmedAt) {
    throw new SignInRefused("Confirm your e-mail address first: open the link we sent when you signed up.");
  }
  await limit.account.delete(email);
  return user;
}

/** remix-auth with the form strategy; the verify step is `checkSignIn`. */
export function signInAuthenticator(em: EntityManager, request: Request) {
  const authenticator = new Authenticator<User>();
  authenticator.use(new FormStrategy(async ({ form }) => checkSignIn(em, form, clientAddress(request))), "form");
  return authenticator;
}

export async function signIn(em: EntityManager, request: Request): Promise<User> {
  return signInAuthenticator(em, request).authenticate("form", request);
}
