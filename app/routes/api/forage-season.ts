import { z } from "zod";
import type { Route } from "./+types/forage-season";
import { requireUser } from "~/auth/permissions.server";
import { entityManagerContext } from "~/db/orm.server";
import { jsonError } from "~/http/json.server";
import { seasonQuery } from "~/forage/forage-query";
import { ForageQueryRefused, seasonCalendar } from "~/forage/forage.server";

/** GET /api/forage/season — each band's season windows and visits per month by caste. */
export async function loader({ request, context }: Route.LoaderArgs) {
  requireUser(request, context);
  const parsed = seasonQuery.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) {
    return jsonError(400, "The query was not understood: " + parsed.error.issues.map((i) => `${i.path.join(".")} ${i.message}`).join("; ") + ".", z.flattenError(parsed.error).fieldErrors as Record<string, string[]>);
  }
  try {
    return Response.json(await seasonCalendar(context.get(entityManagerContext), parsed.data));
  } catch (error) {
    if (error instanceof ForageQueryRefused) return jsonError(400, error.message, error.fields);
    throw error;
  }
}
