import { defineEntity, p, type InferEntity } from "@mikro-orm/core";
import { baseProperties } from "./base.ts";
import { Visit } from "./visit.entity.ts";
import { BEE_VIEWS, PHOTO_SUBJECTS } from "../visits/vocabulary.ts";

/** A photo of a visit's bee or plant, stored in object storage under `storageKey`. */
export const Photo = defineEntity({
  name: "Photo",
  tableName: "photo",
  properties: {
    ...baseProperties,
    visit: () => p.manyToOne(Visit).deleteRule("cascade").index(),
    subject: p.enum([...PHOTO_SUBJECTS]),
    storageKey: p.string().length(300).unique(),
    contentType: p.string().length(50),
    byteSize: p.integer(),
    views: p.array<(typeof BEE_VIEWS)[number]>().default([]),
  },
});

export type Photo = InferEntity<typeof Photo>;
