import type { Route } from "./+types/me";
import { requireUser } from "~/auth/permissions.server";

/** GET /api/me — who the session or token acts as, with their roles. */
export function loader({ request, context }: Route.LoaderArgs) {
  const user = requireUser(request, context);
  return Response.json({ id: user.id, name: user.name, email: user.email, roles: user.roles, via: user.via });
}
