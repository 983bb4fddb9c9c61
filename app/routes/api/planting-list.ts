import type { Route } from "./+types/planting-list";
import { requireUser } from "~/auth/permissions.server";
import { entityManagerContext } from "~/db/orm.server";
import { jsonError } from "~/http/json.server";
import { listApiBody, loadList, PlantingListNotFound } from "~/planting/lists.server";

/** GET /api/planting/lists/:id — a saved planting list with its coverage, for planners. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = requireUser(request, context, { roles: ["planner"] });
  try {
    return Response.json(listApiBody(await loadList(context.get(entityManagerContext), user, params.id, { alternatives: false })));
  } catch (error) {
    if (error instanceof PlantingListNotFound) return jsonError(404, "No planting list has this id.");
    throw error;
  }
}
