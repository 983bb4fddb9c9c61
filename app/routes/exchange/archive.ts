import { data } from "react-router";
import type { Route } from "./+types/archive";
import { requireUser } from "~/auth/permissions.server";
import { entityManagerContext } from "~/db/orm.server";
import { darwinCoreArchive, downloadResponse, exportDay, exportFiltersOf, programmeName } from "~/exchange/export.server";

/** GET /exchange/archive.zip — the filtered visits as a Darwin Core Archive, streamed. */
export async function loader({ request, context }: Route.LoaderArgs) {
  const user = requireUser(request, context, { roles: ["planner"] });
  const filters = exportFiltersOf(request);
  if (!filters) throw data("These filters are not ones the export page makes; choose them again on /exchange.", { status: 400 });
  const now = new Date();
  const zip = await darwinCoreArchive(context.get(entityManagerContext), user, filters, { programmeName: programmeName(), now });
  return downloadResponse(zip, "application/zip", `visitwort-darwin-core-${exportDay(now)}.zip`);
}
