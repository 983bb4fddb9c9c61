import { z } from "zod";
import type { Route } from "./+types/forage-ranking";
import { requireUser } from "~/auth/permissions.server";
import { entityManagerContext } from "~/db/orm.server";
import { jsonError } from "~/http/json.server";
import { rankingQuery } from "~/forage/forage-query";
import { ForageQueryRefused, forageRanking } from "~/forage/forage.server";

/** GET /api/forage/ranking — plants ranked for a bee, caste, window and band, with intervals and, where flowers were counted, selection ratios. */
export async function loader({ request, context }: Route.LoaderArgs) {
  requireUser(request, context);
  const parsed = rankingQuery.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) {
    return jsonError(400, "The query was not understood: " + parsed.error.issues.map((i) => `${i.path.join(".")} ${i.message}`).join("; ") + ".", z.flattenError(parsed.error).fieldErrors as Record<string, string[]>);
  }
  try {
    return Response.json(await forageRanking(context.get(entityManagerContext), parsed.data));
  } catch (error) {
    if (error instanceof ForageQueryRefused) return jsonError(400, error.message, error.fields);
    throw error;
  }
}
