import { z } from "zod";
import type { Route } from "./+types/visits";
import { entityManagerContext } from "~/db/orm.server";
import { requireUser } from "~/auth/permissions.server";
import { jsonError } from "~/http/json.server";
import { createVisit, findVisitForViewer, listVisits, VisitRefused } from "~/visits/visits.server";
import { visitInput } from "~/visits/visit-schema";
import { visitListQuery } from "~/visits/list-query";
import { toVisitRecord } from "~/visits/visit-record.server";
import { photoInspector } from "~/storage/photo-inspector.server";

const fieldsOf = (error: z.ZodError) => z.flattenError(error).fieldErrors as Record<string, string[]>;

/** GET /api/visits — the caller's visits (a coordinator's: all), paged and filtered. */
export async function loader({ request, context }: Route.LoaderArgs) {
  const user = requireUser(request, context);
  const parsed = visitListQuery.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) return jsonError(400, "The query was not understood.", fieldsOf(parsed.error));
  const { page, pageSize, sort, order, ...filters } = parsed.data;
  const result = await listVisits(context.get(entityManagerContext), user, { filters, sort, descending: order === "desc", page, pageSize });
  return Response.json({ page, pageSize, total: result.total, visits: result.rows });
}

/**
 * POST /api/visits — records a visit (the field form's schema). The same clientSubmissionId
 * again answers 200 with the first visit; a new one 201.
 */
export async function action({ request, context }: Route.ActionArgs) {
  const user = requireUser(request, context, { roles: ["recorder"] });
  if (request.method !== "POST") return jsonError(405, "Use POST to record a visit.");
  const body = await request.json().catch(() => undefined);
  if (body === undefined) return jsonError(400, "The body must be JSON.");
  const parsed = visitInput.safeParse(body);
  if (!parsed.success) return jsonError(400, "The visit was not recorded; see fields.", fieldsOf(parsed.error));
  const em = context.get(entityManagerContext);
  try {
    const { visit, created } = await createVisit(em, user.id, parsed.data, photoInspector());
    const found = await findVisitForViewer(em.fork(), user, visit.id);
    if (!found || found === "forbidden") throw new Error("A visit just recorded could not be read back");
    return Response.json(toVisitRecord(found.visit, found.photos, found.determinations, user), {
      status: created ? 201 : 200,
      headers: { Location: `/api/visits/${visit.id}` },
    });
  } catch (error) {
    if (error instanceof VisitRefused) return jsonError(error.status, "The visit was not recorded; see fields.", error.fields);
    throw error;
  }
}
