import { data } from "react-router";
import type { Route } from "./+types/export";
import { requireUser } from "~/auth/permissions.server";
import { entityManagerContext } from "~/db/orm.server";
import { csvFileName } from "~/forage/csv";
import { listCsv, PlantingListNotFound } from "~/planting/lists.server";

/** GET /planting/lists/:listId/export.csv — the saved list as CSV (RFC 4180), for planners. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = requireUser(request, context, { roles: ["planner"] });
  try {
    const { name, csv } = await listCsv(context.get(entityManagerContext), user, params.listId);
    return new Response(csv, {
      headers: {
        "Content-Type": "text/csv; charset=utf-8",
        "Content-Disposition": `attachment; filename="${csvFileName("visitwort-planting", name)}"`,
        "Cache-Control": "private, no-cache",
      },
    });
  } catch (error) {
    if (error instanceof PlantingListNotFound) throw data(error.message, { status: 404 });
    throw error;
  }
}
