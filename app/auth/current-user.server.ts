import type { EntityManager } from "@mikro-orm/postgresql";
import { createContext, type MiddlewareFunction } from "react-router";
import { ApiToken } from "../entities/index.ts";
import { entityManagerContext } from "../db/orm.server.ts";
import type { Role } from "./roles.ts";
import { findSessionUser } from "./session.server.ts";
import { digest } from "./tokens.server.ts";

/** Who is asking, as every loader and action sees it. */
export interface CurrentUser {
  id: number;
  name: string;
  email: string;
  roles: Role[];
  /** A browser session (cookie) or a personal API token (Bearer). */
  via: "session" | "token";
  sessionId?: string;
}

export const currentUserContext = createContext<CurrentUser | null>(null);

const TOKEN_TOUCH_EVERY_MS = 60 * 1000;

export function bearerToken(request: Request): string | null {
  const header = request.headers.get("Authorization");
  const match = header?.match(/^Bearer\s+(\S+)\s*$/i);
  return match?.[1] ?? null;
}

async function findTokenUser(em: EntityManager, token: string): Promise<CurrentUser | null> {
  const apiToken = await em.findOne(ApiToken, { tokenHash: digest(token), revokedAt: null }, { populate: ["user"] });
  if (!apiToken || apiToken.user.status !== "active") return null;
  const now = new Date();
  if (!apiToken.lastUsedAt || now.getTime() - apiToken.lastUsedAt.getTime() > TOKEN_TOUCH_EVERY_MS) {
    await em.nativeUpdate(ApiToken, { id: apiToken.id }, { lastUsedAt: now });
  }
  const { user } = apiToken;
  return { id: user.id, name: user.name, email: user.email, roles: [...user.roles], via: "token" };
}

/** Resolves the user once per request, from a Bearer token or the session cookie. */
export const currentUserMiddleware: MiddlewareFunction<Response> = async ({ request, context }, next) => {
  const em = context.get(entityManagerContext);
  const token = bearerToken(request);
  let user: CurrentUser | null = null;
  if (token) user = await findTokenUser(em, token);
  else {
    const found = await findSessionUser(em, request);
    if (found) {
      const { user: u, sessionId } = found;
      user = { id: u.id, name: u.name, email: u.email, roles: [...u.roles], via: "session", sessionId };
    }
  }
  context.set(currentUserContext, user);
  return next();
};
