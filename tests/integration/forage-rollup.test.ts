import type { MikroORM } from "@mikro-orm/postgresql";
import { beforeEach, describe, expect, it } from "vitest";
import { createUser } from "~/auth/accounts.server";
import type { CurrentUser } from "~/auth/current-user.server";
import type { Role } from "~/auth/roles";
import { seedChecklists } from "~/db/seed.server";
import { determinationInput, determine } from "~/determinations/determinations.server";
import { BeeTaxon, PlantTaxon, Site } from "~/entities";
import { saveSeasonWindows, listSeasonWindows } from "~/forage/season-windows.server";
import { bandOf, DEFAULT_SEASON_WINDOWS, seasonOf, type SeasonWindow } from "~/forage/seasons";
import { createVisit } from "~/visits/visits.server";
import { visitInput } from "~/visits/visit-schema";
import { CASTES } from "~/visits/vocabulary";
import { seededRandom } from "../../scripts/demo/visits";
import { useEmptyTestDatabase } from "../support/database";

let orm: MikroORM;
useEmptyTestDatabase((opened) => (orm = opened));

const ORIGIN = "http://127.0.0.1:3000";
const noPhotos = { check: async () => ({ ok: false as const, reason: "no storage in this test" }) };
const sql = <T = Record<string, unknown>>(query: string, params: unknown[] = []) => orm.em.getConnection().execute<T[]>(query, params);

async function person(email: string, roles: Role[]): Promise<CurrentUser> {
  const user = await createUser(orm.em.fork(), { email, name: email.split("@")[0]!, password: "a long enough password", roles });
  return { id: user.id, name: user.name, email: user.email, roles, via: "session" };
}

interface VisitRow {
  caste: string;
  plant_taxon_id: number | null;
  bee_taxon_id: number | null;
  plant_status: string;
  bee_status: string;
  local_date: string;
  decimal_latitude: number;
  decimal_longitude: number;
  site_id: number | null;
  recorder_id: number;
}

/**
 * The rollup as it should be, computed here in TypeScript from the raw visits with the pure
 * season rules of app/forage/seasons.ts — independently of the SQL functions the trigger uses.
 */
async function expectedRollup(windows: readonly SeasonWindow[]): Promise<string[]> {
  const visits = await sql<VisitRow>(
    `select caste, plant_taxon_id, bee_taxon_id, plant_status, bee_status, to_char(event_local_date, 'YYYY-MM-DD') as local_date,
            decimal_latitude, decimal_longitude, site_id, recorder_id from visit`,
  );
  const counts = new Map<string, number>();
  for (const v of visits) {
    if (v.plant_taxon_id === null) continue;
    if (v.plant_status === "cannot_be_determined" || v.bee_status === "cannot_be_determined") continue;
    const verified = (s: string) => s === "confirmed" || s === "corrected";
    const evidence = verified(v.plant_status) && verified(v.bee_status) ? "confirmed" : "proposed";
    const band = bandOf(v.decimal_latitude);
    const season = seasonOf(v.local_date, band, windows) ?? "";
    // A site by its id; a visit without one by its 0.01° grid cell, numbered below zero.
    const site = v.site_id !== null ? v.site_id : -((Math.floor(v.decimal_latitude * 100) + 9001) * 40000 + (Math.floor(v.decimal_longitude * 100) + 18001));
    const key = [v.caste, season, band, evidence, Number(v.local_date.slice(0, 4)), Number(v.local_date.slice(5, 7)), v.bee_taxon_id ?? 0, v.plant_taxon_id, site, v.recorder_id].join("|");
    counts.set(key, (counts.get(key) ?? 0) + 1);
  }
  return [...counts].map(([key, n]) => `${key}|${n}`).sort();
}

async function actualRollup(): Promise<string[]> {
  const rows = await sql<Record<string, unknown>>(
    `select caste, season, band, evidence, year, month, bee_taxon_id, plant_taxon_id, site_key, recorder_id, visits from forage_count`,
  );
  return rows.map((r) => Object.values(r).join("|")).sort();
}

