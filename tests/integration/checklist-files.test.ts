import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { DEFAULT_CHECKLIST_FILES } from "~/db/seed.server";
import { ChecklistError, loadChecklists } from "~/taxa/checklist-import.server";

describe("the seeded checklists in data/", () => {
  const { plants, bees } = loadChecklists(DEFAULT_CHECKLIST_FILES);

  it("hold at least 150 plant taxa, every row valid", () => {
    expect(plants.length).toBeGreaterThanOrEqual(150);
  });

  it("have no accepted name twice and no name both accepted and a synonym", () => {
    const accepted = plants.map((p) => p.scientificName.toLowerCase());
    expect(new Set(accepted).size).toBe(accepted.length);
    const synonyms = plants.flatMap((p) => p.synonyms.map((s) => s.toLowerCase()));
    expect(synonyms.filter((s) => accepted.includes(s))).toEqual([]);
  });

  it("give bloom months from 1 to 12, starting no later than they end", () => {
    for (const plant of plants) {
      expect(plant.bloomStart, plant.scientificName).toBeGreaterThanOrEqual(1);
      expect(plant.bloomEnd, plant.scientificName).toBeLessThanOrEqual(12);
      expect(plant.bloomStart, plant.scientificName).toBeLessThanOrEqual(plant.bloomEnd);
    }
  });

  it("include early-spring and late-season forage, native and invasive plants", () => {
    const names = new Set(plants.map((p) => p.scientificName));
    // Early-spring queen forage: willows, maples, spring ephemerals (Mola et al. 2021, BioScience 71).
    for (const name of ["Salix discolor", "Acer rubrum", "Sanguinaria canadensis", "Mertensia virginica"]) expect(names).toContain(name);
    // Late-season forage: asters and goldenrods (Wolf et al. 2022, Natural Areas Journal 42).
    for (const name of ["Symphyotrichum novae-angliae", "Solidago speciosa"]) expect(names).toContain(name);
    expect(plants.some((p) => p.regionalStatus === "invasive")).toBe(true);
    expect(plants.some((p) => p.regionalStatus === "introduced")).toBe(true);
  });

  it("mark the rusty patched bumble bee sensitive: listed as endangered in the United States in 2017", () => {
    const affinis = bees.find((b) => b.scientificName === "Bombus affinis");
    expect(affinis?.sensitive).toBe(true);
    // Common eastern species are not listed anywhere (common practice, no source).
    expect(bees.find((b) => b.scientificName === "Bombus impatiens")?.sensitive).toBe(false);
  });
});

describe("a checklist file with a bad row", () => {
  function withPlantsFile(mutate: (text: string) => string) {
    const folder = mkdtempSync(path.join(os.tmpdir(), "visitwort-checklist-"));
    const plantsFile = path.join(folder, "plants.csv");
    writeFileSync(plantsFile, mutate(readFileSync(DEFAULT_CHECKLIST_FILES.plants, "utf8")));
    return { plants: plantsFile, bees: DEFAULT_CHECKLIST_FILES.bees };
  }

  it("is refused with the file, the line and the reason", () => {
    const files = withPlantsFile(
      (text) => text.trimEnd() + "\nHexalectris spicata,(Walter) Barnhart,Orchidaceae,Hexalectris,species,crested coralroot,,native,forb,4,13,from memory\n",
    );
    const lineOfBadRow = readFileSync(files.plants, "utf8").trimEnd().split("\n").length;
    let error: unknown;
    try {
      loadChecklists(files);
    } catch (caught) {
      error = caught;
    }
    expect(error).toBeInstanceOf(ChecklistError);
    expect((error as ChecklistError).problems).toEqual([
      { file: "plants.csv", line: lineOfBadRow, reason: "bloomEnd months run 1–12" },
    ]);
  });

  it("is refused when a synonym is also an accepted name", () => {
    const files = withPlantsFile((text) => text.trimEnd() + "\nCorallorhiza maculata,(Raf.) Raf.,Orchidaceae,Corallorhiza,species,spotted coralroot,Acer rubrum,native,forb,6,8,from memory\n");
    expect(() => loadChecklists(files)).toThrow(/synonym "Acer rubrum" is also an accepted name/);
  });
});
