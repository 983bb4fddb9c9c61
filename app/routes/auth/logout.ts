import { redirect } from "react-router";
import type { Route } from "./+types/logout";
import { entityManagerContext } from "~/db/orm.server";
import { endSession } from "~/auth/session.server";

// Signing out changes state, so it is a POST (a link or an image cannot sign anyone out).
export async function action({ request, context }: Route.ActionArgs) {
  const cookie = await endSession(context.get(entityManagerContext), request);
  return redirect("/", { headers: { "Set-Cookie": cookie } });
}

export function loader() {
  return redirect("/");
}
