import type { MikroORM } from "@mikro-orm/postgresql";
import { beforeEach, describe, expect, it } from "vitest";
import { createUser } from "~/auth/accounts.server";
import { seedChecklists } from "~/db/seed.server";
import { seedDemoAccounts } from "~/db/demo-seed.server";
import { PlantTaxon, StockItem } from "~/entities";
import {
  applyStockImport,
  exportStockCsv,
  listStock,
  previewStockImport,
  recommendedWithStock,
  removeStockEntry,
  saveStockEntry,
  StockImportRefused,
  StockRefused,
} from "~/nursery/stock.server";
import { STOCK_CSV_COLUMNS } from "~/nursery/stock-schema";
import { recommendFromChecklist } from "~/planting/planting.server";
import { recommendationInput } from "~/planting/recommend";
import { DEMO_NURSERY_EMAIL, DEMO_STOCK, seedDemoStock } from "../../scripts/demo/stock";
import { useEmptyTestDatabase } from "../support/database";

let orm: MikroORM;
useEmptyTestDatabase((opened) => (orm = opened));

let nursery: { id: number };
let otherNursery: { id: number };
const plant: Record<string, number> = {};
const HEADER = STOCK_CSV_COLUMNS.join(",");

beforeEach(async () => {
  await seedChecklists(orm.em.fork());
  const em = orm.em.fork();
  nursery = await createUser(em, { email: "grower@example.org", name: "Hazel Grower", password: "a long enough password", roles: ["nursery"] });
  otherNursery = await createUser(em, { email: "seedhouse@example.org", name: "Alder Seedhouse", password: "a long enough password", roles: ["nursery"] });
  const names = ["Zizia aurea", "Geranium maculatum", "Monarda fistulosa", "Lythrum salicaria", "Dasiphora fruticosa", "Salix discolor"];
  for (const taxon of await em.find(PlantTaxon, { scientificName: { $in: names } })) plant[taxon.scientificName] = taxon.id;
});

const stockRows = () =>
  orm.em.fork().getConnection().execute<{ id: number; nursery_id: number; plant_taxon_id: number; form: string; availability: string; availability_note: string; grown_without_systemic_insecticides: boolean }[]>(
    `select id, nursery_id, plant_taxon_id, form, availability, availability_note, grown_without_systemic_insecticides from stock_item order by id`,
  );

const entry = (overrides: Record<string, unknown> = {}) => ({
  plantTaxonId: plant["Zizia aurea"],
  form: "plug",
  sourceRegion: "seed from our own beds",
  availability: "now",
  availabilityNote: "",
  grownWithoutSystemicInsecticides: "on",
  ...overrides,
});

/** The refusal, failing the test when there was none. */
async function refusal<E extends Error>(promise: Promise<unknown>, type: new (...args: never[]) => E): Promise<E> {
  const error = await promise.then(() => null, (e: unknown) => e);
  expect(error).toBeInstanceOf(type);
  return error as E;
}

const csv = (...rows: string[]) => [HEADER, ...rows].join("\r\n") + "\r\n";

