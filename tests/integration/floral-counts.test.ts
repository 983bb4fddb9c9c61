import type { MikroORM } from "@mikro-orm/postgresql";
import { beforeEach, describe, expect, it } from "vitest";
import { createUser } from "~/auth/accounts.server";
import { seedChecklists } from "~/db/seed.server";
import { seedDemoAccounts } from "~/db/demo-seed.server";
import { FloralCount, PlantTaxon, Site } from "~/entities";
import { FloralSurveyRefused, listFloralCounts, listFloralSurveys, recordFloralSurvey } from "~/forage/floral-counts.server";
import { latestCalendarDate } from "~/forage/floral-count-schema";
import { manlySelectionRatios } from "~/forage/selection";
import { DEMO_FLORAL_SITES, seedDemoFloralCounts } from "../../scripts/demo/floral-counts";
import { seedDemoVisits } from "../../scripts/demo/visits";
import { useEmptyTestDatabase } from "../support/database";

let orm: MikroORM;
useEmptyTestDatabase((opened) => (orm = opened));

let recorder: { id: number };
let botanist: { id: number };
let site: Site;
let otherSite: Site;
const plant: Record<string, number> = {};

beforeEach(async () => {
  await seedChecklists(orm.em.fork());
  const em = orm.em.fork();
  recorder = await createUser(em, { email: "counter@example.org", name: "Ada Counter", password: "a long enough password", roles: ["recorder"] });
  botanist = await createUser(em, { email: "flora@example.org", name: "Bea Flora", password: "a long enough password", roles: ["botanist"] });
  site = em.create(Site, { name: "Test Meadow", decimalLatitude: 43.1, decimalLongitude: -89.4, coordinateUncertaintyInMeters: 100, habitat: "", isoRegionCode: "" });
  otherSite = em.create(Site, { name: "Other Fen", decimalLatitude: 41.2, decimalLongitude: -87.9, coordinateUncertaintyInMeters: 100, habitat: "", isoRegionCode: "" });
  await em.flush();
  for (const taxon of await em.find(PlantTaxon, { scientificName: { $in: ["Zizia aurea", "Geranium maculatum", "Salix discolor"] } })) {
    plant[taxon.scientificName] = taxon.id;
  }
});

const counts = () => orm.em.fork().find(FloralCount, {}, { orderBy: { id: "asc" } });

const survey = (overrides: Record<string, unknown> = {}) => ({
  siteId: site.id,
  surveyDate: "2025-05-06",
  rows: [
    { plantTaxonId: plant["Zizia aurea"], floweringUnits: 140 },
    { plantTaxonId: plant["Geranium maculatum"], floweringUnits: 60 },
  ],
  remarks: "Along the east fence",
  ...overrides,
});

/** The refusal's fields, failing the test when the survey was not refused. */
async function refusal(promise: Promise<unknown>): Promise<Record<string, string[]>> {
  const error = await promise.then(() => null, (e: unknown) => e);
  expect(error).toBeInstanceOf(FloralSurveyRefused);
  return (error as FloralSurveyRefused).fields;
}

