import { BeeTaxon } from "./bee-taxon.entity.ts";
import { PlantTaxon } from "./plant-taxon.entity.ts";

/** Every entity the ORM knows; the config, the app and the tests use this one list. */
export const entities = [PlantTaxon, BeeTaxon];

export { BeeTaxon, PlantTaxon };