describe("adding, changing and removing stock", () => {
  it("adds an entry, and the same plant in the same form again updates it instead of adding a second", async () => {
    const first = await saveStockEntry(orm.em.fork(), nursery.id, entry());
    expect(first.created).toBe(true);
    expect(first.entry).toMatchObject({
      taxon: { scientificName: "Zizia aurea", vernacularName: "golden alexanders", family: "Apiaceae", regionalStatus: "native", bloomStart: 5, bloomEnd: 6 },
      form: "plug",
      grownWithoutSystemicInsecticides: true,
    });
    const again = await saveStockEntry(orm.em.fork(), nursery.id, entry({ availability: "season", availabilityNote: "from May", grownWithoutSystemicInsecticides: undefined }));
    expect(again.created).toBe(false);
    expect(again.entry.id).toBe(first.entry.id);
    expect(await stockRows()).toEqual([
      expect.objectContaining({ plant_taxon_id: plant["Zizia aurea"], form: "plug", availability: "season", availability_note: "from May", grown_without_systemic_insecticides: false }),
    ]);
    // Another form of the same plant is another entry (the unique key is nursery, taxon, form).
    await saveStockEntry(orm.em.fork(), nursery.id, entry({ form: "seed" }));
    expect((await listStock(orm.em.fork(), nursery.id)).map((e) => `${e.taxon.scientificName} ${e.form}`)).toEqual(["Zizia aurea plug", "Zizia aurea seed"]);
  });

  it("refuses an invasive plant with a message saying why, and writes nothing", async () => {
    const error = await refusal(saveStockEntry(orm.em.fork(), nursery.id, entry({ plantTaxonId: plant["Lythrum salicaria"] })), StockRefused);
    // The brief: never offer invasive plants through Visitwort.
    expect(error.fields.plantTaxonId).toEqual(["Lythrum salicaria is listed as invasive in the region. Visitwort never offers invasive plants: planting them spreads them."]);
    expect(await stockRows()).toEqual([]);
  });

  it("refuses an empty form field by field, and a plant not on the checklist", async () => {
    const empty = await refusal(saveStockEntry(orm.em.fork(), nursery.id, { intent: "add" }), StockRefused);
    expect(Object.keys(empty.fields).sort()).toEqual(["availability", "form", "plantTaxonId"]);
    const unknown = await refusal(saveStockEntry(orm.em.fork(), nursery.id, entry({ plantTaxonId: 999_999 })), StockRefused);
    expect(unknown.fields.plantTaxonId).toEqual(["No plant on the checklist has this number; choose it again"]);
    expect(await stockRows()).toEqual([]);
  });

  it("removes the nursery's own entry and refuses to remove another nursery's, leaving it in place", async () => {
    const mine = await saveStockEntry(orm.em.fork(), nursery.id, entry());
    const theirs = await saveStockEntry(orm.em.fork(), otherNursery.id, entry());
    const error = await refusal(removeStockEntry(orm.em.fork(), nursery.id, theirs.entry.id), StockRefused);
    expect(error.status).toBe(404);
    expect(await removeStockEntry(orm.em.fork(), nursery.id, mine.entry.id)).toEqual({ scientificName: "Zizia aurea", form: "plug" });
    expect((await stockRows()).map((row) => row.nursery_id)).toEqual([otherNursery.id]);
  });

  it("lists only the nursery's own stock", async () => {
    await saveStockEntry(orm.em.fork(), nursery.id, entry());
    await saveStockEntry(orm.em.fork(), otherNursery.id, entry({ plantTaxonId: plant["Geranium maculatum"] }));
    expect((await listStock(orm.em.fork(), nursery.id)).map((e) => e.taxon.scientificName)).toEqual(["Zizia aurea"]);
  });
});

describe("exporting the stock list", () => {
  it("writes the import's columns with CRLF line ends (RFC 4180 §2.1), only this nursery's rows, and reads back as unchanged", async () => {
    await saveStockEntry(orm.em.fork(), nursery.id, entry({ availabilityNote: "from May, while they last" }));
    await saveStockEntry(orm.em.fork(), nursery.id, entry({ plantTaxonId: plant["Geranium maculatum"], form: "container", grownWithoutSystemicInsecticides: undefined }));
    await saveStockEntry(orm.em.fork(), otherNursery.id, entry({ plantTaxonId: plant["Monarda fistulosa"] }));
    const text = await exportStockCsv(orm.em.fork(), nursery.id);
    expect(text).toBe(
      `${HEADER}\r\n` +
        "Geranium maculatum,container,seed from our own beds,now,,no\r\n" +
        'Zizia aurea,plug,seed from our own beds,now,"from May, while they last",yes\r\n',
    );
    const preview = await previewStockImport(orm.em.fork(), nursery.id, text);
    expect(preview.counts).toEqual({ new: 0, changed: 0, unchanged: 2, problems: 0 });
  });
});

