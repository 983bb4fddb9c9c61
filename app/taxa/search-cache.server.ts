import type { EntityManager } from "@mikro-orm/postgresql";
import { createTaxonIndex, type SearchableTaxon } from "./search.ts";
import { listBeeTaxa, listPlantTaxa } from "./taxa.server.ts";

type Group = "plants" | "bees";
type TaxonIndex = ReturnType<typeof createTaxonIndex<SearchableTaxon>>;

const tables: Record<Group, string> = { plants: "plant_taxon", bees: "bee_taxon" };
const cached = new Map<Group, { fingerprint: string; index: TaxonIndex }>();

/**
 * The search index for a checklist, rebuilt only when the checklist changed. Building it for
 * 10,000 taxa takes about a quarter of a second, far more than a search, so a per-request
 * build would dominate `GET /api/taxa/search`. The fingerprint (rows, highest id, last edit)
 * changes on every add, edit, merge and import, and costs one indexed aggregate query.
 */
export async function taxonIndexFor(em: EntityManager, group: Group): Promise<TaxonIndex> {
  const [row = { n: "0", top: null, edited: null }] = await em
    .getConnection()
    .execute<{ n: string; top: number | null; edited: Date | null }[]>(
      `select count(*) as n, max(id) as top, max(updated_at) as edited from ${tables[group]}`,
    );
  const fingerprint = `${row.n}:${row.top}:${row.edited ? new Date(row.edited).toISOString() : ""}`;
  const hit = cached.get(group);
  if (hit && hit.fingerprint === fingerprint) return hit.index;
  const taxa: SearchableTaxon[] = group === "plants" ? await listPlantTaxa(em) : await listBeeTaxa(em);
  const index = createTaxonIndex(taxa);
  cached.set(group, { fingerprint, index });
  return index;
}