/** The coarser rollups must always be the finest one summed over the dimensions they drop. */
async function expectMonthRollupConsistent() {
  const coarse = await sql<Record<string, unknown>>(
    `select caste, season, band, evidence, year, month, bee_taxon_id, plant_taxon_id, visits from forage_month_count order by 1, 2, 3, 4, 5, 6, 7, 8`,
  );
  const summed = await sql<Record<string, unknown>>(
    `select caste, season, band, evidence, year, month, bee_taxon_id, plant_taxon_id, sum(visits)::int as visits
     from forage_count group by 1, 2, 3, 4, 5, 6, 7, 8 order by 1, 2, 3, 4, 5, 6, 7, 8`,
  );
  expect(coarse).toEqual(summed);
  const coarsest = await sql<Record<string, unknown>>(`select caste, band, evidence, year, month, visits from forage_band_month_count order by 1, 2, 3, 4, 5`);
  const summedAgain = await sql<Record<string, unknown>>(
    `select caste, band, evidence, year, month, sum(visits)::int as visits from forage_count group by 1, 2, 3, 4, 5 order by 1, 2, 3, 4, 5`,
  );
  expect(coarsest).toEqual(summedAgain);
  const presence = await sql<Record<string, unknown>>(
    `select caste, season, band, evidence, year, plant_taxon_id, site_key, recorder_id, visits from forage_presence order by 1, 2, 3, 4, 5, 6, 7, 8`,
  );
  const summedOverBeeAndMonth = await sql<Record<string, unknown>>(
    `select caste, season, band, evidence, year, plant_taxon_id, site_key, recorder_id, sum(visits)::int as visits
     from forage_count group by 1, 2, 3, 4, 5, 6, 7, 8 order by 1, 2, 3, 4, 5, 6, 7, 8`,
  );
  expect(presence).toEqual(summedOverBeeAndMonth);
}

