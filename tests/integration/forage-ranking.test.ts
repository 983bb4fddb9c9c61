import type { MikroORM } from "@mikro-orm/postgresql";
import { beforeEach, describe, expect, it } from "vitest";
import { createUser } from "~/auth/accounts.server";
import { seedChecklists } from "~/db/seed.server";
import { BeeTaxon, FloralCount, PlantTaxon, Site } from "~/entities";
import { matrixQuery, rankingQuery, seasonQuery } from "~/forage/forage-query";
import { forageMatrix, forageRanking, ForageQueryRefused, seasonCalendar } from "~/forage/forage.server";
import { wilsonInterval } from "~/forage/wilson";
import { createVisit } from "~/visits/visits.server";
import { visitInput } from "~/visits/visit-schema";
import { useEmptyTestDatabase } from "../support/database";

let orm: MikroORM;
useEmptyTestDatabase((opened) => (orm = opened));

const noPhotos = { check: async () => ({ ok: false as const, reason: "no storage in this test" }) };
const sql = (query: string, params: unknown[] = []) => orm.em.getConnection().execute(query, params);

const WILLOW = "Salix discolor";
const BLOODROOT = "Sanguinaria canadensis";
const HEPATICA = "Hepatica americana";

let ids: { recorders: number[]; fen: number; bluff: number; southern: number };

interface Made {
  plant: string;
  date?: string;
  site?: number;
  lat?: number;
  caste?: string;
  recorder?: number;
  verified?: boolean;
  bee?: string;
}

async function visit({ plant, date = "2025-05-05", site, lat = 42.5, caste = "queen", recorder = 0, verified = true, bee = "Bombus impatiens" }: Made) {
  const input = visitInput.parse({
    clientSubmissionId: crypto.randomUUID(),
    eventDate: `${date}T10:00:00-05:00`,
    ...(site ? { siteId: site } : { decimalLatitude: lat, decimalLongitude: -89.4 }),
    beeScientificName: bee,
    caste,
    beeIdentificationConfidence: "certain",
    behavior: "nectar_foraging",
    plantScientificName: plant,
  });
  const { visit } = await createVisit(orm.em.fork(), ids.recorders[recorder]!, input, noPhotos);
  if (verified) await sql(`update visit set plant_status = 'confirmed', bee_status = 'confirmed' where id = ?`, [visit.id]);
}

beforeEach(async () => {
  await seedChecklists(orm.em.fork());
  const em = orm.em.fork();
  const recorders = [];
  for (const email of ["ash@example.org", "birch@example.org", "cedar@example.org"]) {
    recorders.push((await createUser(em, { email, name: email, password: "a long enough password", roles: ["recorder"] })).id);
  }
  const fen = em.create(Site, { name: "Fen edge", decimalLatitude: 42.5, decimalLongitude: -89.4 });
  const bluff = em.create(Site, { name: "Bluff prairie", decimalLatitude: 42.6, decimalLongitude: -89.3 });
  const southern = em.create(Site, { name: "River terrace", decimalLatitude: 40.1, decimalLongitude: -89.3 });
  await em.flush();
  ids = { recorders, fen: fen.id, bluff: bluff.id, southern: southern.id };

  // In the north band's early-spring window (20 April–31 May), queens, confirmed: the ranking's evidence.
  for (let i = 0; i < 3; i++) await visit({ plant: WILLOW, site: ids.fen, recorder: i % 2 });
  await visit({ plant: WILLOW, site: ids.bluff, date: "2024-04-28" });
  await visit({ plant: WILLOW, site: ids.bluff, date: "2025-05-31" });
  await visit({ plant: WILLOW, lat: 42.9 }); // no site: counts by its 0.01° grid cell
  for (let i = 0; i < 3; i++) await visit({ plant: BLOODROOT, site: ids.fen, recorder: 2 });
  await visit({ plant: HEPATICA, date: "2025-04-20", site: ids.bluff });
  // Not evidence for that ranking: a worker, the south band, a day before the window, a bee still proposed.
  await visit({ plant: HEPATICA, caste: "worker", site: ids.fen });
  await visit({ plant: HEPATICA, site: ids.southern });
  await visit({ plant: HEPATICA, date: "2025-04-19", site: ids.fen });
  await visit({ plant: HEPATICA, site: ids.fen, verified: false });
});

