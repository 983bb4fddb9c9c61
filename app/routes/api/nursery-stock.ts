import type { Route } from "./+types/nursery-stock";
import { entityManagerContext } from "~/db/orm.server";
import { requireUser } from "~/auth/permissions.server";
import { jsonError } from "~/http/json.server";
import { listStock, saveStockEntry, StockRefused, type StockListEntry } from "~/nursery/stock.server";

/** A stock entry with Darwin Core names where the standard has a term (scientificName, taxonID, family, vernacularName, modified). */
function toStockRecord(entry: StockListEntry) {
  return {
    id: entry.id,
    taxonID: `visitwort:plant:${entry.taxon.id}`,
    plantTaxonId: entry.taxon.id,
    scientificName: entry.taxon.scientificName,
    vernacularName: entry.taxon.vernacularName,
    family: entry.taxon.family,
    establishmentMeans: entry.taxon.regionalStatus === "native" ? "native" : "introduced",
    form: entry.form,
    sourceRegion: entry.sourceRegion,
    availability: entry.availability,
    availabilityNote: entry.availabilityNote,
    grownWithoutSystemicInsecticides: entry.grownWithoutSystemicInsecticides,
    modified: entry.updatedAt,
  };
}

const privateJson = (body: unknown, status = 200) => Response.json(body, { status, headers: { "Cache-Control": "private, no-cache" } });

/** GET /api/nursery/stock — the signed-in nursery's stock list. */
export async function loader({ request, context }: Route.LoaderArgs) {
  const user = requireUser(request, context, { roles: ["nursery"] });
  const stock = await listStock(context.get(entityManagerContext), user.id);
  return privateJson({ nursery: { name: user.name }, count: stock.length, stock: stock.map(toStockRecord) });
}

/**
 * POST /api/nursery/stock — adds a plant to the caller's stock, or updates the entry for the
 * same plant in the same form: JSON with the fields of the page's form (plantTaxonId, form,
 * sourceRegion, availability, availabilityNote, grownWithoutSystemicInsecticides as a boolean).
 * 201 when new, 200 when updated.
 */
export async function action({ request, context }: Route.ActionArgs) {
  const user = requireUser(request, context, { roles: ["nursery"] });
  if (request.method !== "POST") return jsonError(405, "Use GET to read the stock list and POST to add or update an entry.");
  const body = await request.json().catch(() => undefined);
  if (body === undefined || body === null || typeof body !== "object") return jsonError(400, "The body must be a JSON object.");
  try {
    const { entry, created } = await saveStockEntry(context.get(entityManagerContext), user.id, body);
    return privateJson(toStockRecord(entry), created ? 201 : 200);
  } catch (error) {
    if (error instanceof StockRefused) return jsonError(error.status, error.message, error.fields);
    throw error;
  }
}
