import { defineEntity, p, type InferEntity } from "@mikro-orm/core";
import { PlantingList } from "./planting-list.entity.ts";
import { PlantTaxon } from "./plant-taxon.entity.ts";

/** One species of a saved planting list, in the list's order. */
export const PlantingListItem = defineEntity({
  name: "PlantingListItem",
  tableName: "planting_list_item",
  uniques: [{ name: "planting_list_item_list_taxon_unique", properties: ["list", "plantTaxon"] }],
  properties: {
    id: p.integer().primary().autoincrement(),
    list: () => p.manyToOne(PlantingList).deleteRule("cascade"),
    // Restrict: merging taxa moves items to the taxon kept (app/taxa/stewardship.server.ts).
    plantTaxon: () => p.manyToOne(PlantTaxon).deleteRule("restrict").index(),
    position: p.smallint(),
    // Why it is on the list, as recommended ("strong early-spring evidence …") or "swapped in".
    reason: p.text().default(""),
  },
});

export type PlantingListItem = InferEntity<typeof PlantingListItem>;
