import type { Route } from "./+types/export";
import { entityManagerContext } from "~/db/orm.server";
import { requireUser } from "~/auth/permissions.server";
import { exportStockCsv } from "~/nursery/stock.server";

/** GET /nursery/stock.csv — the signed-in nursery's stock list, in the columns /nursery/import takes back. */
export async function loader({ request, context }: Route.LoaderArgs) {
  const user = requireUser(request, context, { roles: ["nursery"] });
  const csv = await exportStockCsv(context.get(entityManagerContext), user.id);
  return new Response(csv, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": 'attachment; filename="visitwort-nursery-stock.csv"',
      // One nursery's own list, current: exported, edited and imported in one sitting.
      "Cache-Control": "private, no-cache",
    },
  });
}
