import type { EntityManager } from "@mikro-orm/postgresql";
import { AccountToken, ApiToken, User } from "../entities/index.ts";
import { queueMail } from "../mail/outbox.server.ts";
import { emailConfirmationMail, invitationMail, passwordResetMail } from "../mail/templates.ts";
import { readSetting } from "../admin/settings.server.ts";
import { endAllSessions } from "./session.server.ts";
import { hashPassword, verifyPassword } from "./password.server.ts";
import { ROLE_LABELS, type Role } from "./roles.ts";
import { digest, newSecret } from "./tokens.server.ts";

export const INVITATION_DAYS = 7;
export const PASSWORD_RESET_MINUTES = 60;
export const EMAIL_CONFIRMATION_HOURS = 48;

/** A refusal a person can act on; shown next to the form, never a 500. */
export class AccountError extends Error {
  constructor(
    message: string,
    readonly field?: string,
  ) {
    super(message);
    this.name = "AccountError";
  }
}

/** Where links in e-mails point: PUBLIC_URL in a deployment, else the address the request came to. */
export function publicOrigin(request: Request): string {
  return (process.env.PUBLIC_URL ?? new URL(request.url).origin).replace(/\/$/, "");
}

async function issueToken(
  em: EntityManager,
  values: Pick<AccountToken, "purpose" | "email"> & Partial<Pick<AccountToken, "roles" | "user" | "createdBy">>,
  lifetimeMs: number,
) {
  const secret = newSecret();
  const token = em.create(AccountToken, {
    roles: [],
    user: null,
    createdBy: null,
    ...values,
    tokenHash: digest(secret),
    expiresAt: new Date(Date.now() + lifetimeMs),
    usedAt: null,
  });
  return { secret, token };
}

/**
 * Finds a usable token: right purpose, not used, not expired. The same message for every way
 * it can fail, since a person can only ask for a new link anyway.
 */
export async function findUsableToken(em: EntityManager, secret: string, purpose: AccountToken["purpose"], now = new Date()) {
  const token = await em.findOne(AccountToken, { tokenHash: digest(secret), purpose });
  if (!token || token.usedAt || token.expiresAt <= now) return null;
  return token;
}

export async function inviteUser(
  em: EntityManager,
  input: { email: string; roles: Role[]; invitedById: number; origin: string },
): Promise<AccountToken> {
  const invitedBy = await em.findOneOrFail(User, { id: input.invitedById });
  if (await em.count(User, { email: input.email })) {
    throw new AccountError("There is already an account with this e-mail address; change its roles in the table instead.", "email");
  }
  // A new invitation replaces earlier unused ones, so only the latest link works.
  await em.nativeUpdate(AccountToken, { email: input.email, purpose: "invitation", usedAt: null }, { usedAt: new Date() });
  const { secret, token } = await issueToken(
    em,
    { purpose: "invitation", email: input.email, roles: input.roles, createdBy: invitedBy },
    INVITATION_DAYS * 24 * 60 * 60 * 1000,
  );
  const mail = invitationMail({
    inviteUrl: `${input.origin}/invite/${secret}`,
    roles: input.roles.map((r) => ROLE_LABELS[r]),
    invitedByName: invitedBy.name,
    expiresAt: token.expiresAt,
  });
  // The invitation and its e-mail are written together, or neither is.
  queueMail(em, { to: input.email, ...mail, template: "invitation" });
  await em.flush();
  return token;
}

export async function acceptInvitation(em: EntityManager, secret: string, input: { name: string; password: string }): Promise<User> {
  return em.transactional(async (tx) => {
    const token = await findUsableToken(tx, secret, "invitation");
    if (!token) throw new AccountError("This invitation link is no longer valid. Ask a coordinator for a new one.");
    if (await tx.count(User, { email: token.email })) {
      throw new AccountError("An account with this e-mail address exists already. Sign in instead.");
    }
    const user = tx.create(User, {
      email: token.email,
      name: input.name,
      passwordHash: await hashPassword(input.password),
      roles: token.roles,
      status: "active",
      emailConfirmedAt: new Date(),
      lastSignInAt: null,
    });
    token.usedAt = new Date();
    token.user = user;
    return user;
  });
}

