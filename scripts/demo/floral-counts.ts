/**
 * The demo programme's floral counts: spring surveys at four of the demo sites, so the forage
 * ranking can set the visits against what was in flower. Invented like the visits they sit
 * beside: the plants are real, the counts are not. Drawn by the same fixed-seed generator, so
 * every run makes the same data.
 */
import type { EntityManager } from "@mikro-orm/postgresql";
import { FloralCount, PlantTaxon, Site, User } from "../../app/entities/index.ts";
import { DEMO_ACCOUNTS } from "../../app/db/demo-seed.server.ts";
import { bloomMonths } from "../../app/taxa/bloom.ts";
import { recordFloralSurvey } from "../../app/forage/floral-counts.server.ts";
import { seededRandom } from "./visits.ts";

/** Two sites on each side of 42° N, so both bands' spring windows have counts. */
export const DEMO_FLORAL_SITES = ["Hollow Oak Savanna", "Millrace Woodlot", "Birch Hollow Barrens", "Sandhill Crane Marsh"] as const;

const DEMO_YEARS = [2022, 2023, 2024, 2025];

// Survey days as [month, first day, last day], inside each band's default early-spring window
// (app/forage/seasons.ts): northern queens are out from about 20 April.
const SOUTH_ROUNDS = [[4, 6, 12], [4, 22, 28], [5, 12, 20]] as const;
const NORTH_ROUNDS = [[4, 22, 28], [5, 6, 12], [5, 20, 27]] as const;

// Spring flowers the demo visits almost never use (they draw them at the background weight, and
// never the invasive garlic mustard), counted in plenty so the ratios show avoidance as well as
// preference. Their real attractiveness to bumble bees is not claimed here.
const RARELY_VISITED = [
  "Alliaria petiolata",
  "Claytonia virginica",
  "Viola sororia",
  "Fragaria virginiana",
  "Erythronium americanum",
  "Thalictrum thalictroides",
  "Lamium purpureum",
];

/** At most this many of a site's visited plants per survey: a spring walk finds some, not all. */
const VISITED_PER_SURVEY = 8;

export interface DemoFloralCountsSummary {
  surveys: number;
  counts: number;
}

/**
 * Adds the demo floral counts when none exist yet at the chosen sites (run after
 * `seedDemoVisits`: the plants counted are those the visits at each site use, plus the rarely
 * visited ones above). Re-running adds nothing.
 */
export async function seedDemoFloralCounts(em: EntityManager): Promise<DemoFloralCountsSummary> {
  const none = { surveys: 0, counts: 0 };
  const sites = await em.find(Site, { name: { $in: [...DEMO_FLORAL_SITES] } }, { orderBy: { name: "asc" } });
  if (sites.length === 0) return none;
  if (await em.count(FloralCount, { site: { $in: sites } })) return none;
  const counters = await em.find(User, { email: { $in: DEMO_ACCOUNTS.filter((a) => a.roles[0] === "recorder" || a.roles[0] === "botanist").map((a) => a.email) } }, { orderBy: { id: "asc" } });
  if (counters.length === 0) return none;

  const plants = await em.find(PlantTaxon, {}, { orderBy: { id: "asc" } });
  const byName = new Map(plants.map((plant) => [plant.scientificName, plant]));
  const byId = new Map(plants.map((plant) => [plant.id, plant]));
  const rare = RARELY_VISITED.map((name) => byName.get(name)).filter((plant): plant is PlantTaxon => Boolean(plant));

  const random = seededRandom(20260505);
  const summary = { ...none };
  for (const site of sites) {
    const visited = await em.getConnection().execute<{ plant: number; visits: number }[]>(
      `select plant_taxon_id as plant, count(*)::int as visits from visit
       where site_id = ? and plant_taxon_id is not null and extract(month from event_local_date) in (4, 5)
       group by plant_taxon_id order by visits desc, plant_taxon_id`,
      [site.id],
    );
    const rounds = site.decimalLatitude >= 42 ? NORTH_ROUNDS : SOUTH_ROUNDS;
    for (const year of DEMO_YEARS) {
      for (const [month, firstDay, lastDay] of rounds) {
        const inBloom = (plant: PlantTaxon) => bloomMonths(plant.bloomStart, plant.bloomEnd).has(month);
        const used = visited.map((row) => byId.get(row.plant)!).filter(inBloom).slice(0, VISITED_PER_SURVEY);
        const avoided = rare.filter((plant) => inBloom(plant) && !used.includes(plant));
        const rows = [
          // Favourites are mostly scarce, a few common: use above their share of the flowers.
          ...used.map((plant) => ({ plant, units: random.next() < 0.25 ? random.int(300, 900) : random.int(20, 250) })),
          // Ignored flowers are plentiful: use far below their share.
          ...avoided.map((plant) => ({ plant, units: random.int(600, 2400) })),
        ].filter(() => random.next() < 0.85);
        if (rows.length === 0) continue;
        const day = random.int(firstDay, lastDay);
        const result = await recordFloralSurvey(em, random.pick(counters), {
          siteId: site.id,
          surveyDate: `${year}-${String(month).padStart(2, "0")}-${String(day).padStart(2, "0")}`,
          rows: rows.map((row) => ({ plantTaxonId: row.plant.id, floweringUnits: row.units })),
          remarks: random.next() < 0.3 ? "Counted along the marked 200 m transect, 2 m either side." : "",
        });
        summary.surveys++;
        summary.counts += result.created;
      }
    }
  }
  return summary;
}
