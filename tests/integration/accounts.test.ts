import type { MikroORM } from "@mikro-orm/postgresql";
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import {
  acceptInvitation,
  AccountError,
  createUser,
  findUsableToken,
  inviteUser,
  requestPasswordReset,
  resetPassword,
  setStatus,
  signUp,
  confirmEmail,
} from "~/auth/accounts.server";
import { writeSetting } from "~/admin/settings.server";
import { signIn, SignInRefused } from "~/auth/sign-in.server";
import { findSessionUser, startSession } from "~/auth/session.server";
import { AccountToken, OutboxMessage, Session } from "~/entities";
import { startMailCatcher, type MailCatcher } from "~/mail/catcher.server";
import { deliverPendingMail } from "~/mail/outbox.server";
import { createMailTransport } from "~/mail/transport.server";
import { emptyAllTables, openTestOrm } from "../support/database";
import { formPost } from "../support/requests";

let orm: MikroORM;
let catcher: MailCatcher;

beforeAll(async () => {
  orm = await openTestOrm();
  catcher = await startMailCatcher({ host: "127.0.0.1", port: 0, store: null });
});
afterAll(async () => {
  await catcher.close();
  await orm.close(true);
});
beforeEach(async () => {
  await emptyAllTables(orm);
  catcher.messages.length = 0;
});
afterEach(() => {
  vi.useRealTimers();
});

const ORIGIN = "http://127.0.0.1:3000";

async function deliverMail() {
  await deliverPendingMail(orm.em.fork(), createMailTransport({ host: "127.0.0.1", port: catcher.port }));
}

/** The link in the last caught e-mail to `to`. */
function linkSentTo(to: string, path: string): string {
  const message = catcher.messages.filter((m) => m.to.includes(to)).at(-1);
  expect(message, `an e-mail to ${to}`).toBeDefined();
  const match = message!.text.match(new RegExp(`${ORIGIN}${path}/([\\w-]+)`));
  expect(match, `a ${path} link in the e-mail`).not.toBeNull();
  return match![1]!;
}

async function coordinator() {
  return createUser(orm.em.fork(), { email: "coord@example.org", name: "Coordinator", password: "long enough password", roles: ["coordinator"] });
}

describe("joining by invitation", () => {
  it("invite → e-mail → accept → sign in with the chosen password and roles", async () => {
    const inviter = await coordinator();
    await inviteUser(orm.em.fork(), { email: "new.recorder@example.org", roles: ["recorder", "botanist"], invitedById: inviter.id, origin: ORIGIN });
    await deliverMail();
    const secret = linkSentTo("new.recorder@example.org", "/invite");

    const user = await acceptInvitation(orm.em.fork(), secret, { name: "New Recorder", password: "a fresh long password" });
    expect(user.roles).toEqual(["recorder", "botanist"]);

    const signedIn = await signIn(orm.em.fork(), formPost("/login", { email: "New.Recorder@example.org", password: "a fresh long password" }));
    expect(signedIn.id).toBe(user.id);
  });

  it("works once only", async () => {
    const inviter = await coordinator();
    await inviteUser(orm.em.fork(), { email: "once@example.org", roles: ["recorder"], invitedById: inviter.id, origin: ORIGIN });
    await deliverMail();
    const secret = linkSentTo("once@example.org", "/invite");
    await acceptInvitation(orm.em.fork(), secret, { name: "Once", password: "a fresh long password" });
    await expect(acceptInvitation(orm.em.fork(), secret, { name: "Twice", password: "another long password" })).rejects.toBeInstanceOf(AccountError);
  });

  it("expires after 7 days", async () => {
    const inviter = await coordinator();
    await inviteUser(orm.em.fork(), { email: "late@example.org", roles: ["recorder"], invitedById: inviter.id, origin: ORIGIN });
    await deliverMail();
    const secret = linkSentTo("late@example.org", "/invite");
    const sixDays = new Date(Date.now() + 6 * 24 * 3600 * 1000);
    const eightDays = new Date(Date.now() + 8 * 24 * 3600 * 1000);
    expect(await findUsableToken(orm.em.fork(), secret, "invitation", sixDays)).not.toBeNull();
    expect(await findUsableToken(orm.em.fork(), secret, "invitation", eightDays)).toBeNull();
  });

  it("is refused for an address that already has an account, and nothing is queued", async () => {
    const inviter = await coordinator();
    await expect(
      inviteUser(orm.em.fork(), { email: "coord@example.org", roles: ["recorder"], invitedById: inviter.id, origin: ORIGIN }),
    ).rejects.toBeInstanceOf(AccountError);
    expect(await orm.em.fork().count(OutboxMessage, {})).toBe(0);
    expect(await orm.em.fork().count(AccountToken, {})).toBe(0);
  });
});