describe("recording a floral survey", () => {
  it("writes one count per plant and says what it wrote", async () => {
    const summary = await recordFloralSurvey(orm.em.fork(), recorder, survey());
    expect(summary).toEqual({ siteId: site.id, siteName: "Test Meadow", surveyDate: "2025-05-06", plants: 2, totalUnits: 200, created: 2, updated: 0 });
    const rows = await listFloralCounts(orm.em.fork(), {});
    expect(rows.map((r) => [r.siteName, r.surveyDate, r.scientificName, r.floweringUnits, r.recorderName, r.remarks])).toEqual([
      ["Test Meadow", "2025-05-06", "Geranium maculatum", 60, "Ada Counter", "Along the east fence"],
      ["Test Meadow", "2025-05-06", "Zizia aurea", 140, "Ada Counter", "Along the east fence"],
    ]);
    expect(rows[1]!.vernacularName).toBe("golden alexanders");
  });

  it("writes nothing when one row names a plant the checklist does not have", async () => {
    const fields = await refusal(
      recordFloralSurvey(orm.em.fork(), recorder, survey({ rows: [{ plantTaxonId: plant["Zizia aurea"], floweringUnits: 140 }, { plantTaxonId: 999_999, floweringUnits: 3 }] })),
    );
    expect(fields).toEqual({ "rows.1.plantTaxonId": ["No plant on the checklist has this number"] });
    expect(await counts()).toHaveLength(0);
  });

  it("writes nothing when one row's number is bad, and names that row", async () => {
    const fields = await refusal(
      recordFloralSurvey(orm.em.fork(), recorder, survey({ rows: [{ plantTaxonId: plant["Zizia aurea"], floweringUnits: 140 }, { plantTaxonId: plant["Salix discolor"], floweringUnits: -4 }] })),
    );
    expect(Object.keys(fields)).toEqual(["rows.1.floweringUnits"]);
    expect(await counts()).toHaveLength(0);
  });

  it("leaves earlier counts untouched when a re-submission is refused", async () => {
    await recordFloralSurvey(orm.em.fork(), recorder, survey());
    await refusal(recordFloralSurvey(orm.em.fork(), recorder, survey({ rows: [{ plantTaxonId: plant["Zizia aurea"], floweringUnits: 999 }, { plantTaxonId: 999_999, floweringUnits: 1 }] })));
    expect((await counts()).map((c) => c.floweringUnits)).toEqual([140, 60]);
  });

  it("replaces the count of a plant counted again at the same site on the same day, and keeps the others", async () => {
    await recordFloralSurvey(orm.em.fork(), recorder, survey());
    const before = await counts();
    const again = await recordFloralSurvey(orm.em.fork(), botanist, survey({
      rows: [{ plantTaxonId: plant["Zizia aurea"], floweringUnits: 155 }, { plantTaxonId: plant["Salix discolor"], floweringUnits: 12 }],
      remarks: "Recounted after the rain",
    }));
    expect(again).toMatchObject({ plants: 2, totalUnits: 167, created: 1, updated: 1 });
    const after = await listFloralCounts(orm.em.fork(), { siteId: site.id });
    expect(after.map((r) => [r.scientificName, r.floweringUnits, r.recorderName])).toEqual([
      ["Geranium maculatum", 60, "Ada Counter"],
      ["Salix discolor", 12, "Bea Flora"],
      ["Zizia aurea", 155, "Bea Flora"],
    ]);
    // Updated in place: the same row, not a second one (unique per site, date and taxon).
    const zizia = (await counts()).find((c) => c.floweringUnits === 155)!;
    expect(before.map((c) => c.id)).toContain(zizia.id);
  });

  it("refuses a date in the future and writes nothing", async () => {
    const tomorrowEverywhere = new Date(Date.parse(`${latestCalendarDate()}T00:00:00Z`) + 86_400_000).toISOString().slice(0, 10);
    const fields = await refusal(recordFloralSurvey(orm.em.fork(), recorder, survey({ surveyDate: tomorrowEverywhere })));
    expect(fields).toEqual({ surveyDate: ["The date cannot be in the future"] });
    expect(await counts()).toHaveLength(0);
  });

  it("refuses a site that does not exist", async () => {
    const fields = await refusal(recordFloralSurvey(orm.em.fork(), recorder, survey({ siteId: 999_999 })));
    expect(fields).toEqual({ siteId: ["No such site; choose one from the list"] });
  });

  it("refuses the route-access matrix's bare post (a site and nothing else) with messages, not a crash", async () => {
    const fields = await refusal(recordFloralSurvey(orm.em.fork(), recorder, { siteId: "1" }));
    expect(Object.keys(fields).sort()).toEqual(["rows", "surveyDate"]);
  });
});

