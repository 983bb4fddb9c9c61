import { defineEntity, p, type InferEntity } from "@mikro-orm/core";
import { baseProperties } from "./base.ts";
import { Visit } from "./visit.entity.ts";
import { User } from "./user.entity.ts";
import { PlantTaxon } from "./plant-taxon.entity.ts";
import { BeeTaxon } from "./bee-taxon.entity.ts";
import { CASTES, DETERMINATION_STATUSES, PHOTO_SUBJECTS } from "../visits/vocabulary.ts";

/**
 * One identification of a visit's plant or bee: who, when, what, how sure. Appended, never
 * rewritten; the recorder's own choice is the first, "proposed".
 */
export const Determination = defineEntity({
  name: "Determination",
  tableName: "determination",
  properties: {
    ...baseProperties,
    visit: () => p.manyToOne(Visit).deleteRule("cascade").index(),
    subject: p.enum([...PHOTO_SUBJECTS]),
    plantTaxon: () => p.manyToOne(PlantTaxon).nullable().deleteRule("restrict"),
    beeTaxon: () => p.manyToOne(BeeTaxon).nullable().deleteRule("restrict"),
    caste: p.enum([...CASTES]).nullable(),
    identificationQualifier: p.string().length(20).default(""),
    identifiedBy: () => p.manyToOne(User).deleteRule("restrict"),
    dateIdentified: p.datetime(),
    status: p.enum([...DETERMINATION_STATUSES]),
    remarks: p.text().default(""),
  },
});

export type Determination = InferEntity<typeof Determination>;
