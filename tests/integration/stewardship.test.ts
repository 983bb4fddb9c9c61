import type { MikroORM } from "@mikro-orm/postgresql";
import { readFileSync } from "node:fs";
import { beforeEach, describe, expect, it } from "vitest";
import { createUser } from "~/auth/accounts.server";
import { DEFAULT_CHECKLIST_FILES, seedChecklists } from "~/db/seed.server";
import { BeeTaxon, Determination, PlantTaxon, Site, User, Visit } from "~/entities";
import type { PlantChecklistRow } from "~/taxa/checklist-schema";
import {
  applyChecklistImport,
  ChecklistImportRefused,
  createPlantTaxon,
  csvField,
  exportChecklistCsv,
  mergePlantTaxa,
  previewChecklistImport,
  StewardshipRefused,
  updatePlantTaxon,
} from "~/taxa/stewardship.server";
import { useEmptyTestDatabase } from "../support/database";

let orm: MikroORM;

useEmptyTestDatabase((opened) => (orm = opened));

beforeEach(async () => {
  await seedChecklists(orm.em.fork());
});

const SEEDED_PLANTS = readFileSync(DEFAULT_CHECKLIST_FILES.plants, "utf8").trimEnd().split("\n").length - 1;

const sql = <T = Record<string, unknown>>(query: string, params: unknown[] = []) => orm.em.getConnection().execute<T[]>(query, params);

/** Every row of the plant checklist, timestamps included, as a count and one checksum. */
async function checklistState() {
  const [row] = await sql<{ count: number; checksum: string }>(
    `SELECT count(*)::int AS count, md5(coalesce(string_agg(t::text, '|' ORDER BY t.id), '')) AS checksum FROM plant_taxon t`,
  );
  return row!;
}

async function idOf(scientificName: string): Promise<number> {
  return (await orm.em.fork().findOneOrFail(PlantTaxon, { scientificName })).id;
}

/** An invented plant: the genus and family exist nowhere, so it clashes with no real name. */
function inventedTaxon(overrides: Partial<PlantChecklistRow> = {}): PlantChecklistRow {
  return {
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
    sourceNote: "invented for the stewardship tests",
    ...overrides,
  };
}

async function refusal(promise: Promise<unknown>): Promise<StewardshipRefused> {
  const error = await promise.then(
    () => undefined,
    (caught: unknown) => caught,
  );
  expect(error).toBeInstanceOf(StewardshipRefused);
  return error as StewardshipRefused;
}

