import { defineEntity, p, type InferEntity } from "@mikro-orm/core";
import { baseProperties } from "./base.ts";
import { User } from "./user.entity.ts";
import { Site } from "./site.entity.ts";
import { PlantTaxon } from "./plant-taxon.entity.ts";
import { BeeTaxon } from "./bee-taxon.entity.ts";
import { BEE_CONFIDENCES, BEHAVIORS, CASTES, DETERMINATION_STATUSES } from "../visits/vocabulary.ts";

/**
 * One bee seen on one flower at one time and place. The current plant, bee and caste and their
 * statuses mirror the latest determination of each subject (the history is in Determination);
 * they are kept here, written in the same transaction, so lists and rollups need no subquery.
 */
export const Visit = defineEntity({
  name: "Visit",
  tableName: "visit",
  uniques: [{ name: "visit_recorder_submission_unique", properties: ["recorder", "clientSubmissionId"] }],
  indexes: [{ name: "visit_recorder_event_index", properties: ["recorder", "eventDate"] }],
  properties: {
    ...baseProperties,
    recorder: () => p.manyToOne(User).deleteRule("restrict"),
    // Made by the client; a repeated submission finds the first visit instead of making a second.
    clientSubmissionId: p.uuid(),
    eventDate: p.datetime().index(),
    // The wall-clock date where the bee was seen (months and seasons are local).
    eventLocalDate: p.date(),
    eventTimeZone: p.string().length(64).default(""),
    decimalLatitude: p.double().$type<number>(),
    decimalLongitude: p.double().$type<number>(),
    // Unknown is allowed (an API client may not know it); zero is not a valid value in Darwin Core.
    coordinateUncertaintyInMeters: p.integer().nullable(),
    site: () => p.manyToOne(Site).nullable().deleteRule("set null").index(),
    behavior: p.enum([...BEHAVIORS]),
    habitatNotes: p.text().default(""),
    occurrenceRemarks: p.text().default(""),
    beeIdentificationConfidence: p.enum([...BEE_CONFIDENCES]),
    plantTaxon: () => p.manyToOne(PlantTaxon).nullable().deleteRule("restrict").index(),
    plantStatus: p.enum([...DETERMINATION_STATUSES]),
    beeTaxon: () => p.manyToOne(BeeTaxon).nullable().deleteRule("restrict").index(),
    caste: p.enum([...CASTES]),
    beeStatus: p.enum([...DETERMINATION_STATUSES]),
    // Optimistic locking: two verifiers acting on the same visit cannot overwrite each other.
    version: p.integer().version(),
  },
});

export type Visit = InferEntity<typeof Visit>;
