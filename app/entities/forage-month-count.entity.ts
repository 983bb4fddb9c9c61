import { defineEntity, p, type InferEntity } from "@mikro-orm/core";

/**
 * The forage rollup without site and recorder: visits by caste, season, band, evidence, year,
 * month, bee and plant. Written by the same trigger as ForageCount; the matrix and the season
 * calendar need no distinct sites or recorders, and this table is several times smaller.
 */
export const ForageMonthCount = defineEntity({
  name: "ForageMonthCount",
  tableName: "forage_month_count",
  uniques: [
    // Band and evidence lead after caste: the matrix filters by them, and rows are written in
    // this order, so a caste × band × evidence slice lies together on disk.
    { name: "forage_month_count_key", properties: ["caste", "band", "evidence", "season", "year", "month", "beeTaxonId", "plantTaxonId"] },
  ],
  properties: {
    id: p.bigint().primary().autoincrement(),
    caste: p.string().length(10),
    season: p.string().length(20),
    band: p.string().length(5),
    evidence: p.string().length(10),
    year: p.smallint(),
    month: p.smallint(),
    beeTaxonId: p.integer(),
    plantTaxonId: p.integer(),
    visits: p.integer(),
  },
});

export type ForageMonthCount = InferEntity<typeof ForageMonthCount>;
