import { defineEntity, p, type InferEntity } from "@mikro-orm/core";
import { baseProperties } from "./base.ts";

/** A bumble bee species of the bee checklist. */
export const BeeTaxon = defineEntity({
  name: "BeeTaxon",
  tableName: "bee_taxon",
  properties: {
    ...baseProperties,
    scientificName: p.string().length(200).unique(),
    scientificNameAuthorship: p.string().length(200).default(""),
    subgenus: p.string().length(100),
    vernacularNames: p.array().default([]),
    // Listed as endangered: exact locations are restricted (see the cautions page).
    sensitive: p.boolean().default(false),
    sensitivityNote: p.text().default(""),
  },
});

export type BeeTaxon = InferEntity<typeof BeeTaxon>;
