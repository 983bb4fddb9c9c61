import { defineEntity, p, type InferEntity } from "@mikro-orm/core";
import { baseProperties } from "./base.ts";
import { GROWTH_FORMS, REGIONAL_STATUSES, TAXON_RANKS } from "../taxa/checklist-schema.ts";

/**
 * A plant of the regional checklist. Common names and synonyms are kept as arrays on the
 * taxon: they are always read with it, and their uniqueness across the checklist is checked
 * where the checklist is written (seed, import, merge).
 */
export const PlantTaxon = defineEntity({
  name: "PlantTaxon",
  tableName: "plant_taxon",
  checks: [
    {
      name: "plant_taxon_bloom_months_check",
      // Written as PostgreSQL prints it back, so migrations do not see a change every time.
      expression: "((bloom_start >= 1) AND (bloom_start <= 12)) AND ((bloom_end >= 1) AND (bloom_end <= 12)) AND (bloom_start <= bloom_end)" },
  ],
  properties: {
    ...baseProperties,
    // Unique among accepted names (Darwin Core scientificName, without authorship).
    scientificName: p.string().length(200).unique(),
    scientificNameAuthorship: p.string().length(200).default(""),
    family: p.string().length(100).index(),
    genus: p.string().length(100),
    taxonRank: p.enum([...TAXON_RANKS]),
    vernacularNames: p.array().default([]),
    synonyms: p.array().default([]),
    regionalStatus: p.enum([...REGIONAL_STATUSES]),
    growthForm: p.enum([...GROWTH_FORMS]),
    bloomStart: p.smallint(),
    bloomEnd: p.smallint(),
    sourceNote: p.text().default(""),
  },
});

export type PlantTaxon = InferEntity<typeof PlantTaxon>;
