import type { EntityManager } from "@mikro-orm/postgresql";
import { createCookie } from "react-router";
import { Session, User } from "../entities/index.ts";
import { sessionSecret } from "./secret.server.ts";
import { digest, newSecret } from "./tokens.server.ts";

const SESSION_DAYS = 30;
// Seeing a session refreshes lastSeenAt at most this often, to spare a write per request.
const TOUCH_EVERY_MS = 5 * 60 * 1000;

function sessionCookie(secure: boolean) {
  return createCookie(secure ? "__Host-visitwort" : "visitwort", {
    httpOnly: true,
    sameSite: "lax",
    secure,
    path: "/",
    secrets: [sessionSecret()],
    maxAge: SESSION_DAYS * 24 * 60 * 60,
  });
}

/** Served over https (directly or behind a proxy that says so): the cookie is Secure. */
export function isHttps(request: Request): boolean {
  return new URL(request.url).protocol === "https:" || request.headers.get("x-forwarded-proto") === "https";
}

async function readToken(request: Request): Promise<string | null> {
  const header = request.headers.get("Cookie");
  if (!header) return null;
  const value = await sessionCookie(isHttps(request)).parse(header);
  return typeof value === "string" && value.length > 20 ? value : null;
}

/** The active user signed in by this request's cookie, or null. */
export async function findSessionUser(em: EntityManager, request: Request): Promise<{ user: User; sessionId: string } | null> {
  const token = await readToken(request);
  if (!token) return null;
  const session = await em.findOne(Session, { id: digest(token) }, { populate: ["user"] });
  if (!session) return null;
  const now = new Date();
  if (session.expiresAt <= now || session.user.status !== "active") {
    await em.nativeDelete(Session, { id: session.id });
    return null;
  }
  if (now.getTime() - session.lastSeenAt.getTime() > TOUCH_EVERY_MS) {
    await em.nativeUpdate(Session, { id: session.id }, { lastSeenAt: now });
  }
  return { user: session.user, sessionId: session.id };
}

/**
 * Signs the user in on this browser with a new session id (rotated at every sign-in; the
 * session the cookie held before, if any, is ended). Returns the Set-Cookie header value.
 */
export async function startSession(em: EntityManager, user: User, request: Request): Promise<string> {
  const previous = await readToken(request);
  if (previous) await em.nativeDelete(Session, { id: digest(previous) });
  const token = newSecret();
  em.create(Session, {
    id: digest(token),
    user,
    expiresAt: new Date(Date.now() + SESSION_DAYS * 24 * 60 * 60 * 1000),
    userAgent: (request.headers.get("User-Agent") ?? "").slice(0, 300),
  });
  user.lastSignInAt = new Date();
  await em.flush();
  return sessionCookie(isHttps(request)).serialize(token);
}

/** Ends this browser's session. Returns the Set-Cookie header that clears the cookie. */
export async function endSession(em: EntityManager, request: Request): Promise<string> {
  const token = await readToken(request);
  if (token) await em.nativeDelete(Session, { id: digest(token) });
  return sessionCookie(isHttps(request)).serialize("", { maxAge: 0 });
}

/** Ends every session of a user (sign out everywhere, deactivation, password change). */
export async function endAllSessions(em: EntityManager, userId: number, exceptSessionId?: string): Promise<number> {
  return em.nativeDelete(Session, exceptSessionId ? { user: userId, id: { $ne: exceptSessionId } } : { user: userId });
}
