import { z } from "zod";
import type { Route } from "./+types/taxa-search";
import { entityManagerContext } from "~/db/orm.server";
import { jsonError } from "~/http/json.server";
import { taxonIndexFor } from "~/taxa/search-cache.server";

const searchQuery = z.object({
  q: z.string().trim().min(1, "is required").max(100, "is longer than 100 characters"),
  group: z.enum(["plants", "bees"]).default("plants"),
  limit: z.coerce.number().int().min(1).max(50).default(10),
});

/** GET /api/taxa/search?q=…&group=plants|bees&limit=10 — the same ranking as the picker. */
export async function loader({ request, context }: Route.LoaderArgs) {
  const parsed = searchQuery.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) {
    return jsonError(400, "The search was not understood.", z.flattenError(parsed.error).fieldErrors as Record<string, string[]>);
  }
  const { q, group, limit } = parsed.data;
  const em = context.get(entityManagerContext);
  const hits = (await taxonIndexFor(em, group)).search(q, limit);
  return Response.json({
    query: q,
    group,
    results: hits.map((hit) => ({ ...hit.taxon, matchedName: hit.matchedName, matchedField: hit.matchedField })),
  });
}
