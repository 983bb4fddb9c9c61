import type { EntityManager } from "@mikro-orm/postgresql";

export interface TaxonVisitSummary {
  /** Visits to this plant by month of the local date, January first: all and verified only. */
  byMonth: { all: number; verified: number }[];
  /** Bees seen on it in verified visits, most visits first. */
  bees: { scientificName: string; visits: number }[];
  determinations: number;
  visits: number;
}

/**
 * What the records say about one plant: when bees were seen on it and which. "Verified" means
 * the plant was confirmed or corrected by a botanist (the evidence rule of the forage analysis).
 */
export async function summariseTaxonVisits(em: EntityManager, plantTaxonId: number): Promise<TaxonVisitSummary> {
  const connection = em.getConnection();
  const [months, bees, determinations] = await Promise.all([
    connection.execute<{ month: number; all: number; verified: number }[]>(
      `SELECT extract(month FROM event_local_date)::int AS month, count(*)::int AS all,
              count(*) FILTER (WHERE plant_status IN ('confirmed', 'corrected'))::int AS verified
         FROM visit WHERE plant_taxon_id = ? GROUP BY 1`,
      [plantTaxonId],
    ),
    connection.execute<{ scientific_name: string; visits: number }[]>(
      `SELECT coalesce(b.scientific_name, 'Bombus sp.') AS scientific_name, count(*)::int AS visits
         FROM visit v LEFT JOIN bee_taxon b ON b.id = v.bee_taxon_id
        WHERE v.plant_taxon_id = ? AND v.plant_status IN ('confirmed', 'corrected') AND v.bee_status IN ('confirmed', 'corrected')
        GROUP BY 1 ORDER BY 2 DESC, 1`,
      [plantTaxonId],
    ),
    connection.execute<{ count: number }[]>(`SELECT count(*)::int AS count FROM determination WHERE plant_taxon_id = ?`, [plantTaxonId]),
  ]);
  const byMonth = Array.from({ length: 12 }, (_, i) => {
    const row = months.find((m) => m.month === i + 1);
    return { all: row?.all ?? 0, verified: row?.verified ?? 0 };
  });
  return {
    byMonth,
    bees: bees.map((b) => ({ scientificName: b.scientific_name, visits: b.visits })),
    determinations: determinations[0]?.count ?? 0,
    visits: byMonth.reduce((sum, m) => sum + m.all, 0),
  };
}
