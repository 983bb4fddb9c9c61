import { z } from "zod";
import type { Route } from "./+types/visit-determinations";
import { entityManagerContext } from "~/db/orm.server";
import { requireUser } from "~/auth/permissions.server";
import { publicOrigin } from "~/auth/accounts.server";
import { jsonError } from "~/http/json.server";
import { determinationInput, determine, DeterminationRefused } from "~/determinations/determinations.server";
import { findVisitForViewer } from "~/visits/visits.server";
import { toVisitRecord } from "~/visits/visit-record.server";

/**
 * POST /api/visits/:id/determinations — confirm, correct or decline the plant (botanists) or
 * the bee (bee verifiers). `version` is the visit's version the caller saw; a newer one on the
 * server answers 409 with the visit's latest state.
 */
export async function action({ request, params, context }: Route.ActionArgs) {
  const user = requireUser(request, context, { roles: ["botanist", "bee_verifier"] });
  if (request.method !== "POST") return jsonError(405, "Use POST to add a determination.");
  const body = await request.json().catch(() => undefined);
  const parsed = determinationInput.safeParse(body);
  if (!parsed.success) return jsonError(400, "The determination was not understood; see fields.", z.flattenError(parsed.error).fieldErrors as Record<string, string[]>);
  const em = context.get(entityManagerContext);
  const visitId = Number(params.id);
  try {
    await determine(em, user, visitId, parsed.data, publicOrigin(request));
  } catch (error) {
    if (!(error instanceof DeterminationRefused)) throw error;
    if (error.status !== 409) return jsonError(error.status, error.message, error.fields);
    const latest = await findVisitForViewer(em.fork(), user, visitId);
    return Response.json(
      { error: error.message, visit: latest && latest !== "forbidden" ? toVisitRecord(latest.visit, latest.photos, latest.determinations, user) : null },
      { status: 409 },
    );
  }
  const found = await findVisitForViewer(em.fork(), user, visitId);
  if (!found || found === "forbidden") return jsonError(404, "No such visit.");
  return Response.json(toVisitRecord(found.visit, found.photos, found.determinations, user), { status: 201 });
}

export function loader({ request, context }: Route.LoaderArgs) {
  requireUser(request, context, { roles: ["botanist", "bee_verifier"] });
  return jsonError(405, "Use POST to add a determination; the history is in GET /api/visits/:id.");
}