/**
 * Queues a reset link when an active account has this address. Says nothing either way: the
 * page shows the same answer, so it cannot be used to learn who has an account.
 */
export async function requestPasswordReset(em: EntityManager, input: { email: string; origin: string }): Promise<void> {
  const user = await em.findOne(User, { email: input.email, status: "active" });
  if (!user) return;
  const { secret, token } = await issueToken(
    em,
    { purpose: "password_reset", email: user.email, user },
    PASSWORD_RESET_MINUTES * 60 * 1000,
  );
  queueMail(em, { to: user.email, ...passwordResetMail({ resetUrl: `${input.origin}/reset-password/${secret}`, expiresAt: token.expiresAt }), template: "password_reset" });
  await em.flush();
}

export async function resetPassword(em: EntityManager, secret: string, password: string): Promise<User> {
  return em.transactional(async (tx) => {
    const token = await findUsableToken(tx, secret, "password_reset");
    const user = token?.user ? await tx.findOne(User, { id: token.user.id, status: "active" }) : null;
    if (!token || !user) throw new AccountError("This reset link is no longer valid. Ask for a new one.");
    user.passwordHash = await hashPassword(password);
    token.usedAt = new Date();
    // Whoever knew the old password is signed out everywhere.
    await tx.flush();
    await endAllSessions(tx, user.id);
    return user;
  });
}

export async function changePassword(
  em: EntityManager,
  userId: number,
  input: { currentPassword: string; password: string; keepSessionId?: string },
) {
  const user = await em.findOneOrFail(User, { id: userId });
  if (!(await verifyPassword(input.currentPassword, user.passwordHash))) {
    throw new AccountError("That is not your current password.", "currentPassword");
  }
  user.passwordHash = await hashPassword(input.password);
  await em.flush();
  await endAllSessions(em, user.id, input.keepSessionId);
}

export async function updateProfile(em: EntityManager, userId: number, input: { name: string; email: string }) {
  const user = await em.findOneOrFail(User, { id: userId });
  if (input.email !== user.email && (await em.count(User, { email: input.email }))) {
    throw new AccountError("Another account uses this e-mail address.", "email");
  }
  user.name = input.name;
  user.email = input.email;
  await em.flush();
}

export async function setRoles(em: EntityManager, userId: number, roles: Role[], actingUserId: number) {
  const user = await em.findOneOrFail(User, { id: userId });
  if (userId === actingUserId && !roles.includes("coordinator")) {
    throw new AccountError("You cannot remove your own coordinator role; ask another coordinator.", "roles");
  }
  user.roles = roles;
  await em.flush();
}

export async function setStatus(em: EntityManager, userId: number, status: User["status"], actingUserId: number) {
  if (userId === actingUserId) throw new AccountError("You cannot deactivate your own account.");
  const user = await em.findOneOrFail(User, { id: userId });
  user.status = status;
  await em.flush();
  // Deactivation takes effect at once: every open session ends (tokens are refused on use).
  if (status === "deactivated") await endAllSessions(em, user.id);
}

/** A new personal API token; the secret is returned once and only its digest is stored. */
export async function createApiToken(em: EntityManager, userId: number, label: string): Promise<{ secret: string; token: ApiToken }> {
  const secret = `vw_${newSecret(24)}`;
  const token = em.create(ApiToken, {
    user: em.getReference(User, userId),
    label,
    tokenHash: digest(secret),
    prefix: secret.slice(0, 10),
    lastUsedAt: null,
    revokedAt: null,
  });
  await em.flush();
  return { secret, token };
}

