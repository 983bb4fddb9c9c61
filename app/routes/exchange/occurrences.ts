import { data } from "react-router";
import type { Route } from "./+types/occurrences";
import { requireUser } from "~/auth/permissions.server";
import { entityManagerContext } from "~/db/orm.server";
import { downloadResponse, exportDay, exportFiltersOf, occurrenceCsv, programmeName } from "~/exchange/export.server";

/** GET /exchange/occurrences.csv — the filtered visits as Darwin Core occurrences in CSV, streamed. */
export async function loader({ request, context }: Route.LoaderArgs) {
  const user = requireUser(request, context, { roles: ["planner"] });
  const filters = exportFiltersOf(request);
  // Exporting everything when a filter was misread would hand out more than was asked for.
  if (!filters) throw data("These filters are not ones the export page makes; choose them again on /exchange.", { status: 400 });
  const now = new Date();
  const csv = occurrenceCsv(context.get(entityManagerContext), user, filters, { programmeName: programmeName(), now });
  return downloadResponse(csv, "text/csv; charset=utf-8", `visitwort-occurrences-${exportDay(now)}.csv`);
}
