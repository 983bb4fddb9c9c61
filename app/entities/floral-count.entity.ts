import { defineEntity, p, type InferEntity } from "@mikro-orm/core";
import { baseProperties } from "./base.ts";
import { Site } from "./site.entity.ts";
import { PlantTaxon } from "./plant-taxon.entity.ts";
import { User } from "./user.entity.ts";

/**
 * Flowering units of one plant counted at one site on one day: what was on offer, against
 * which the visits show preference (selection ratios).
 */
export const FloralCount = defineEntity({
  name: "FloralCount",
  tableName: "floral_count",
  uniques: [{ name: "floral_count_site_date_taxon_unique", properties: ["site", "surveyDate", "plantTaxon"] }],
  checks: [{ name: "floral_count_units_check", expression: "(flowering_units >= 0)" }],
  properties: {
    ...baseProperties,
    site: () => p.manyToOne(Site).deleteRule("cascade"),
    surveyDate: p.date().index(),
    plantTaxon: () => p.manyToOne(PlantTaxon).deleteRule("restrict").index(),
    // A flowering unit: a single flower, or a head/umbel/spike counted as one (stated on the form).
    floweringUnits: p.integer(),
    recordedBy: () => p.manyToOne(User).deleteRule("restrict"),
    remarks: p.text().default(""),
  },
});

export type FloralCount = InferEntity<typeof FloralCount>;
