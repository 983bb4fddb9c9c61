import { defineEntity, p, type InferEntity } from "@mikro-orm/core";

/**
 * The forage rollup at its coarsest: visits by caste, band, evidence, year and month, for the
 * season calendar. Written by the same trigger as ForageCount; a few hundred rows a year.
 */
export const ForageBandMonthCount = defineEntity({
  name: "ForageBandMonthCount",
  tableName: "forage_band_month_count",
  uniques: [{ name: "forage_band_month_count_key", properties: ["caste", "band", "evidence", "year", "month"] }],
  properties: {
    id: p.integer().primary().autoincrement(),
    caste: p.string().length(10),
    band: p.string().length(5),
    evidence: p.string().length(10),
    year: p.smallint(),
    month: p.smallint(),
    visits: p.integer(),
  },
});

export type ForageBandMonthCount = InferEntity<typeof ForageBandMonthCount>;