describe("the forage ranking", () => {
  it("ranks plants by the Wilson lower limit of their share, with sites, years and recorders counted by hand", async () => {
    const ranking = await forageRanking(orm.em.fork(), rankingQuery.parse({ caste: "queen", band: "north", window: "early-spring" }));
    expect(ranking.window).toEqual({ name: "early-spring", months: null, band: "north", ranges: [{ band: "north", start: "04-20", end: "05-31" }] });
    expect(ranking.totalVisits).toBe(10);
    // By hand: willow 6 of 10 visits at fen, bluff and one grid cell, in 2024 and 2025, by
    // recorders 0 and 1; bloodroot 3 at the fen by recorder 2; hepatica 1 (on 20 April, inside).
    const wilson = (n: number) => wilsonInterval(n, 10);
    expect(ranking.items.map(({ rank, plant, visits, share, wilsonLow, wilsonHigh, sites, years, recorders, fewRecords }) => ({
      rank, name: plant.scientificName, visits, share, wilsonLow, wilsonHigh, sites, years, recorders, fewRecords,
    }))).toEqual([
      { rank: 1, name: WILLOW, visits: 6, share: 0.6, wilsonLow: wilson(6).lower, wilsonHigh: wilson(6).upper, sites: 3, years: 2, recorders: 2, fewRecords: false },
      { rank: 2, name: BLOODROOT, visits: 3, share: 0.3, wilsonLow: wilson(3).lower, wilsonHigh: wilson(3).upper, sites: 1, years: 1, recorders: 1, fewRecords: true },
      { rank: 3, name: HEPATICA, visits: 1, share: 0.1, wilsonLow: wilson(1).lower, wilsonHigh: wilson(1).upper, sites: 1, years: 1, recorders: 1, fewRecords: true },
    ]);
    expect(ranking.items[0]!.plant).toMatchObject({ family: "Salicaceae" });
    expect(ranking.items.every((item) => item.selectionRatio === null && item.jacobsD === null)).toBe(true);
  });

  it("counts proposed determinations when asked for any evidence", async () => {
    const ranking = await forageRanking(orm.em.fork(), rankingQuery.parse({ band: "north", determination: "any" }));
    expect(ranking.totalVisits).toBe(11);
    expect(ranking.items.find((item) => item.plant.scientificName === HEPATICA)?.visits).toBe(2);
  });

  it("applies each visit's own band window for band=all, and months in place of a window", async () => {
    const all = await forageRanking(orm.em.fork(), rankingQuery.parse({ band: "all" }));
    // The south visit on 5 May is inside the south band's window (1 April–31 May).
    expect(all.totalVisits).toBe(11);
    expect(all.window.ranges).toEqual([{ band: "north", start: "04-20", end: "05-31" }, { band: "south", start: "04-01", end: "05-31" }]);
    const april = await forageRanking(orm.em.fork(), rankingQuery.parse({ band: "north", months: "4" }));
    // 28 April 2024 (willow), 20 April (hepatica) and 19 April (hepatica, outside the window but in April).
    expect(april.items.map((item) => [item.plant.scientificName, item.visits])).toEqual([[HEPATICA, 2], [WILLOW, 1]]);
    expect(april.window).toMatchObject({ name: null, months: [4] });
  });

  it("computes Manly's selection ratios and Jacobs' D where flowers were counted", async () => {
    const em = orm.em.fork();
    const recorder = ids.recorders[0]!;
    const plantId = async (name: string) => (await em.findOneOrFail(PlantTaxon, { scientificName: name })).id;
    em.create(FloralCount, { site: ids.fen, surveyDate: "2025-05-02", plantTaxon: await plantId(WILLOW), floweringUnits: 200, recordedBy: recorder });
    em.create(FloralCount, { site: ids.bluff, surveyDate: "2025-05-02", plantTaxon: await plantId(WILLOW), floweringUnits: 100, recordedBy: recorder });
    em.create(FloralCount, { site: ids.fen, surveyDate: "2025-05-02", plantTaxon: await plantId(BLOODROOT), floweringUnits: 100, recordedBy: recorder });
    // Outside the window: not availability for it.
    em.create(FloralCount, { site: ids.fen, surveyDate: "2025-07-02", plantTaxon: await plantId(HEPATICA), floweringUnits: 900, recordedBy: recorder });
    await em.flush();

    const ranking = await forageRanking(orm.em.fork(), rankingQuery.parse({ band: "north" }));
    const of = (name: string) => ranking.items.find((item) => item.plant.scientificName === name)!;
    // Hand computation (Manly et al. 2002, design I): at the fen and the bluff, willow has 5
    // visits (3 + 2) and bloodroot 3: u₊ = 8, o = 0.625 and 0.375. Flowers: willow 300, bloodroot
    // 100 of 400, π = 0.75 and 0.25. w = o/π = 0.8333 and 1.5.
    // Bonferroni z = Φ⁻¹(1 − 0.05/(2·2)) = 2.2414; SE = √(o(1−o)/(u₊π²)):
    // willow √(0.234375/4.5) = 0.22822 → 0.8333 ± 0.5115 = [0.3218, 1.3449];
    // bloodroot √(0.234375/0.5) = 0.68465 → 1.5 ± 1.5346 = [0 (floored), 3.0346].
    // Jacobs' D = (r − p)/(r + p − 2rp): willow −0.125/0.4375 = −0.2857, bloodroot +0.2857.
    expect(of(WILLOW).selectionRatio).toBeCloseTo(0.8333, 4);
    expect(of(WILLOW).selectionLow).toBeCloseTo(0.3218, 3);
    expect(of(WILLOW).selectionHigh).toBeCloseTo(1.3449, 3);
    expect(of(WILLOW).jacobsD).toBeCloseTo(-0.2857, 4);
    expect(of(BLOODROOT).selectionRatio).toBeCloseTo(1.5, 6);
    expect(of(BLOODROOT).selectionLow).toBe(0);
    expect(of(BLOODROOT).selectionHigh).toBeCloseTo(3.0346, 3);
    expect(of(BLOODROOT).jacobsD).toBeCloseTo(0.2857, 4);
    // No flowers of hepatica were counted in the window: no ratio for it.
    expect(of(HEPATICA)).toMatchObject({ selectionRatio: null, selectionLow: null, selectionHigh: null, jacobsD: null });
  });

  it("refuses a bee that is not on the checklist", async () => {
    await expect(forageRanking(orm.em.fork(), rankingQuery.parse({ bee: "Bombus imaginarius" }))).rejects.toBeInstanceOf(ForageQueryRefused);
  });
});