describe("password reset", () => {
  it("sends a link that sets a new password, once, and signs out every session", async () => {
    const user = await createUser(orm.em.fork(), { email: "forgetful@example.org", name: "F", password: "the old long password", roles: ["recorder"] });
    const cookie = await startSession(orm.em.fork(), user, formPost("/login", {}));
    await requestPasswordReset(orm.em.fork(), { email: "forgetful@example.org", origin: ORIGIN });
    await deliverMail();
    const secret = linkSentTo("forgetful@example.org", "/reset-password");

    await resetPassword(orm.em.fork(), secret, "the new long password");
    await expect(resetPassword(orm.em.fork(), secret, "yet another password")).rejects.toBeInstanceOf(AccountError);
    expect(await orm.em.fork().count(Session, { user: user.id })).toBe(0);
    expect(await findSessionUser(orm.em.fork(), new Request(ORIGIN, { headers: { Cookie: cookie } }))).toBeNull();

    await expect(signIn(orm.em.fork(), formPost("/login", { email: "forgetful@example.org", password: "the old long password" }))).rejects.toBeInstanceOf(SignInRefused);
    await expect(signIn(orm.em.fork(), formPost("/login", { email: "forgetful@example.org", password: "the new long password" }))).resolves.toMatchObject({ id: user.id });
  });

  it("expires after one hour", async () => {
    await createUser(orm.em.fork(), { email: "slow@example.org", name: "S", password: "the old long password", roles: ["recorder"] });
    await requestPasswordReset(orm.em.fork(), { email: "slow@example.org", origin: ORIGIN });
    await deliverMail();
    const secret = linkSentTo("slow@example.org", "/reset-password");
    expect(await findUsableToken(orm.em.fork(), secret, "password_reset", new Date(Date.now() + 59 * 60 * 1000))).not.toBeNull();
    expect(await findUsableToken(orm.em.fork(), secret, "password_reset", new Date(Date.now() + 61 * 60 * 1000))).toBeNull();
  });

  it("sends nothing for an unknown address (and the caller cannot tell)", async () => {
    await expect(requestPasswordReset(orm.em.fork(), { email: "nobody@example.org", origin: ORIGIN })).resolves.toBeUndefined();
    expect(await orm.em.fork().count(OutboxMessage, {})).toBe(0);
  });
});

