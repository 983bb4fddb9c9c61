// Feeds the forage computations from PostgreSQL. Every figure is read from the rollups kept by
// triggers on `visit`, never from raw visits: `forage_count` (with site and recorder, for the
// ranking's distinct counts), `forage_presence` (the same without bee and month, for rankings
// of all bumble bees over a window), `forage_month_count` (without site and recorder, for the
// matrix) and `forage_band_month_count` (caste, band, year and month only, for the calendar). The statistics are the pure functions beside this module.

import type { EntityManager } from "@mikro-orm/postgresql";
import { BeeTaxon, PlantTaxon } from "../entities/index.ts";
import { CASTES, type Caste } from "../visits/vocabulary.ts";
import { UNIDENTIFIED_BEE_NAME, type MatrixQuery, type RankingQuery, type SeasonQuery } from "./forage-query.ts";
import { rankForage } from "./ranking.ts";
import { listSeasonWindows } from "./season-windows.server.ts";
import { BANDS, type Band, type SeasonName } from "./seasons.ts";
import { jacobsD, manlySelectionRatios } from "./selection.ts";

/** A parameter the database cannot answer for (an unknown bee name); the API says 400. */
export class ForageQueryRefused extends Error {
  constructor(
    message: string,
    readonly fields: Record<string, string[]>,
  ) {
    super(message);
    this.name = "ForageQueryRefused";
  }
}

interface Filters {
  beeId?: number;
  caste?: Caste;
  band: "north" | "south" | "all";
  from?: number;
  to?: number;
  determination: "confirmed" | "any";
  months?: number[];
  season?: SeasonName;
}

/** The WHERE clause over forage_count for the filters, with its positional parameters. */
function whereOf(filters: Filters): { sql: string; params: unknown[] } {
  const clauses: string[] = [];
  const params: unknown[] = [];
  if (filters.caste) (clauses.push("caste = ?"), params.push(filters.caste));
  if (filters.season) (clauses.push("season = ?"), params.push(filters.season));
  if (filters.band !== "all") (clauses.push("band = ?"), params.push(filters.band));
  if (filters.determination === "confirmed") clauses.push("evidence = 'confirmed'");
  if (filters.from !== undefined) (clauses.push("year >= ?"), params.push(filters.from));
  if (filters.to !== undefined) (clauses.push("year <= ?"), params.push(filters.to));
  if (filters.months) (clauses.push(`month in (${placeholders(filters.months)})`), params.push(...filters.months));
  if (filters.beeId !== undefined) (clauses.push("bee_taxon_id = ?"), params.push(filters.beeId));
  return { sql: clauses.length ? `where ${clauses.join(" and ")}` : "", params };
}

/**
 * Which rollup answers a ranking: without a bee or months, forage_presence (no bee, no month,
 * about half the rows); otherwise forage_count, which has both.
 */
function rankingTableFor(filters: Filters): "forage_presence" | "forage_count" {
  return filters.beeId === undefined && filters.months === undefined ? "forage_presence" : "forage_count";
}

/** The bee's id in the rollup: 0 for "Bombus sp.", undefined for all bumble bees. */
async function beeIdOf(em: EntityManager, name: string | undefined): Promise<number | undefined> {
  if (name === undefined) return undefined;
  if (name === UNIDENTIFIED_BEE_NAME) return 0;
  const bee = await em.findOne(BeeTaxon, { scientificName: name });
  if (!bee) {
    throw new ForageQueryRefused(`${name} is not on the bee checklist.`, { bee: ["is not on the bee checklist (use its accepted scientific name)"] });
  }
  return bee.id;
}

export interface ForageMatrix {
  months: number[];
  bees: string[];
  plants: string[];
  cells: { bee: string; plant: string; month: number; visits: number }[];
}

/** Visits by bee × plant × month, non-zero cells only, named by accepted scientific names. */
export async function forageMatrix(em: EntityManager, query: MatrixQuery): Promise<ForageMatrix> {
  const beeId = await beeIdOf(em, query.bee);
  const where = whereOf({ ...query, beeId });
  const rows = await em.getConnection().execute<{ bee: number; plant: number; month: number; visits: number }[]>(
    `select bee_taxon_id as bee, plant_taxon_id as plant, month, sum(visits)::int as visits
     from forage_month_count ${where.sql} group by bee_taxon_id, plant_taxon_id, month`,
    where.params,
  );
  const beeNames = await namesOf(em, "bee_taxon", rows.map((r) => r.bee));
  const plantNames = await namesOf(em, "plant_taxon", rows.map((r) => r.plant));
  const cells = rows
    .map((r) => ({ bee: beeNames.get(r.bee)!, plant: plantNames.get(r.plant)!, month: r.month, visits: r.visits }))
    .sort((a, b) => compare(a.bee, b.bee) || compare(a.plant, b.plant) || a.month - b.month);
  return {
    months: [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12],
    bees: [...new Set(cells.map((c) => c.bee))].sort(compare),
    plants: [...new Set(cells.map((c) => c.plant))].sort(compare),
    cells,
  };
}