describe("importing a stock CSV", () => {
  it("writes nothing when one row is bad, and names the row with the closest checklist names", async () => {
    const file = csv("Zizia aurea,plug,,now,,yes", "Monarda fistulosaa,plug,,now,,yes", "Geranium maculatum,container,,season,from May,no");
    const preview = await previewStockImport(orm.em.fork(), nursery.id, file);
    expect(preview.problems).toEqual([
      {
        line: 3,
        column: "scientificName",
        reason: "scientificName: “Monarda fistulosaa” is not on the plant checklist",
        suggestions: expect.arrayContaining([{ scientificName: "Monarda fistulosa", vernacularName: "wild bergamot" }]),
      },
    ]);
    // The close name first, then the rest of its genus; never an unrelated plant to make up three.
    expect(preview.problems[0]!.suggestions!.map((s) => s.scientificName)).toEqual(["Monarda fistulosa", "Monarda punctata"]);
    expect(preview.counts).toEqual({ new: 2, changed: 0, unchanged: 0, problems: 1 });

    const error = await refusal(applyStockImport(orm.em.fork(), nursery.id, file), StockImportRefused);
    expect(error.problems.map((p) => p.line)).toEqual([3]);
    // All or nothing: the two good rows were not written either.
    expect(await stockRows()).toEqual([]);
  });

  it("writes nothing when a row has a bad form or availability, and says which value it found", async () => {
    const file = csv("Zizia aurea,plug,,now,,yes", "Geranium maculatum,bare root,,later,,no");
    const preview = await previewStockImport(orm.em.fork(), nursery.id, file);
    expect(preview.problems.map((p) => `${p.line} ${p.reason}`)).toEqual([
      "3 form: Choose how the plant is sold: plug, container, seed (the file says “bare root”)",
      "3 availability: Choose when it can be had: now, or season (later in the season) (the file says “later”)",
    ]);
    await refusal(applyStockImport(orm.em.fork(), nursery.id, file), StockImportRefused);
    expect(await stockRows()).toEqual([]);
  });

  it("refuses an invasive plant in the file, and suggests no invasive plant for a name it does not know", async () => {
    const file = csv("Lythrum salicaria,plug,,now,,yes", "Lythrum salicarea,plug,,now,,yes");
    const preview = await previewStockImport(orm.em.fork(), nursery.id, file);
    expect(preview.problems[0]).toEqual({
      line: 2,
      column: "scientificName",
      reason: "Lythrum salicaria is listed as invasive in the region. Visitwort never offers invasive plants: planting them spreads them. Remove this row.",
    });
    expect(preview.problems[1]!.line).toBe(3);
    expect(preview.problems[1]!.suggestions!.map((s) => s.scientificName)).not.toContain("Lythrum salicaria");
    await refusal(applyStockImport(orm.em.fork(), nursery.id, file), StockImportRefused);
    expect(await stockRows()).toEqual([]);
  });

  it("finds a plant by a synonym, and counts the synonym and the accepted name in the same form as one plant listed twice", async () => {
    const preview = await previewStockImport(orm.em.fork(), nursery.id, csv("potentilla fruticosa,container,,now,,no", "Dasiphora fruticosa,container,,now,,no", "Dasiphora fruticosa,seed,,now,,no"));
    expect(preview.rows.map((r) => [r.line, r.scientificName, r.givenName, r.form, r.status])).toEqual([
      [2, "Dasiphora fruticosa", "potentilla fruticosa", "container", "new"],
      [4, "Dasiphora fruticosa", "Dasiphora fruticosa", "seed", "new"],
    ]);
    expect(preview.problems).toEqual([{ line: 3, reason: "Dasiphora fruticosa as container is already on line 2; list each plant and form once" }]);
  });

  it("updates the entries it already has when a file is imported again, never adding a second row", async () => {
    const file = csv("Zizia aurea,plug,,now,,yes", "Geranium maculatum,container,,season,from May,no");
    expect(await applyStockImport(orm.em.fork(), nursery.id, file)).toEqual({ created: 2, updated: 0, unchanged: 0 });
    const before = await stockRows();

    const edited = csv("Zizia aurea,plug,,now,,yes", "Geranium maculatum,container,,now,,yes", "Salix discolor,container,,now,,yes");
    const preview = await previewStockImport(orm.em.fork(), nursery.id, edited);
    expect(preview.rows.map((r) => [r.scientificName, r.status, r.changes])).toEqual([
      ["Zizia aurea", "unchanged", []],
      ["Geranium maculatum", "changed", ["availability", "availabilityNote", "grownWithoutSystemicInsecticides"]],
      ["Salix discolor", "new", []],
    ]);
    expect(await applyStockImport(orm.em.fork(), nursery.id, edited)).toEqual({ created: 1, updated: 1, unchanged: 1 });
    const after = await stockRows();
    expect(after).toHaveLength(3);
    // The same rows (same ids) now hold the file's values.
    expect(after.slice(0, 2).map((r) => r.id)).toEqual(before.map((r) => r.id));
    expect(after[1]).toMatchObject({ availability: "now", availability_note: "", grown_without_systemic_insecticides: true });
    // The third time, nothing changes.
    expect(await applyStockImport(orm.em.fork(), nursery.id, edited)).toEqual({ created: 0, updated: 0, unchanged: 3 });
  });

  it("leaves another nursery's rows untouched, even for the same plants", async () => {
    await saveStockEntry(orm.em.fork(), otherNursery.id, entry({ availability: "season", availabilityNote: "theirs", grownWithoutSystemicInsecticides: undefined }));
    const theirsBefore = (await stockRows()).filter((r) => r.nursery_id === otherNursery.id);
    const file = csv("Zizia aurea,plug,,now,,yes");
    expect((await previewStockImport(orm.em.fork(), nursery.id, file)).rows[0]!.status).toBe("new");
    await applyStockImport(orm.em.fork(), nursery.id, file);
    await applyStockImport(orm.em.fork(), nursery.id, csv("Zizia aurea,plug,,season,mine,no"));
    const rows = await stockRows();
    expect(rows.filter((r) => r.nursery_id === otherNursery.id)).toEqual(theirsBefore);
    expect(rows.filter((r) => r.nursery_id === nursery.id)).toEqual([expect.objectContaining({ availability: "season", availability_note: "mine" })]);
  });

  it("refuses a file whose header lacks columns (the route-access matrix's file) without reading rows", async () => {
    const preview = await previewStockImport(orm.em.fork(), nursery.id, "scientificName\n");
    expect(preview.counts).toEqual({ new: 0, changed: 0, unchanged: 0, problems: 1 });
    expect(preview.problems[0]!.reason).toMatch(/^Missing columns: form, sourceRegion/);
  });
});

