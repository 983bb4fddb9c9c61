import { defineEntity, p, type InferEntity } from "@mikro-orm/core";

/**
 * The forage rollup for the commonest ranking, all bumble bees over a season window: visits by
 * caste, season, band, evidence, year, plant, site and recorder, without bee and month. The same
 * trigger writes it; a ranking counts distinct sites and recorders over about half the rows it
 * would read in ForageCount.
 */
export const ForagePresence = defineEntity({
  name: "ForagePresence",
  tableName: "forage_presence",
  uniques: [
    { name: "forage_presence_key", properties: ["caste", "season", "band", "evidence", "year", "plantTaxonId", "siteKey", "recorderId"] },
  ],
  properties: {
    id: p.bigint().primary().autoincrement(),
    caste: p.string().length(10),
    season: p.string().length(20),
    band: p.string().length(5),
    evidence: p.string().length(10),
    year: p.smallint(),
    plantTaxonId: p.integer(),
    siteKey: p.bigint(),
    recorderId: p.integer(),
    visits: p.integer(),
  },
});

export type ForagePresence = InferEntity<typeof ForagePresence>;