describe("the forage matrix", () => {
  it("gives non-zero bee × plant × month cells named by accepted scientific names", async () => {
    const matrix = await forageMatrix(orm.em.fork(), matrixQuery.parse({ caste: "queen", band: "north" }));
    expect(matrix.months).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]);
    expect(matrix.bees).toEqual(["Bombus impatiens"]);
    expect(matrix.plants).toEqual([HEPATICA, WILLOW, BLOODROOT]);
    expect(matrix.cells).toEqual([
      { bee: "Bombus impatiens", plant: HEPATICA, month: 4, visits: 2 },
      { bee: "Bombus impatiens", plant: WILLOW, month: 4, visits: 1 },
      { bee: "Bombus impatiens", plant: WILLOW, month: 5, visits: 5 },
      { bee: "Bombus impatiens", plant: BLOODROOT, month: 5, visits: 3 },
    ]);
  });

  it("filters by year range and bee", async () => {
    const matrix = await forageMatrix(orm.em.fork(), matrixQuery.parse({ from: "2024", to: "2024" }));
    expect(matrix.cells).toEqual([{ bee: "Bombus impatiens", plant: WILLOW, month: 4, visits: 1 }]);
    const bee = (await orm.em.fork().findOneOrFail(BeeTaxon, { scientificName: "Bombus bimaculatus" })).scientificName;
    expect((await forageMatrix(orm.em.fork(), matrixQuery.parse({ bee }))).cells).toEqual([]);
  });

  it("refuses years out of order and unknown values before touching the database", () => {
    expect(matrixQuery.safeParse({ from: "2026", to: "2024" }).success).toBe(false);
    expect(matrixQuery.safeParse({ band: "east" }).success).toBe(false);
    expect(rankingQuery.safeParse({ window: "early-spring", months: "4" }).success).toBe(false);
    expect(rankingQuery.safeParse({ months: "13" }).success).toBe(false);
  });
});

describe("the season calendar", () => {
  it("counts visits per band, month and caste, with each band's windows", async () => {
    const calendar = await seasonCalendar(orm.em.fork(), seasonQuery.parse({}));
    const north = calendar.bands.find((b) => b.band === "north")!;
    expect(north.windows.map((w) => w.name)).toEqual(["early-spring", "second-wave", "overwinter"]);
    expect(north.months.find((m) => m.month === 5)).toEqual({ month: 5, queen: 8, worker: 1, male: 0, unknown: 0 });
    expect(north.months.find((m) => m.month === 4)).toEqual({ month: 4, queen: 3, worker: 0, male: 0, unknown: 0 });
    const south = calendar.bands.find((b) => b.band === "south")!;
    expect(south.months.find((m) => m.month === 5)?.queen).toBe(1);
  });
});
