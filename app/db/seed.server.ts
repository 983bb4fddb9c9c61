import type { EntityManager } from "@mikro-orm/postgresql";
import path from "node:path";
import { BeeTaxon, PlantTaxon } from "../entities/index.ts";
import { loadChecklists } from "../taxa/checklist-import.server.ts";
import { projectRoot } from "./database-url.server.ts";

export const DEFAULT_CHECKLIST_FILES = {
  plants: path.join(projectRoot, "data", "plants.csv"),
  bees: path.join(projectRoot, "data", "bees.csv"),
};

export interface SeedSummary {
  plantsCreated: number;
  beesCreated: number;
}

/**
 * Writes the checklists into the database, matching taxa by scientific name. Idempotent: a
 * second run changes nothing. Taxa added in the app are left alone. One transaction: a bad
 * file stops the seed before anything is written.
 */
export async function seedChecklists(em: EntityManager, files = DEFAULT_CHECKLIST_FILES): Promise<SeedSummary> {
  const checklists = loadChecklists(files);
  return em.transactional(async (tx) => {
    const plants = new Map((await tx.find(PlantTaxon, {})).map((t) => [t.scientificName, t]));
    let plantsCreated = 0;
    for (const row of checklists.plants) {
      const existing = plants.get(row.scientificName);
      if (existing) tx.assign(existing, row);
      else {
        tx.create(PlantTaxon, row);
        plantsCreated++;
      }
    }
    const bees = new Map((await tx.find(BeeTaxon, {})).map((t) => [t.scientificName, t]));
    let beesCreated = 0;
    for (const row of checklists.bees) {
      const existing = bees.get(row.scientificName);
      if (existing) tx.assign(existing, row);
      else {
        tx.create(BeeTaxon, row);
        beesCreated++;
      }
    }
    return { plantsCreated, beesCreated };
  });
}
