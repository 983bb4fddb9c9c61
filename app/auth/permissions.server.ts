import { data, redirect, type RouterContextProvider } from "react-router";
import { currentUserContext, type CurrentUser } from "./current-user.server.ts";
import { hasAnyRole, ROLE_LABELS, type Role } from "./roles.ts";

const isApiRequest = (request: Request) => new URL(request.url).pathname.startsWith("/api/");

/**
 * The one gate of every protected loader and action. Anonymous page requests go to sign-in
 * and come back; anonymous API requests get 401; a signed-in user without one of `roles`
 * gets 403 (a coordinator passes every role check).
 */
export function requireUser(
  request: Request,
  context: Readonly<RouterContextProvider>,
  options: { roles?: readonly Role[] } = {},
): CurrentUser {
  const user = context.get(currentUserContext);
  const api = isApiRequest(request);
  if (!user) {
    if (api) {
      throw Response.json(
        { error: "Sign in, or send a personal API token as Authorization: Bearer <token>." },
        { status: 401, headers: { "WWW-Authenticate": 'Bearer realm="visitwort"' } },
      );
    }
    const url = new URL(request.url);
    throw redirect(`/login?next=${encodeURIComponent(url.pathname + url.search)}`);
  }
  if (options.roles && !hasAnyRole(user.roles, options.roles)) {
    const needed = options.roles.map((r) => ROLE_LABELS[r]).join(" or ");
    const message = `This needs the ${needed} role; your account does not have it. Ask a coordinator if you should.`;
    if (api) throw Response.json({ error: message }, { status: 403 });
    throw data(message, { status: 403 });
  }
  return user;
}

/** The signed-in user or null, for pages that anyone may see but that change when signed in. */
export function optionalUser(context: Readonly<RouterContextProvider>): CurrentUser | null {
  return context.get(currentUserContext);
}
