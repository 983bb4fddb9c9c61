import { z } from "zod";
import type { Route } from "./+types/planting-recommendation";
import { requireUser } from "~/auth/permissions.server";
import { entityManagerContext } from "~/db/orm.server";
import { jsonError } from "~/http/json.server";
import { planningValues } from "~/planting/plan";
import { recommendationApiBody } from "~/planting/plan.server";
import { recommendationInput } from "~/planting/recommend";

/** GET /api/planting/recommendation?band=&months=4-9&minPerMonth=3&size=&forms=&nativeOnly= — the recommended planting list for any signed-in role. */
export async function loader({ request, context }: Route.LoaderArgs) {
  requireUser(request, context);
  const parsed = recommendationInput.safeParse(planningValues(new URL(request.url).searchParams));
  if (!parsed.success) {
    return jsonError(
      400,
      "The query was not understood: " + parsed.error.issues.map((i) => `${i.path.join(".")} ${i.message}`).join("; ") + ".",
      z.flattenError(parsed.error).fieldErrors as Record<string, string[]>,
    );
  }
  return Response.json(await recommendationApiBody(context.get(entityManagerContext), parsed.data));
}
