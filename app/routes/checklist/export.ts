import type { Route } from "./+types/export";
import { entityManagerContext } from "~/db/orm.server";
import { exportChecklistCsv } from "~/taxa/stewardship.server";

/** GET /checklist/export.csv — the plant checklist as a file that /checklist/import takes back. Public, like the checklist. */
export async function loader({ context }: Route.LoaderArgs) {
  const csv = await exportChecklistCsv(context.get(entityManagerContext));
  return new Response(csv, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": 'attachment; filename="visitwort-plant-checklist.csv"',
      // Always the current checklist: a botanist exports, edits and imports in one sitting.
      "Cache-Control": "no-cache",
    },
  });
}
