import { z } from "zod";
import type { Route } from "./+types/forage-matrix";
import { requireUser } from "~/auth/permissions.server";
import { entityManagerContext } from "~/db/orm.server";
import { jsonError } from "~/http/json.server";
import { matrixQuery } from "~/forage/forage-query";
import { ForageQueryRefused, forageMatrix } from "~/forage/forage.server";

/** GET /api/forage/matrix — visits by bee × plant × month (non-zero cells), any signed-in role. */
export async function loader({ request, context }: Route.LoaderArgs) {
  requireUser(request, context);
  const parsed = matrixQuery.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) {
    return jsonError(400, "The query was not understood: " + parsed.error.issues.map((i) => `${i.path.join(".")} ${i.message}`).join("; ") + ".", z.flattenError(parsed.error).fieldErrors as Record<string, string[]>);
  }
  try {
    return Response.json(await forageMatrix(context.get(entityManagerContext), parsed.data));
  } catch (error) {
    if (error instanceof ForageQueryRefused) return jsonError(400, error.message, error.fields);
    throw error;
  }
}