export async function revokeApiToken(em: EntityManager, userId: number, tokenId: number) {
  const token = await em.findOne(ApiToken, { id: tokenId, user: userId, revokedAt: null });
  if (!token) throw new AccountError("No such token, or it was revoked already.");
  token.revokedAt = new Date();
  await em.flush();
}

export async function listApiTokens(em: EntityManager, userId: number) {
  const tokens = await em.find(ApiToken, { user: userId, revokedAt: null }, { orderBy: { createdAt: "desc" } });
  return tokens.map((t) => ({ id: t.id, label: t.label, prefix: t.prefix, createdAt: t.createdAt.toISOString(), lastUsedAt: t.lastUsedAt?.toISOString() ?? null }));
}

export async function listUsers(em: EntityManager) {
  const users = await em.find(User, {}, { orderBy: { name: "asc" } });
  const pending = await em.find(AccountToken, { purpose: "invitation", usedAt: null, expiresAt: { $gt: new Date() } }, { orderBy: { createdAt: "desc" } });
  return {
    users: users.map((u) => ({
      id: u.id,
      name: u.name,
      email: u.email,
      roles: [...u.roles],
      status: u.status,
      createdAt: u.createdAt.toISOString(),
      lastSignInAt: u.lastSignInAt?.toISOString() ?? null,
    })),
    invitations: pending.map((t) => ({ id: t.id, email: t.email, roles: [...t.roles], expiresAt: t.expiresAt.toISOString() })),
  };
}

export async function createUser(em: EntityManager, input: { email: string; name: string; password: string; roles: Role[] }) {
  const user = em.create(User, {
    email: input.email,
    name: input.name,
    passwordHash: await hashPassword(input.password),
    roles: input.roles,
    status: "active",
    emailConfirmedAt: new Date(),
    lastSignInAt: null,
  });
  await em.flush();
  return user;
}

/**
 * Self-sign-up as a recorder, when the programme allows it. The account cannot sign in until
 * the address is confirmed. An address that already has an account gets no second one, and the
 * page answers the same either way.
 */
export async function signUp(em: EntityManager, input: { name: string; email: string; password: string; origin: string }): Promise<void> {
  if (!(await readSetting(em, "openSignUp"))) throw new AccountError("This programme takes new members by invitation only.");
  const existing = await em.findOne(User, { email: input.email });
  if (existing?.emailConfirmedAt) return;
  await em.transactional(async (tx) => {
    // Signing up again before confirming sends a fresh link; the first password stands.
    const user = existing
      ? tx.merge(existing)
      : tx.create(User, {
          email: input.email,
          name: input.name,
          passwordHash: await hashPassword(input.password),
          roles: ["recorder"],
          status: "active",
          emailConfirmedAt: null,
          lastSignInAt: null,
        });
    const { secret, token } = await issueToken(tx, { purpose: "email_confirmation", email: input.email, user }, EMAIL_CONFIRMATION_HOURS * 3600 * 1000);
    queueMail(tx, {
      to: input.email,
      ...emailConfirmationMail({ confirmUrl: `${input.origin}/confirm-email/${secret}`, expiresAt: token.expiresAt }),
      template: "email_confirmation",
    });
  });
}

export async function confirmEmail(em: EntityManager, secret: string): Promise<User> {
  return em.transactional(async (tx) => {
    const token = await findUsableToken(tx, secret, "email_confirmation");
    const user = token?.user ? await tx.findOne(User, { id: token.user.id }) : null;
    if (!token || !user) throw new AccountError("This confirmation link is no longer valid. Sign up again to get a new one.");
    user.emailConfirmedAt = new Date();
    token.usedAt = new Date();
    return user;
  });
}

export async function setNoticePreference(em: EntityManager, userId: number, preference: User["noticePreference"]) {
  await em.nativeUpdate(User, { id: userId }, { noticePreference: preference });
}

export async function noticePreferenceOf(em: EntityManager, userId: number): Promise<User["noticePreference"]> {
  return (await em.findOneOrFail(User, { id: userId })).noticePreference;
}