describe("adding and correcting a taxon", () => {
  it("adds a taxon with its names and months", async () => {
    const created = await createPlantTaxon(orm.em.fork(), inventedTaxon({ synonyms: ["Fictiflora campestris"] }));
    const stored = await orm.em.fork().findOneOrFail(PlantTaxon, { id: created.id });
    expect(stored).toMatchObject({ scientificName: "Fictiflora pratensis", synonyms: ["Fictiflora campestris"], bloomStart: 5, bloomEnd: 7 });
    expect((await checklistState()).count).toBe(SEEDED_PLANTS + 1);
  });

  it("refuses an accepted name already on the checklist, writing nothing", async () => {
    const before = await checklistState();
    const error = await refusal(createPlantTaxon(orm.em.fork(), inventedTaxon({ scientificName: "Salix discolor", genus: "Salix", family: "Salicaceae" })));
    expect(error.fields.scientificName).toEqual(['scientificName "Salix discolor" is already on the checklist']);
    expect(await checklistState()).toEqual(before);
  });

  it("refuses a synonym that is another taxon's accepted name, writing nothing", async () => {
    const before = await checklistState();
    // Acer rubrum is an accepted name in data/plants.csv.
    const error = await refusal(createPlantTaxon(orm.em.fork(), inventedTaxon({ synonyms: ["Acer rubrum"] })));
    expect(error.fields.synonyms).toEqual(['synonym "Acer rubrum" is an accepted name on the checklist']);
    expect(await checklistState()).toEqual(before);
  });

  it("refuses a synonym that is already another taxon's synonym, writing nothing", async () => {
    const before = await checklistState();
    // data/plants.csv lists Salix rigida as a synonym of Salix eriocephala.
    const error = await refusal(createPlantTaxon(orm.em.fork(), inventedTaxon({ synonyms: ["Salix rigida"] })));
    expect(error.fields.synonyms).toEqual(['synonym "Salix rigida" is already a synonym of Salix eriocephala on the checklist']);
    expect(await checklistState()).toEqual(before);
  });

  it("refuses bad fields with a message for each, writing nothing", async () => {
    const before = await checklistState();
    const error = await refusal(createPlantTaxon(orm.em.fork(), { ...inventedTaxon(), family: "Fictiflora", bloomEnd: 13, vernacularNames: [] }));
    // Months run 1–12 (ISO 8601 calendar months 01–12).
    expect(error.fields).toEqual({
      family: ["is not a family name (…aceae)"],
      vernacularNames: ["needs at least one common name"],
      bloomEnd: ["months run 1–12"],
    });
    expect(await checklistState()).toEqual(before);
  });

  it("refuses a name that would split in the checklist file", async () => {
    const error = await refusal(createPlantTaxon(orm.em.fork(), inventedTaxon({ vernacularNames: ["meadow | fictiflower"] })));
    expect(error.fields.vernacularNames).toEqual(["a name may not contain “|”"]);
  });

  it("corrects a taxon, keeping its own names, and refuses names that clash, writing nothing", async () => {
    const eriocephala = await idOf("Salix eriocephala");
    const updated = await updatePlantTaxon(orm.em.fork(), eriocephala, {
      scientificName: "Salix eriocephala",
      scientificNameAuthorship: "Michx.",
      family: "Salicaceae",
      genus: "Salix",
      taxonRank: "species",
      vernacularNames: ["Missouri River willow", "heart-leaved willow"],
      synonyms: ["Salix rigida"],
      regionalStatus: "native",
      growthForm: "shrub",
      bloomStart: 4,
      bloomEnd: 6,
      sourceNote: "corrected in a test",
    });
    expect(updated).toMatchObject({ bloomEnd: 6, synonyms: ["Salix rigida"], vernacularNames: ["Missouri River willow", "heart-leaved willow"] });

    const humilis = await idOf("Salix humilis");
    const current = await orm.em.fork().findOneOrFail(PlantTaxon, { id: humilis });
    const before = await checklistState();
    const renamed = await refusal(updatePlantTaxon(orm.em.fork(), humilis, { ...current, scientificName: "Salix discolor" }));
    expect(renamed.fields.scientificName).toEqual(['scientificName "Salix discolor" is already on the checklist']);
    const borrowed = await refusal(updatePlantTaxon(orm.em.fork(), humilis, { ...current, synonyms: ["Salix rigida"] }));
    expect(borrowed.fields.synonyms).toEqual(['synonym "Salix rigida" is already a synonym of Salix eriocephala on the checklist']);
    const own = await refusal(updatePlantTaxon(orm.em.fork(), humilis, { ...current, synonyms: ["Salix humilis"] }));
    expect(own.fields.synonyms).toEqual([`synonym "Salix humilis" is the taxon's own accepted name`]);
    expect(await checklistState()).toEqual(before);
  });

  it("answers 404 for a taxon that is not there", async () => {
    const error = await refusal(updatePlantTaxon(orm.em.fork(), 999_999, inventedTaxon()));
    expect(error.status).toBe(404);
  });
});