const compare = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);

/** "?, ?, ?" for a non-empty list of bound values. */
const placeholders = (values: readonly unknown[]) => values.map(() => "?").join(", ");

async function namesOf(em: EntityManager, table: "bee_taxon" | "plant_taxon", ids: number[]): Promise<Map<number, string>> {
  const wanted = [...new Set(ids)].filter((id) => id !== 0);
  const names = new Map<number, string>([[0, UNIDENTIFIED_BEE_NAME]]);
  if (wanted.length === 0) return names;
  const rows = await em.getConnection().execute<{ id: number; scientific_name: string }[]>(
    `select id, scientific_name from ${table} where id in (${placeholders(wanted)})`,
    wanted,
  );
  for (const row of rows) names.set(row.id, row.scientific_name);
  return names;
}

export interface RankingItem {
  rank: number;
  plant: { id: number; scientificName: string; family: string };
  visits: number;
  share: number;
  wilsonLow: number;
  wilsonHigh: number;
  sites: number;
  years: number;
  recorders: number;
  fewRecords: boolean;
  selectionRatio: number | null;
  selectionLow: number | null;
  selectionHigh: number | null;
  jacobsD: number | null;
}

export interface ForageRanking {
  window: {
    name: SeasonName | null;
    months: number[] | null;
    band: "north" | "south" | "all";
    ranges: { band: Band; start: string; end: string }[];
  };
  totalVisits: number;
  items: RankingItem[];
}

/**
 * Plants ranked by the Wilson lower limit of their share of the visits in the window (see
 * ./ranking), with sites, years and recorders, and, where flowers were counted at the same
 * sites in the same window, Manly's selection ratios and Jacobs' D against that availability.
 */
export async function forageRanking(em: EntityManager, query: RankingQuery): Promise<ForageRanking> {
  const beeId = await beeIdOf(em, query.bee);
  const filters: Filters = { ...query, beeId, season: query.window };
  const where = whereOf(filters);
  const rows = await em.getConnection().execute<{ plant: number; visits: number; sites: number; years: number; recorders: number }[]>(
    `select plant_taxon_id as plant, sum(visits)::int as visits, count(distinct site_key)::int as sites,
            count(distinct year)::int as years, count(distinct recorder_id)::int as recorders
     from ${rankingTableFor(filters)} ${where.sql} group by plant_taxon_id`,
    where.params,
  );
  const plants = new Map(
    (await em.find(PlantTaxon, { id: { $in: rows.map((r) => r.plant) } }, { fields: ["id", "scientificName", "family"] })).map((p) => [p.id, p]),
  );
  const ranked = rankForage(
    rows.map((r) => ({ taxonId: r.plant, scientificName: plants.get(r.plant)!.scientificName, visits: r.visits, sites: r.sites, years: r.years, recorders: r.recorders })),
  );
  const selection = await selectionAgainstFlowers(em, filters);
  const windows = await listSeasonWindows(em);
  const bands = query.band === "all" ? BANDS : [query.band];
  return {
    window: {
      name: query.window ?? null,
      months: query.months ?? null,
      band: query.band,
      ranges: query.window ? windows.filter((w) => w.name === query.window && bands.includes(w.band)).map(({ band, start, end }) => ({ band, start, end })) : [],
    },
    totalVisits: ranked.reduce((sum, r) => sum + r.visits, 0),
    items: ranked.map((r) => {
      const plant = plants.get(Number(r.taxonId))!;
      const chosen = selection.get(plant.id);
      return {
        rank: r.rank,
        plant: { id: plant.id, scientificName: plant.scientificName, family: plant.family },
        visits: r.visits,
        share: r.share,
        wilsonLow: r.lower,
        wilsonHigh: r.upper,
        sites: r.sites,
        years: r.years,
        recorders: r.recorders,
        fewRecords: r.fewRecords,
        selectionRatio: chosen?.w ?? null,
        selectionLow: chosen?.lower ?? null,
        selectionHigh: chosen?.upper ?? null,
        jacobsD: chosen?.jacobsD ?? null,
      };
    }),
  };
}

