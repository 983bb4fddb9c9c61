import type { Route } from "./+types/visit";
import { entityManagerContext } from "~/db/orm.server";
import { requireUser } from "~/auth/permissions.server";
import { jsonError } from "~/http/json.server";
import { findVisitForViewer } from "~/visits/visits.server";
import { toVisitRecord } from "~/visits/visit-record.server";

/** GET /api/visits/:id — one visit with its photos and determination history. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = requireUser(request, context);
  const id = Number(params.id);
  if (!Number.isInteger(id) || id < 1) return jsonError(404, "No such visit.");
  const found = await findVisitForViewer(context.get(entityManagerContext), user, id);
  if (!found) return jsonError(404, "No such visit.");
  if (found === "forbidden") return jsonError(403, "This visit is not yours to see.");
  return Response.json(toVisitRecord(found.visit, found.photos, found.determinations, user));
}