describe("merging a duplicate taxon", () => {
  async function recordVisits(plantTaxonId: number, count: number, recorder: User, bee: BeeTaxon) {
    const em = orm.em.fork();
    const plant = em.getReference(PlantTaxon, plantTaxonId);
    for (let i = 0; i < count; i++) {
      // Built as scripts/demo/visits.ts builds them: the visit mirrors its latest determination.
      const visit = em.create(Visit, {
        recorder: em.getReference(User, recorder.id),
        clientSubmissionId: crypto.randomUUID(),
        eventDate: new Date(`2025-04-2${i}T10:00:00-05:00`),
        eventLocalDate: `2025-04-2${i}`,
        eventTimeZone: "America/Chicago",
        decimalLatitude: 41.41,
        decimalLongitude: -88.24,
        coordinateUncertaintyInMeters: 30,
        behavior: "nectar_foraging",
        beeIdentificationConfidence: "probable",
        plantTaxon: plant,
        plantStatus: "proposed",
        beeTaxon: em.getReference(BeeTaxon, bee.id),
        caste: "queen",
        beeStatus: "proposed",
      });
      em.create(Determination, { visit, subject: "plant", plantTaxon: plant, beeTaxon: null, caste: null, identifiedBy: em.getReference(User, recorder.id), dateIdentified: new Date(), status: "proposed" });
      em.create(Determination, { visit, subject: "bee", plantTaxon: null, beeTaxon: em.getReference(BeeTaxon, bee.id), caste: "queen", identifiedBy: em.getReference(User, recorder.id), dateIdentified: new Date(), status: "proposed" });
    }
    await em.flush();
  }

  async function setUp() {
    const em = orm.em.fork();
    const botanist = await createUser(em, { email: "steward@example.org", name: "Checklist Steward", password: "a long enough password", roles: ["botanist"] });
    const recorder = await createUser(em, { email: "walker@example.org", name: "Transect Walker", password: "a long enough password", roles: ["recorder"] });
    const bee = await em.findOneOrFail(BeeTaxon, { scientificName: "Bombus impatiens" });
    const duplicate = await createPlantTaxon(orm.em.fork(), {
      ...inventedTaxon(),
      scientificName: "Salix fictidiscolor",
      genus: "Salix",
      family: "Salicaceae",
      growthForm: "shrub",
      synonyms: ["Salix fictiglauca"],
      // "pussy willow" is already a common name of Salix discolor in data/plants.csv.
      vernacularNames: ["pussy willow", "silver catkin willow"],
    });
    const keepId = await idOf("Salix discolor");
    const otherId = await idOf("Acer rubrum");
    await recordVisits(duplicate.id, 3, recorder, bee);
    await recordVisits(otherId, 1, recorder, bee);
    return { botanist, recorder, duplicateId: duplicate.id, keepId, otherId };
  }

  it("moves every visit and determination to the kept taxon, keeps the names as synonyms and deletes the duplicate", async () => {
    const { botanist, duplicateId, keepId, otherId } = await setUp();
    const keptBefore = await orm.em.fork().findOneOrFail(PlantTaxon, { id: keepId });

    const summary = await mergePlantTaxa(orm.em.fork(), { duplicateId, keepId, actingUserId: botanist.id });
    expect(summary).toEqual({
      keptId: keepId,
      keptScientificName: "Salix discolor",
      mergedScientificName: "Salix fictidiscolor",
      visitsMoved: 3,
      determinationsMoved: 3,
    });

    // No row is left pointing at the duplicate, and the duplicate is gone.
    expect(await sql(`SELECT count(*)::int AS count FROM visit WHERE plant_taxon_id = ?`, [duplicateId])).toEqual([{ count: 0 }]);
    expect(await sql(`SELECT count(*)::int AS count FROM determination WHERE plant_taxon_id = ?`, [duplicateId])).toEqual([{ count: 0 }]);
    expect(await sql(`SELECT count(*)::int AS count FROM plant_taxon WHERE id = ?`, [duplicateId])).toEqual([{ count: 0 }]);
    expect(await sql(`SELECT count(*)::int AS count FROM visit WHERE plant_taxon_id = ?`, [keepId])).toEqual([{ count: 3 }]);
    expect(await sql(`SELECT count(*)::int AS count FROM determination WHERE plant_taxon_id = ?`, [keepId])).toEqual([{ count: 3 }]);
    // Other taxa's records are untouched; bee determinations never named a plant.
    expect(await sql(`SELECT count(*)::int AS count FROM visit WHERE plant_taxon_id = ?`, [otherId])).toEqual([{ count: 1 }]);
    expect(await sql(`SELECT count(*)::int AS count FROM determination WHERE subject = 'bee' AND plant_taxon_id IS NOT NULL`)).toEqual([{ count: 0 }]);
    // Moved visits changed version, so a verifier holding one open must reload it.
    expect(await sql(`SELECT DISTINCT version FROM visit WHERE plant_taxon_id = ?`, [keepId])).toEqual([{ version: 2 }]);

    const kept = await orm.em.fork().findOneOrFail(PlantTaxon, { id: keepId });
    expect(kept.synonyms).toEqual([...keptBefore.synonyms, "Salix fictidiscolor", "Salix fictiglauca"]);
    expect(kept.vernacularNames).toEqual([...keptBefore.vernacularNames, "silver catkin willow"]);
  });

  it("moves flower counts, nursery stock and planting-list places too, joining rows that meet", async () => {
    const { botanist, recorder, duplicateId, keepId } = await setUp();
    const em = orm.em.fork();
    const site = em.create(Site, { name: "Merge test meadow", decimalLatitude: 42.5, decimalLongitude: -89.4 });
    await em.flush();
    const count = (taxon: number, date: string, units: number) =>
      sql(`INSERT INTO floral_count (created_at, updated_at, site_id, survey_date, plant_taxon_id, flowering_units, recorded_by_id) VALUES (now(), now(), ?, ?, ?, ?, ?)`, [site.id, date, taxon, units, recorder.id]);
    await count(keepId, "2025-04-20", 40);
    await count(duplicateId, "2025-04-20", 15); // the same day: the same plant counted under two names
    await count(duplicateId, "2025-05-02", 7);
    const stock = (taxon: number, form: string) =>
      sql(`INSERT INTO stock_item (created_at, updated_at, nursery_id, plant_taxon_id, form, availability) VALUES (now(), now(), ?, ?, ?, 'now')`, [recorder.id, taxon, form]);
    await stock(keepId, "plug");
    await stock(duplicateId, "plug");
    await stock(duplicateId, "seed");
    const [list] = await sql<{ id: number }>(
      `INSERT INTO planting_list (created_at, updated_at, owner_id, name, band, season_start, season_end, min_per_month) VALUES (now(), now(), ?, 'Merge test list', 'north', 4, 9, 3) RETURNING id`,
      [recorder.id],
    );
    await sql(`INSERT INTO planting_list_item (list_id, plant_taxon_id, position) VALUES (?, ?, 1), (?, ?, 2)`, [list!.id, keepId, list!.id, duplicateId]);

    await mergePlantTaxa(orm.em.fork(), { duplicateId, keepId, actingUserId: botanist.id });

    expect(await sql(`SELECT survey_date::text AS day, flowering_units AS units FROM floral_count WHERE plant_taxon_id = ? ORDER BY survey_date`, [keepId])).toEqual([
      { day: "2025-04-20", units: 55 },
      { day: "2025-05-02", units: 7 },
    ]);
    expect(await sql(`SELECT form FROM stock_item WHERE plant_taxon_id = ? ORDER BY form`, [keepId])).toEqual([{ form: "plug" }, { form: "seed" }]);
    expect(await sql(`SELECT plant_taxon_id AS taxon, position FROM planting_list_item WHERE list_id = ?`, [list!.id])).toEqual([{ taxon: keepId, position: 1 }]);
    for (const table of ["floral_count", "stock_item", "planting_list_item"]) {
      expect(await sql(`SELECT count(*)::int AS count FROM ${table} WHERE plant_taxon_id = ?`, [duplicateId])).toEqual([{ count: 0 }]);
    }
  });

  it("refuses to merge a taxon into itself, changing nothing", async () => {
    const { botanist, duplicateId } = await setUp();
    const before = await checklistState();
    const visitsBefore = await sql(`SELECT id, plant_taxon_id, version FROM visit ORDER BY id`);
    const error = await refusal(mergePlantTaxa(orm.em.fork(), { duplicateId, keepId: duplicateId, actingUserId: botanist.id }));
    expect(error.message).toMatch(/cannot be merged into itself/);
    expect(await checklistState()).toEqual(before);
    expect(await sql(`SELECT id, plant_taxon_id, version FROM visit ORDER BY id`)).toEqual(visitsBefore);
  });

  it("refuses a person without the botanist role, changing nothing", async () => {
    const { recorder, duplicateId, keepId } = await setUp();
    const before = await checklistState();
    const error = await refusal(mergePlantTaxa(orm.em.fork(), { duplicateId, keepId, actingUserId: recorder.id }));
    expect(error.status).toBe(403);
    expect(await checklistState()).toEqual(before);
    expect(await sql(`SELECT count(*)::int AS count FROM visit WHERE plant_taxon_id = ?`, [duplicateId])).toEqual([{ count: 3 }]);
  });
});

