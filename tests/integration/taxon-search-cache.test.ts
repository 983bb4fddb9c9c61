import type { MikroORM } from "@mikro-orm/postgresql";
import { beforeEach, describe, expect, it } from "vitest";
import { createUser } from "~/auth/accounts.server";
import { seedChecklists } from "~/db/seed.server";
import { PlantTaxon } from "~/entities";
import { taxonIndexFor } from "~/taxa/search-cache.server";
import { createPlantTaxon, mergePlantTaxa, updatePlantTaxon } from "~/taxa/stewardship.server";
import { useEmptyTestDatabase } from "../support/database";

let orm: MikroORM;

useEmptyTestDatabase((opened) => (orm = opened));

beforeEach(async () => {
  await seedChecklists(orm.em.fork());
});

const topName = async (q: string) => (await taxonIndexFor(orm.em.fork(), "plants")).search(q, 3)[0]?.taxon.scientificName;

describe("the server's cached taxon search index", () => {
  it("is built once and reused while the checklist is unchanged", async () => {
    const first = await taxonIndexFor(orm.em.fork(), "plants");
    const second = await taxonIndexFor(orm.em.fork(), "plants");
    expect(second).toBe(first);
  });

  it("is rebuilt when a taxon is added, so the new name is found at once", async () => {
    expect(await topName("fictiflora")).not.toBe("Fictiflora pratensis");
    await createPlantTaxon(orm.em.fork(), {
      scientificName: "Fictiflora pratensis",
      scientificNameAuthorship: "Nemo",
      family: "Fictifloraceae",
      genus: "Fictiflora",
      taxonRank: "species",
      vernacularNames: ["meadow fictiflower"],
      synonyms: [],
      regionalStatus: "native",
      growthForm: "forb",
      bloomStart: 5,
      bloomEnd: 7,
      sourceNote: "invented for the cache test",
    });
    expect(await topName("fictiflora")).toBe("Fictiflora pratensis");
  });

  it("is rebuilt when a taxon is edited, and when one is merged away", async () => {
    const bloodroot = await orm.em.fork().findOneOrFail(PlantTaxon, { scientificName: "Sanguinaria canadensis" });
    const { scientificName, scientificNameAuthorship, family, genus, taxonRank, synonyms, regionalStatus, growthForm, bloomStart, bloomEnd, sourceNote } = bloodroot;
    await updatePlantTaxon(orm.em.fork(), bloodroot.id, {
      ...{ scientificName, scientificNameAuthorship, family, genus, taxonRank, synonyms, regionalStatus, growthForm, bloomStart, bloomEnd, sourceNote },
      vernacularNames: [...bloodroot.vernacularNames, "zorblewort"],
    });
    expect(await topName("zorblewort")).toBe("Sanguinaria canadensis");

    const hepatica = await orm.em.fork().findOneOrFail(PlantTaxon, { scientificName: { $like: "Hepatica%" } });
    const botanist = await createUser(orm.em.fork(), { email: "steward@example.org", name: "Checklist Steward", password: "a long enough password", roles: ["botanist"] });
    await mergePlantTaxa(orm.em.fork(), { duplicateId: hepatica.id, keepId: bloodroot.id, actingUserId: botanist.id });
    const index = await taxonIndexFor(orm.em.fork(), "plants");
    expect(index.search(hepatica.scientificName, 10).map((hit) => hit.taxon.id)).not.toContain(hepatica.id);
  });
});