describe("what to grow", () => {
  it("marks each species of the default recommendation of each band as stocked or not by this nursery", async () => {
    const north = await recommendFromChecklist(orm.em.fork(), recommendationInput.parse({ band: "north" }));
    const [firstNorth, secondNorth] = north.species.map((s) => s.taxon.id);
    await saveStockEntry(orm.em.fork(), nursery.id, entry({ plantTaxonId: firstNorth, form: "seed" }));
    await saveStockEntry(orm.em.fork(), nursery.id, entry({ plantTaxonId: firstNorth, form: "plug" }));
    // Another nursery's stock does not count as this one's.
    await saveStockEntry(orm.em.fork(), otherNursery.id, entry({ plantTaxonId: secondNorth }));

    const bands = await recommendedWithStock(orm.em.fork(), nursery.id);
    expect(bands.map((b) => b.band)).toEqual(["north", "south"]);
    const northView = bands[0]!;
    expect(northView.species.map((s) => s.id)).toEqual(north.species.map((s) => s.taxon.id));
    expect(northView.species[0]).toMatchObject({ stocked: true, forms: ["plug", "seed"] });
    expect(northView.species[1]).toMatchObject({ stocked: false, forms: [] });
    expect(northView.stockedCount).toBe(1);
    const south = await recommendFromChecklist(orm.em.fork(), recommendationInput.parse({ band: "south" }));
    expect(bands[1]!.species.map((s) => s.id)).toEqual(south.species.map((s) => s.taxon.id));
    expect(bands[1]!.species.filter((s) => s.stocked).map((s) => s.id)).toEqual(south.species.some((s) => s.taxon.id === firstNorth) ? [firstNorth] : []);
  });
});

describe("the demo nursery's stock", () => {
  it("is a dozen native entries for the demo nursery, and seeding again adds nothing", async () => {
    await seedDemoAccounts(orm.em.fork());
    expect(await seedDemoStock(orm.em.fork())).toBe(DEMO_STOCK.length);
    expect(DEMO_STOCK.length).toBe(12);
    expect(await seedDemoStock(orm.em.fork())).toBe(0);
    const items = await orm.em.fork().find(StockItem, {}, { populate: ["plantTaxon", "nursery"] });
    expect(items).toHaveLength(12);
    expect(new Set(items.map((item) => item.nursery.email))).toEqual(new Set([DEMO_NURSERY_EMAIL]));
    expect(items.every((item) => item.plantTaxon.regionalStatus === "native")).toBe(true);
    expect(items.some((item) => item.grownWithoutSystemicInsecticides)).toBe(true);
    expect(items.some((item) => !item.grownWithoutSystemicInsecticides)).toBe(true);
  });
});
