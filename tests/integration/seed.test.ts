import type { MikroORM } from "@mikro-orm/postgresql";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { DEFAULT_CHECKLIST_FILES, seedChecklists } from "~/db/seed.server";
import { ChecklistError, loadChecklists } from "~/taxa/checklist-import.server";
import { useEmptyTestDatabase } from "../support/database";

let orm: MikroORM;

useEmptyTestDatabase((opened) => (orm = opened));

const countPlants = async () =>
  (await orm.em.getConnection().execute<{ count: number }[]>(`SELECT count(*)::int AS count FROM plant_taxon`))[0]!.count;

const snapshot = (table: string) =>
  orm.em.getConnection().execute(`SELECT * FROM "${table}" ORDER BY scientific_name`);

describe("seeding the checklists", () => {
  it("writes every taxon of the files", async () => {
    const files = loadChecklists(DEFAULT_CHECKLIST_FILES);
    const summary = await seedChecklists(orm.em.fork());
    expect(summary).toEqual({ plantsCreated: files.plants.length, beesCreated: files.bees.length });
    expect(await countPlants()).toBe(files.plants.length);
  });

  it("twice leaves the same rows, timestamps included", async () => {
    await seedChecklists(orm.em.fork());
    const plantsBefore = await snapshot("plant_taxon");
    const beesBefore = await snapshot("bee_taxon");
    const second = await seedChecklists(orm.em.fork());
    expect(second).toEqual({ plantsCreated: 0, beesCreated: 0 });
    expect(await snapshot("plant_taxon")).toEqual(plantsBefore);
    expect(await snapshot("bee_taxon")).toEqual(beesBefore);
  });

  it("stops on a bad row with nothing written", async () => {
    const folder = mkdtempSync(path.join(os.tmpdir(), "visitwort-seed-"));
    const bees = path.join(folder, "bees.csv");
    writeFileSync(bees, readFileSync(DEFAULT_CHECKLIST_FILES.bees, "utf8").trimEnd() + "\nBombus imaginarius,Nobody 2099,Bombus,made-up bee,perhaps,\n");
    await expect(seedChecklists(orm.em.fork(), { plants: DEFAULT_CHECKLIST_FILES.plants, bees })).rejects.toBeInstanceOf(ChecklistError);
    // The plants file was fine, but the seed is all or nothing.
    expect(await countPlants()).toBe(0);
  });

  it("leaves taxa added in the app alone", async () => {
    await seedChecklists(orm.em.fork());
    await orm.em.getConnection().execute(
      `INSERT INTO plant_taxon (created_at, updated_at, scientific_name, family, genus, taxon_rank, regional_status, growth_form, bloom_start, bloom_end)
       VALUES (now(), now(), 'Hexalectris spicata', 'Orchidaceae', 'Hexalectris', 'species', 'native', 'forb', 7, 8)`,
    );
    await seedChecklists(orm.em.fork());
    const rows = await orm.em.getConnection().execute(`SELECT 1 FROM plant_taxon WHERE scientific_name = 'Hexalectris spicata'`);
    expect(rows).toHaveLength(1);
  });
});
