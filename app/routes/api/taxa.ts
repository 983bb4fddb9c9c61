import type { Route } from "./+types/taxa";
import { entityManagerContext } from "~/db/orm.server";
import { jsonError, jsonWithEtag } from "~/http/json.server";
import { listBeeTaxa, listPlantTaxa } from "~/taxa/taxa.server";

/** GET /api/taxa?group=plants|bees — the whole checklist, for the client-side picker. */
export async function loader({ request, context }: Route.LoaderArgs) {
  const group = new URL(request.url).searchParams.get("group") ?? "plants";
  const em = context.get(entityManagerContext);
  if (group === "plants") {
    const taxa = await listPlantTaxa(em);
    return jsonWithEtag(request, { group, count: taxa.length, taxa });
  }
  if (group === "bees") {
    const taxa = await listBeeTaxa(em);
    return jsonWithEtag(request, { group, count: taxa.length, taxa });
  }
  return jsonError(400, "group must be plants or bees", { group: ["must be plants or bees"] });
}