describe("sign-in throttling", () => {
  it("locks an account after 5 failures in 15 minutes, even for the right password, and recovers after the window", async () => {
    await createUser(orm.em.fork(), { email: "target@example.org", name: "T", password: "the right long password", roles: ["recorder"] });
    for (let attempt = 1; attempt <= 5; attempt++) {
      await expect(signIn(orm.em.fork(), formPost("/login", { email: "target@example.org", password: `guess ${attempt}` }))).rejects.toThrow(/do not match/);
    }
    // The sixth try is throttled, whatever the password.
    const sixth = signIn(orm.em.fork(), formPost("/login", { email: "target@example.org", password: "the right long password" }));
    await expect(sixth).rejects.toThrow(/Too many failed sign-ins/);

    vi.useFakeTimers({ toFake: ["Date"] });
    vi.setSystemTime(Date.now() + 16 * 60 * 1000);
    await expect(signIn(orm.em.fork(), formPost("/login", { email: "target@example.org", password: "the right long password" }))).resolves.toMatchObject({ email: "target@example.org" });
  });

  it("counts failures per client address across accounts", async () => {
    for (let attempt = 1; attempt <= 20; attempt++) {
      await signIn(orm.em.fork(), formPost("/login", { email: `someone${attempt}@example.org`, password: "wrong password" })).catch(() => {});
    }
    await expect(signIn(orm.em.fork(), formPost("/login", { email: "fresh@example.org", password: "whatever" }))).rejects.toThrow(/Too many/);
    // Another address is not affected.
    await expect(
      signIn(orm.em.fork(), formPost("/login", { email: "fresh@example.org", password: "whatever" }, { "x-visitwort-client-address": "192.0.2.99" })),
    ).rejects.toThrow(/do not match/);
  });

  it("refuses a malformed e-mail address with a field message, not an error", async () => {
    const refusal = await signIn(orm.em.fork(), formPost("/login", { email: "not an address", password: "x" })).catch((e) => e);
    expect(refusal).toBeInstanceOf(SignInRefused);
    expect((refusal as SignInRefused).fields.email?.[0]).toMatch(/e-mail address/);
  });
});

describe("deactivation", () => {
  it("ends every session at once and refuses sign-in", async () => {
    const admin = await coordinator();
    const user = await createUser(orm.em.fork(), { email: "leaver@example.org", name: "L", password: "a long enough password", roles: ["recorder"] });
    const cookie = await startSession(orm.em.fork(), user, formPost("/login", {}));
    await setStatus(orm.em.fork(), user.id, "deactivated", admin.id);
    expect(await findSessionUser(orm.em.fork(), new Request(ORIGIN, { headers: { Cookie: cookie } }))).toBeNull();
    await expect(signIn(orm.em.fork(), formPost("/login", { email: "leaver@example.org", password: "a long enough password" }))).rejects.toThrow(/deactivated/);
  });
});

describe("self-sign-up as a recorder", () => {
  it("is refused while the programme takes members by invitation only (the default)", async () => {
    await expect(signUp(orm.em.fork(), { name: "Eager", email: "eager@example.org", password: "a long enough password", origin: ORIGIN })).rejects.toBeInstanceOf(AccountError);
    expect(await orm.em.fork().count(OutboxMessage, {})).toBe(0);
  });

  it("when open: signs up, cannot sign in until the e-mailed link confirms the address", async () => {
    await writeSetting(orm.em.fork(), "openSignUp", true);
    await signUp(orm.em.fork(), { name: "Eager", email: "eager@example.org", password: "a long enough password", origin: ORIGIN });
    const credentials = formPost("/login", { email: "eager@example.org", password: "a long enough password" });
    await expect(signIn(orm.em.fork(), credentials)).rejects.toThrow(/Confirm your e-mail address/);

    await deliverMail();
    const secret = linkSentTo("eager@example.org", "/confirm-email");
    const user = await confirmEmail(orm.em.fork(), secret);
    expect(user.roles).toEqual(["recorder"]);
    await expect(signIn(orm.em.fork(), formPost("/login", { email: "eager@example.org", password: "a long enough password" }))).resolves.toMatchObject({ id: user.id });
    await expect(confirmEmail(orm.em.fork(), secret)).rejects.toBeInstanceOf(AccountError);
  });

  it("makes no second account for a taken address, and says nothing different", async () => {
    await writeSetting(orm.em.fork(), "openSignUp", true);
    await createUser(orm.em.fork(), { email: "taken@example.org", name: "T", password: "a long enough password", roles: ["planner"] });
    await expect(signUp(orm.em.fork(), { name: "Other", email: "taken@example.org", password: "another long password", origin: ORIGIN })).resolves.toBeUndefined();
    expect(await orm.em.fork().count(OutboxMessage, {})).toBe(0);
  });
});
