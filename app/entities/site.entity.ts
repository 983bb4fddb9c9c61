import { defineEntity, p, type InferEntity } from "@mikro-orm/core";
import { baseProperties } from "./base.ts";

/** A place the programme monitors, kept by coordinators. */
export const Site = defineEntity({
  name: "Site",
  tableName: "site",
  properties: {
    ...baseProperties,
    name: p.string().length(200).unique(),
    decimalLatitude: p.double().$type<number>(),
    decimalLongitude: p.double().$type<number>(),
    coordinateUncertaintyInMeters: p.integer().default(100),
    habitat: p.string().length(300).default(""),
    // ISO 3166-2 subdivision, e.g. US-WI.
    isoRegionCode: p.string().length(10).default(""),
  },
});

export type Site = InferEntity<typeof Site>;
