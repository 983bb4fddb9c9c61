// Feeds the planting recommendation from PostgreSQL: the plant checklist as candidates, each
// with the forage evidence of its band's early-spring window, and who stocks what.

import type { EntityManager } from "@mikro-orm/postgresql";
import { PlantTaxon, StockItem } from "../entities/index.ts";
import { rankingQuery } from "../forage/forage-query.ts";
import { forageRanking } from "../forage/forage.server.ts";
import { listSeasonWindows } from "../forage/season-windows.server.ts";
import type { Band } from "../forage/seasons.ts";
import type { GrowthForm, RegionalStatus } from "../taxa/checklist-schema.ts";
import { earlySpringMonthsOf, recommendPlanting, type ForageEvidence, type PlantingRecommendation, type RecommendationOptions } from "./recommend.ts";
import type { StockAvailability, StockForm } from "./vocabulary.ts";

export interface PlantingCandidateRecord {
  id: number;
  scientificName: string;
  family: string;
  vernacularName: string | null;
  growthForm: GrowthForm;
  regionalStatus: RegionalStatus;
  bloomStart: number;
  bloomEnd: number;
  evidence: ForageEvidence | null;
}

/**
 * Every plant of the checklist with, where it has any, its forage evidence: its place in the
 * ranking of queen visits (confirmed determinations, all bumble bees) in the band's
 * early-spring window, when queens need flowers most.
 */
export async function plantingCandidates(em: EntityManager, band: Band): Promise<PlantingCandidateRecord[]> {
  const [taxa, ranking] = await Promise.all([
    em.find(PlantTaxon, {}, { orderBy: { scientificName: "asc" } }),
    forageRanking(em.fork(), rankingQuery.parse({ band, caste: "queen", window: "early-spring" })),
  ]);
  const evidence = new Map(
    ranking.items.map((item) => [item.plant.id, { rank: item.rank, visits: item.visits, wilsonLow: item.wilsonLow, wilsonHigh: item.wilsonHigh, fewRecords: item.fewRecords }]),
  );
  return taxa.map((taxon) => ({
    id: taxon.id,
    scientificName: taxon.scientificName,
    family: taxon.family,
    vernacularName: taxon.vernacularNames[0] ?? null,
    growthForm: taxon.growthForm,
    regionalStatus: taxon.regionalStatus,
    bloomStart: taxon.bloomStart,
    bloomEnd: taxon.bloomEnd,
    evidence: evidence.get(taxon.id) ?? null,
  }));
}

/**
 * The recommendation for these options over the checklist, with the early-spring months of the
 * programme's own window for the band (a coordinator may have moved it).
 */
export async function recommendFromChecklist(
  em: EntityManager,
  options: RecommendationOptions,
): Promise<PlantingRecommendation<PlantingCandidateRecord>> {
  const [candidates, windows] = await Promise.all([plantingCandidates(em, options.band), listSeasonWindows(em.fork())]);
  return recommendPlanting({ ...options, earlySpringMonths: options.earlySpringMonths ?? earlySpringMonthsOf(options.band, windows) }, candidates);
}

export interface StockOffer {
  nurseryId: number;
  nurseryName: string;
  form: StockForm;
  availability: StockAvailability;
  availabilityNote: string;
  sourceRegion: string;
  grownWithoutSystemicInsecticides: boolean;
}

/** Who offers each of these taxa, nursery by nursery (active nursery accounts only). */
export async function stockOffersFor(em: EntityManager, taxonIds: readonly number[]): Promise<Map<number, StockOffer[]>> {
  const offers = new Map<number, StockOffer[]>();
  if (taxonIds.length === 0) return offers;
  const items = await em.find(
    StockItem,
    { plantTaxon: { $in: [...taxonIds] }, nursery: { status: "active" } },
    { populate: ["nursery"], orderBy: { nursery: { name: "asc" }, form: "asc" } },
  );
  for (const item of items) {
    const list = offers.get(item.plantTaxon.id) ?? [];
    list.push({
      nurseryId: item.nursery.id,
      nurseryName: item.nursery.name,
      form: item.form,
      availability: item.availability,
      availabilityNote: item.availabilityNote,
      sourceRegion: item.sourceRegion,
      grownWithoutSystemicInsecticides: item.grownWithoutSystemicInsecticides,
    });
    offers.set(item.plantTaxon.id, list);
  }
  return offers;
}
