import { defineEntity, p, type InferEntity } from "@mikro-orm/core";
import { baseProperties } from "./base.ts";
import { User } from "./user.entity.ts";
import { BANDS } from "../forage/seasons.ts";
import { GROWTH_FORMS } from "../taxa/checklist-schema.ts";

/**
 * A planting list a planner saved: the inputs it was made from and, in PlantingListItem, the
 * species in order (as recommended, or after swaps). `shareToken` opens a read-only copy to
 * people without an account; null until the planner shares it.
 */
export const PlantingList = defineEntity({
  name: "PlantingList",
  tableName: "planting_list",
  properties: {
    ...baseProperties,
    owner: () => p.manyToOne(User).deleteRule("cascade").index(),
    name: p.string().length(200),
    band: p.enum([...BANDS]),
    seasonStart: p.smallint(),
    seasonEnd: p.smallint(),
    minPerMonth: p.smallint(),
    sizeLimit: p.smallint().nullable(),
    growthForms: p.array<(typeof GROWTH_FORMS)[number]>().default([]),
    nativeOnly: p.boolean().default(true),
    notes: p.text().default(""),
    shareToken: p.string().length(64).nullable().unique(),
  },
});

export type PlantingList = InferEntity<typeof PlantingList>;
