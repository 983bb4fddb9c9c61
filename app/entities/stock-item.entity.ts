import { defineEntity, p, type InferEntity } from "@mikro-orm/core";
import { baseProperties } from "./base.ts";
import { User } from "./user.entity.ts";
import { PlantTaxon } from "./plant-taxon.entity.ts";
import { STOCK_AVAILABILITIES, STOCK_FORMS } from "../planting/vocabulary.ts";

/**
 * A plant a nursery offers: one taxon in one form. The nursery declares whether the stock was
 * grown without systemic insecticides; planners see that declaration, not a verification.
 */
export const StockItem = defineEntity({
  name: "StockItem",
  tableName: "stock_item",
  uniques: [{ name: "stock_item_nursery_taxon_form_unique", properties: ["nursery", "plantTaxon", "form"] }],
  properties: {
    ...baseProperties,
    nursery: () => p.manyToOne(User).deleteRule("cascade"),
    // Restrict: merging taxa moves stock to the taxon kept (app/taxa/stewardship.server.ts).
    plantTaxon: () => p.manyToOne(PlantTaxon).deleteRule("restrict").index(),
    form: p.enum([...STOCK_FORMS]),
    // Where the seed or parent plants came from (the ecotype), in the nursery's words.
    sourceRegion: p.string().length(200).default(""),
    availability: p.enum([...STOCK_AVAILABILITIES]),
    // "Spring 2027", "from May": free text beside the availability.
    availabilityNote: p.string().length(200).default(""),
    grownWithoutSystemicInsecticides: p.boolean().default(false),
  },
});

export type StockItem = InferEntity<typeof StockItem>;
