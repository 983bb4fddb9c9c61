import { defineEntity, p, type InferEntity } from "@mikro-orm/core";

/**
 * The forage rollup: visits counted by bee, plant, year, month, season, band, caste, evidence,
 * site and recorder. Written only by PostgreSQL triggers on `visit` (see the migration that
 * creates `forage_count_apply`), so it is right in the same transaction as every change to a
 * visit or its determinations; the matrix and the ranking read it instead of raw visits.
 * Ids are plain integers, not relations: 0 stands for "Bombus sp." and rows vanish at zero.
 */
export const ForageCount = defineEntity({
  name: "ForageCount",
  tableName: "forage_count",
  uniques: [
    {
      name: "forage_count_key",
      properties: ["caste", "season", "band", "evidence", "year", "month", "beeTaxonId", "plantTaxonId", "siteKey", "recorderId"],
    },
  ],
  properties: {
    id: p.bigint().primary().autoincrement(),
    caste: p.string().length(10),
    // "" between seasons.
    season: p.string().length(20),
    band: p.string().length(5),
    // "confirmed" when plant and bee are both confirmed or corrected, else "proposed".
    evidence: p.string().length(10),
    year: p.smallint(),
    month: p.smallint(),
    beeTaxonId: p.integer(),
    plantTaxonId: p.integer().index(),
    // The site's id, or for a visit without a site its 0.01° grid cell as a negative number
    // (see forage_site_key): an integer, because counting distinct sites sorts this column.
    siteKey: p.bigint(),
    recorderId: p.integer(),
    visits: p.integer(),
  },
});

export type ForageCount = InferEntity<typeof ForageCount>;