/** Invented epithets from syllables: distinct, lower-case, and matching the checklist's name pattern. */
const SYLLABLES = ["ba", "ce", "di", "fo", "gu", "la", "me", "ni", "po", "ru", "sa", "te", "vi", "zo"];
const epithet = (i: number) => `${SYLLABLES[i % SYLLABLES.length]}${SYLLABLES[Math.floor(i / SYLLABLES.length) % SYLLABLES.length]}ensis`;

function inventedCsvRow(i: number, bloomEnd = 8): string {
  const name = `Fictiflora ${epithet(i)}`;
  return [name, "Nemo", "Fictifloraceae", "Fictiflora", "species", `fictiflower ${i} | meadow fictiflower ${i}`, "", "native", "forb", "5", String(bloomEnd), "invented for the import test"]
    .map(csvField)
    .join(",");
}

describe("exporting and importing the checklist as CSV", () => {
  it("exports the columns of data/plants.csv, and a re-import finds every taxon unchanged and writes nothing", async () => {
    const csv = await exportChecklistCsv(orm.em.fork());
    const header = readFileSync(DEFAULT_CHECKLIST_FILES.plants, "utf8").split("\n")[0];
    expect(csv.split("\r\n")[0]).toBe(header);

    const preview = await previewChecklistImport(orm.em.fork(), csv);
    expect(preview.problems).toEqual([]);
    expect(preview.newTaxa).toEqual([]);
    expect(preview.changed).toEqual([]);
    expect(preview.unchanged).toHaveLength(SEEDED_PLANTS);

    const before = await checklistState();
    expect(await applyChecklistImport(orm.em.fork(), csv)).toEqual({ created: 0, updated: 0, unchanged: SEEDED_PLANTS });
    expect(await checklistState()).toEqual(before);
  });

  it("quotes fields with commas, quotes and line breaks, and reads them back unchanged", async () => {
    // RFC 4180 §2.6 (fields with comma, quote, CR or LF are quoted) and §2.7 (inner quotes doubled).
    expect(csvField("plain name")).toBe("plain name");
    expect(csvField('lady\'s "bonnet", blue')).toBe('"lady\'s ""bonnet"", blue"');
    expect(csvField("two\r\nlines")).toBe('"two\r\nlines"');

    await createPlantTaxon(orm.em.fork(), inventedTaxon({ vernacularNames: ['lady\'s "bonnet", blue', "meadow fictiflower"], sourceNote: "invented, line one; \"quoted\", too" }));
    const csv = await exportChecklistCsv(orm.em.fork());
    expect(csv).toContain(`"lady's ""bonnet"", blue | meadow fictiflower"`);
    const preview = await previewChecklistImport(orm.em.fork(), csv);
    expect(preview.problems).toEqual([]);
    expect(preview.changed).toEqual([]);
    expect(preview.unchanged).toHaveLength(SEEDED_PLANTS + 1);
  });

  it("lists the changed fields of a known taxon and writes them", async () => {
    const csv = await exportChecklistCsv(orm.em.fork());
    const humilis = csv.split("\r\n").find((line) => line.startsWith("Salix humilis,"))!;
    // The cells of Salix humilis in data/plants.csv: bloom 4–5.
    const edited = humilis.replace(",native,shrub,4,5,", ",native,shrub,4,6,").replace("dwarf gray willow", "dwarf gray willow | sage willow");
    const preview = await previewChecklistImport(orm.em.fork(), csv.replace(humilis, edited));
    expect(preview.problems).toEqual([]);
    expect(preview.changed).toHaveLength(1);
    expect(preview.changed[0]!.changes).toEqual([
      { field: "vernacularNames", before: "prairie willow | upland willow | dwarf gray willow", after: "prairie willow | upland willow | dwarf gray willow | sage willow" },
      { field: "bloomEnd", before: "5", after: "6" },
    ]);
    expect(await applyChecklistImport(orm.em.fork(), csv.replace(humilis, edited))).toEqual({ created: 0, updated: 1, unchanged: SEEDED_PLANTS - 1 });
    expect(await orm.em.fork().findOneOrFail(PlantTaxon, { scientificName: "Salix humilis" })).toMatchObject({ bloomEnd: 6 });
  });

  it("refuses one bad row among 500 with its line and reason, writes nothing, and writes all 182 new taxa once it is fixed", async () => {
    const exported = await exportChecklistCsv(orm.em.fork());
    const generated = Array.from({ length: 500 - SEEDED_PLANTS }, (_, i) => i);
    const badIndex = 90;
    const build = (badBloomEnd: number) => exported + generated.map((i) => inventedCsvRow(i, i === badIndex ? badBloomEnd : 8) + "\r\n").join("");
    const withBadRow = build(13);
    expect(withBadRow.trimEnd().split("\r\n")).toHaveLength(1 + 500);
    // Line 1 is the header, then the exported taxa, then the generated ones.
    const badLine = 1 + SEEDED_PLANTS + badIndex + 1;
    expect(withBadRow.split("\r\n")[badLine - 1]).toContain("Fictiflora " + epithet(badIndex));

    const preview = await previewChecklistImport(orm.em.fork(), withBadRow);
    // Months run 1–12 (ISO 8601 calendar months 01–12): 13 is no month.
    expect(preview.problems).toEqual([{ line: badLine, reason: "bloomEnd months run 1–12" }]);
    expect(preview.newTaxa).toHaveLength(500 - SEEDED_PLANTS - 1);
    expect(preview.unchanged).toHaveLength(SEEDED_PLANTS);

    const before = await checklistState();
    const refused = await applyChecklistImport(orm.em.fork(), withBadRow).then(
      () => undefined,
      (error: unknown) => error,
    );
    expect(refused).toBeInstanceOf(ChecklistImportRefused);
    expect((refused as ChecklistImportRefused).problems).toEqual([{ line: badLine, reason: "bloomEnd months run 1–12" }]);
    expect(await checklistState()).toEqual(before);

    const fixed = build(8);
    const fixedPreview = await previewChecklistImport(orm.em.fork(), fixed);
    expect(fixedPreview.problems).toEqual([]);
    expect(fixedPreview.newTaxa).toHaveLength(500 - SEEDED_PLANTS);
    expect(await applyChecklistImport(orm.em.fork(), fixed)).toEqual({ created: 500 - SEEDED_PLANTS, updated: 0, unchanged: SEEDED_PLANTS });
    expect((await checklistState()).count).toBe(500);
    expect(await sql(`SELECT count(*)::int AS count FROM plant_taxon WHERE genus = 'Fictiflora'`)).toEqual([{ count: 182 }]);
  });

  it("checks names against the taxa in the database that the file leaves out", async () => {
    const header = (await exportChecklistCsv(orm.em.fork())).split("\r\n")[0];
    const row = (name: string, synonyms: string) =>
      [name, "Nemo", "Fictifloraceae", "Fictiflora", "species", "fictiflower", synonyms, "native", "forb", "5", "8", "invented"].join(",");
    const csv = [header, row("Fictiflora alpha", "Acer rubrum"), row("Fictiflora beta", "Salix rigida"), row("Fictiflora gamma", "")].join("\r\n");
    const before = await checklistState();
    const preview = await previewChecklistImport(orm.em.fork(), csv);
    expect(preview.problems).toEqual([
      { line: 2, reason: 'synonym "Acer rubrum" is an accepted name on the checklist' },
      { line: 3, reason: 'synonym "Salix rigida" is already a synonym of Salix eriocephala on the checklist' },
    ]);
    await expect(applyChecklistImport(orm.em.fork(), csv)).rejects.toBeInstanceOf(ChecklistImportRefused);
    expect(await checklistState()).toEqual(before);
  });

  it("keeps taxa that the file leaves out", async () => {
    const header = (await exportChecklistCsv(orm.em.fork())).split("\r\n")[0];
    expect(await applyChecklistImport(orm.em.fork(), `${header}\r\n${inventedCsvRow(0)}\r\n`)).toEqual({ created: 1, updated: 0, unchanged: 0 });
    expect((await checklistState()).count).toBe(SEEDED_PLANTS + 1);
  });

  it("refuses a file whose columns are not the checklist's", async () => {
    const csv = "scientificName,family,notes\r\nFictiflora alpha,Fictifloraceae,hello\r\n";
    const preview = await previewChecklistImport(orm.em.fork(), csv);
    expect(preview.problems.map((p) => p.line)).toEqual([1, 1]);
    expect(preview.problems[0]!.reason).toMatch(/^missing columns: scientificNameAuthorship, genus/);
    expect(preview.problems[1]!.reason).toMatch(/^unknown column: notes/);
    expect(preview.newTaxa).toEqual([]);
  });
});