describe("the forage rollup", () => {
  let recorders: CurrentUser[];
  let botanist: CurrentUser;
  let verifier: CurrentUser;
  let plants: number[];
  let bees: number[];
  let sites: number[];

  beforeEach(async () => {
    await seedChecklists(orm.em.fork());
    recorders = [await person("one@example.org", ["recorder"]), await person("two@example.org", ["recorder"])];
    botanist = await person("botanist@example.org", ["botanist"]);
    verifier = await person("verifier@example.org", ["bee_verifier"]);
    const em = orm.em.fork();
    plants = (await em.find(PlantTaxon, {}, { limit: 12, orderBy: { id: "asc" } })).map((p) => p.id);
    bees = (await em.find(BeeTaxon, {}, { limit: 5, orderBy: { id: "asc" } })).map((b) => b.id);
    sites = [];
    for (const [name, lat] of [["North fen", 42.31], ["South bluff", 41.62]] as const) {
      const site = em.create(Site, { name, decimalLatitude: lat, decimalLongitude: -89.5 });
      await em.flush();
      sites.push(site.id);
    }
  });

  it("equals the aggregate of the raw visits after random inserts, determinations, edits and deletions", async () => {
    const random = seededRandom(20261202).next;
    const pick = <T,>(items: readonly T[]): T => items[Math.floor(random() * items.length)]!;
    // Dates on both sides of every default boundary: 19/20 April (north), 31 March/1 April, 31 May/1 June, 30 September/1 October.
    const days = ["2025-03-31", "2025-04-01", "2025-04-19", "2025-04-20", "2025-05-31", "2025-06-01", "2025-08-01", "2025-09-30", "2025-10-01", "2026-01-15", "2024-04-25"];
    const ids: number[] = [];
    for (let i = 0; i < 80; i++) {
      const useSite = random() < 0.4;
      const lat = pick([41.9999, 42.0, 42.0001, 43.1, 40.2]);
      const input = visitInput.parse({
        clientSubmissionId: crypto.randomUUID(),
        eventDate: `${pick(days)}T${pick(["06:30", "12:00", "18:45"])}:00-05:00`,
        ...(useSite ? { siteId: pick(sites) } : { decimalLatitude: lat, decimalLongitude: pick([-89.4012, -89.4099, -88.1]) }),
        ...(random() < 0.15 ? {} : { beeTaxonId: pick(bees) }),
        caste: pick(CASTES),
        beeIdentificationConfidence: "probable",
        behavior: "nectar_foraging",
        plantTaxonId: pick(plants),
      });
      ids.push((await createVisit(orm.em.fork(), pick(recorders).id, input, noPhotos)).visit.id);
    }
        expect(await actualRollup()).toEqual(await expectedRollup(DEFAULT_SEASON_WINDOWS));
    await expectMonthRollupConsistent();

    const version = async (id: number) => (await sql<{ version: number }>(`select version from visit where id = ?`, [id]))[0]!.version;
    for (const id of ids.slice(0, 45)) {
      const roll = random();
      const plantAction = roll < 0.5 ? { action: "confirm" } : roll < 0.8 ? { action: "correct", plantTaxonId: pick(plants) } : { action: "cannot_be_determined", remarks: "flowers not in the photo" };
      const hasPlant = (await sql<{ p: number | null }>(`select plant_taxon_id as p from visit where id = ?`, [id]))[0]!.p !== null;
      if (hasPlant || plantAction.action === "correct") {
        await determine(orm.em.fork(), botanist, id, determinationInput.parse({ subject: "plant", version: await version(id), ...plantAction }), ORIGIN);
      }
      const beeAction = random() < 0.6 ? { action: "confirm" } : { action: "correct", beeTaxonId: pick(bees), caste: pick(CASTES) };
      const hasBee = (await sql<{ b: number | null }>(`select bee_taxon_id as b from visit where id = ?`, [id]))[0]!.b !== null;
      if (hasBee || beeAction.action === "correct") {
        await determine(orm.em.fork(), verifier, id, determinationInput.parse({ subject: "bee", version: await version(id), ...beeAction }), ORIGIN);
      }
    }
    expect(await actualRollup()).toEqual(await expectedRollup(DEFAULT_SEASON_WINDOWS));
    await expectMonthRollupConsistent();

    // Edits that move a visit between cells, and deletions.
    await sql(`update visit set event_local_date = event_local_date + 20 where id in (${ids.slice(40, 50).join(",")})`);
    await sql(`update visit set site_id = ? where id in (${ids.slice(50, 55).join(",")})`, [sites[0]]);
    // A plant taken back to "not identified" leaves the rollup.
    await sql(`update visit set plant_taxon_id = null where id in (${ids.slice(55, 58).join(",")})`);
    await sql(`update visit set occurrence_remarks = 'nothing the rollup files by' where id in (${ids.slice(0, 10).join(",")})`);
    await sql(`delete from visit where id in (${ids.filter((_, i) => i % 4 === 0).join(",")})`);
    expect(await actualRollup()).toEqual(await expectedRollup(DEFAULT_SEASON_WINDOWS));
    await expectMonthRollupConsistent();

    // Moving a window boundary refiles every visit.
    const moved = DEFAULT_SEASON_WINDOWS.map((w) => (w.band === "north" && w.name === "early-spring" ? { ...w, start: "04-10" } : w));
    await saveSeasonWindows(orm.em.fork(), moved);
    expect(await listSeasonWindows(orm.em.fork())).toContainEqual({ band: "north", name: "early-spring", start: "04-10", end: "05-31" });
    expect(await actualRollup()).toEqual(await expectedRollup(moved));
    await expectMonthRollupConsistent();

    // No zero rows are left behind.
    expect(await sql(`select * from forage_count where visits <= 0`)).toEqual([]);
    expect(await sql(`select * from forage_month_count where visits <= 0`)).toEqual([]);
    expect(await sql(`select * from forage_band_month_count where visits <= 0`)).toEqual([]);
    expect(await sql(`select * from forage_presence where visits <= 0`)).toEqual([]);
  });

  it("refuses overlapping windows and changes nothing", async () => {
    const before = await actualRollup();
    const overlapping = DEFAULT_SEASON_WINDOWS.map((w) => (w.band === "south" && w.name === "second-wave" ? { ...w, start: "05-15" } : w));
    await expect(saveSeasonWindows(orm.em.fork(), overlapping)).rejects.toThrow(/share days/);
    expect(await listSeasonWindows(orm.em.fork())).toEqual(
      [...DEFAULT_SEASON_WINDOWS].sort((a, b) => (a.band === b.band ? 0 : a.band === "north" ? -1 : 1)),
    );
    expect(await actualRollup()).toEqual(before);
  });
});