describe("listing floral surveys", () => {
  beforeEach(async () => {
    await recordFloralSurvey(orm.em.fork(), recorder, survey());
    await recordFloralSurvey(orm.em.fork(), botanist, survey({ rows: [{ plantTaxonId: plant["Salix discolor"], floweringUnits: 30 }] }));
    await recordFloralSurvey(orm.em.fork(), recorder, survey({ siteId: otherSite.id, surveyDate: "2025-04-20", rows: [{ plantTaxonId: plant["Salix discolor"], floweringUnits: 500 }] }));
    await recordFloralSurvey(orm.em.fork(), recorder, survey({ surveyDate: "2024-05-10" }));
  });

  it("gives one line per site and day, newest first, with plants, units and everyone who counted", async () => {
    const { surveys, total } = await listFloralSurveys(orm.em.fork());
    expect(total).toBe(3);
    expect(surveys).toEqual([
      { siteId: site.id, siteName: "Test Meadow", surveyDate: "2025-05-06", plants: 3, totalUnits: 230, recorders: ["Ada Counter", "Bea Flora"] },
      { siteId: otherSite.id, siteName: "Other Fen", surveyDate: "2025-04-20", plants: 1, totalUnits: 500, recorders: ["Ada Counter"] },
      { siteId: site.id, siteName: "Test Meadow", surveyDate: "2024-05-10", plants: 2, totalUnits: 200, recorders: ["Ada Counter"] },
    ]);
  });

  it("filters by site and by dates, both ends included, and pages", async () => {
    expect((await listFloralSurveys(orm.em.fork(), { siteId: otherSite.id })).surveys.map((s) => s.surveyDate)).toEqual(["2025-04-20"]);
    expect((await listFloralSurveys(orm.em.fork(), { from: "2025-04-20", to: "2025-05-06" })).total).toBe(2);
    expect((await listFloralCounts(orm.em.fork(), { siteId: site.id, to: "2024-12-31" })).map((r) => r.surveyDate)).toEqual(["2024-05-10", "2024-05-10"]);
    const second = await listFloralSurveys(orm.em.fork(), {}, { limit: 2, offset: 2 });
    expect(second).toEqual({ surveys: [expect.objectContaining({ surveyDate: "2024-05-10" })], total: 3 });
  });
});

describe("the demo floral counts", () => {
  it("count flowers at the demo sites in spring, once however often the seed runs, showing preference and avoidance", async () => {
    await seedDemoAccounts(orm.em.fork());
    await seedDemoVisits(orm.em.fork());
    const first = await seedDemoFloralCounts(orm.em.fork());
    expect(first.surveys).toBeGreaterThanOrEqual(30);
    expect(await seedDemoFloralCounts(orm.em.fork())).toEqual({ surveys: 0, counts: 0 });
    expect(await orm.em.fork().count(FloralCount, {})).toBe(first.counts);

    const rows = await listFloralCounts(orm.em.fork());
    expect(new Set(rows.map((r) => r.siteName))).toEqual(new Set(DEMO_FLORAL_SITES));
    // April–May only, in the demo years (the brief).
    expect(rows.every((r) => /^202[2-5]-0[45]-/.test(r.surveyDate))).toBe(true);

    // Manly design I over the counted sites' April–May visits: favourites above 1, the
    // plentiful rarely visited flowers below (Manly et al. 2002, ch. 4; app/forage/selection.ts).
    const units = new Map<number, number>();
    for (const r of rows) units.set(r.plantTaxonId, (units.get(r.plantTaxonId) ?? 0) + r.floweringUnits);
    const visits = await orm.em.getConnection().execute<{ plant: number; visits: number }[]>(
      `select v.plant_taxon_id as plant, count(*)::int as visits from visit v join site s on s.id = v.site_id
       where s.name in (?, ?, ?, ?) and extract(month from v.event_local_date) in (4, 5) group by v.plant_taxon_id`,
      [...DEMO_FLORAL_SITES],
    );
    const used = new Map(visits.map((v) => [v.plant, v.visits]));
    const ids = [...units.keys()];
    const total = ids.reduce((sum, id) => sum + units.get(id)!, 0);
    const ratios = manlySelectionRatios({ used: ids.map((id) => used.get(id) ?? 0), available: ids.map((id) => units.get(id)! / total) });
    const ratioOf = new Map(ids.map((id, i) => [id, ratios.resources[i]!.w]));
    const garlicMustard = (await orm.em.fork().findOneOrFail(PlantTaxon, { scientificName: "Alliaria petiolata" })).id;
    const favourite = [...used.entries()].filter(([id]) => units.has(id)).sort((a, b) => b[1] - a[1])[0]![0];
    expect(ratioOf.get(garlicMustard)).toBeLessThan(0.2);
    expect(ratioOf.get(favourite)).toBeGreaterThan(1.5);
  });
});