/**
 * Manly et al. 2002 design I: visits at the sites where flowers were counted, in the same
 * window, band and years, against the share of flowering units of each plant counted there.
 * Only plants with counted flowers are resources (a ratio against zero availability is
 * undefined); fewer than two such plants, or no visits to them, give no ratios at all.
 */
async function selectionAgainstFlowers(em: EntityManager, filters: Filters) {
  const result = new Map<number, { w: number; lower: number; upper: number; jacobsD: number }>();
  const offered: unknown[] = [];
  const clauses: string[] = [];
  if (filters.season) (clauses.push("forage_season(forage_band(s.decimal_latitude), f.survey_date) = ?"), offered.push(filters.season));
  if (filters.months) (clauses.push(`extract(month from f.survey_date)::int in (${placeholders(filters.months)})`), offered.push(...filters.months));
  if (filters.band !== "all") (clauses.push("forage_band(s.decimal_latitude) = ?"), offered.push(filters.band));
  if (filters.from !== undefined) (clauses.push("extract(year from f.survey_date)::int >= ?"), offered.push(filters.from));
  if (filters.to !== undefined) (clauses.push("extract(year from f.survey_date)::int <= ?"), offered.push(filters.to));
  const flowers = await em.getConnection().execute<{ plant: number; site: number; units: number }[]>(
    `select f.plant_taxon_id as plant, f.site_id as site, sum(f.flowering_units)::int as units
     from floral_count f join site s on s.id = f.site_id
     ${clauses.length ? `where ${clauses.join(" and ")}` : ""} group by f.plant_taxon_id, f.site_id`,
    offered,
  );
  const units = new Map<number, number>();
  for (const row of flowers) if (row.units > 0) units.set(row.plant, (units.get(row.plant) ?? 0) + row.units);
  if (units.size < 2) return result;
  // A site's rollup key is its id (forage_site_key).
  const siteKeys = [...new Set(flowers.map((row) => row.site))];
  const where = whereOf(filters);
  const used = await em.getConnection().execute<{ plant: number; visits: number }[]>(
    `select plant_taxon_id as plant, sum(visits)::int as visits from ${rankingTableFor(filters)}
     ${where.sql ? `${where.sql} and` : "where"} site_key in (${placeholders(siteKeys)}) and plant_taxon_id in (${placeholders([...units.keys()])})
     group by plant_taxon_id`,
    [...where.params, ...siteKeys, ...units.keys()],
  );
  const plantIds = [...units.keys()];
  const usedBy = new Map(used.map((row) => [row.plant, row.visits]));
  const usedCounts = plantIds.map((id) => usedBy.get(id) ?? 0);
  if (usedCounts.every((u) => u === 0)) return result;
  const totalUnits = plantIds.reduce((sum, id) => sum + units.get(id)!, 0);
  const available = plantIds.map((id) => units.get(id)! / totalUnits);
  const manly = manlySelectionRatios({ used: usedCounts, available });
  plantIds.forEach((id, i) => {
    const ratio = manly.resources[i]!;
    result.set(id, { w: ratio.w, lower: ratio.lower, upper: ratio.upper, jacobsD: jacobsD(ratio.o, available[i]!) });
  });
  return result;
}

export interface SeasonCalendar {
  bands: {
    band: Band;
    windows: { name: SeasonName; start: string; end: string }[];
    months: ({ month: number } & Record<Caste, number>)[];
  }[];
}

/** Visits per band, month and caste over all bees and plants, with each band's windows. */
export async function seasonCalendar(em: EntityManager, query: SeasonQuery): Promise<SeasonCalendar> {
  const where = whereOf({ band: "all", from: query.from, to: query.to, determination: query.determination });
  const rows = await em.getConnection().execute<{ band: Band; month: number; caste: Caste; visits: number }[]>(
    `select band, month, caste, sum(visits)::int as visits from forage_band_month_count ${where.sql} group by band, month, caste`,
    where.params,
  );
  const windows = await listSeasonWindows(em);
  return {
    bands: BANDS.map((band) => ({
      band,
      windows: windows.filter((w) => w.band === band).map(({ name, start, end }) => ({ name, start, end })),
      months: Array.from({ length: 12 }, (_, i) => {
        const month = i + 1;
        const counts = Object.fromEntries(CASTES.map((caste) => [caste, 0])) as Record<Caste, number>;
        for (const row of rows) if (row.band === band && row.month === month) counts[row.caste] += row.visits;
        return { month, ...counts };
      }),
    })),
  };
}
