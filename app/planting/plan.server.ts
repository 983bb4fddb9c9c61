// Gathers what a planting page shows from PostgreSQL: the checklist with its early-spring forage
// evidence, the programme's early-spring window, and nursery offers; then the pure parts
// (recommend.ts, swap.ts, plan.ts) do the rest.

import type { EntityManager } from "@mikro-orm/postgresql";
import { listSeasonWindows } from "../forage/season-windows.server.ts";
import type { Band } from "../forage/seasons.ts";
import { coverageOptionsOf } from "./coverage.ts";
import { describePlan, type PlanSettings, type PlanTaxon, type PlanView } from "./plan.ts";
import { plantingCandidates, stockOffersFor } from "./planting.server.ts";
import { earlySpringMonthsOf, recommendPlanting, type RecommendationOptions } from "./recommend.ts";
import { applySwap, SwapRefused } from "./swap.ts";

/** The checklist as candidates for a band, and that band's early-spring months as the programme set them. */
export async function planningGround(em: EntityManager, band: Band): Promise<{ candidates: PlanTaxon[]; earlySpringMonths: number[] }> {
  const [candidates, windows] = await Promise.all([plantingCandidates(em, band), listSeasonWindows(em.fork())]);
  return { candidates, earlySpringMonths: earlySpringMonthsOf(band, windows) };
}

export function settingsOf(options: RecommendationOptions): PlanSettings {
  return {
    band: options.band,
    months: options.months,
    minPerMonth: options.minPerMonth,
    size: options.size ?? null,
    forms: [...options.forms],
    nativeOnly: options.nativeOnly,
  };
}

export interface DraftPlan {
  view: PlanView;
  /** The swaps that were applied, in order; a stale one (its species gone) is left out. */
  swaps: { from: number; to: number }[];
  /** Why a swap asked for in the address was not made. */
  swapProblems: string[];
  /** The species in the list's order with their reasons, as saveList takes them. */
  items: { taxonId: number; reason: string }[];
}

/**
 * The recommendation for these options, with the swaps applied one after another (each must
 * keep coverage given the ones before it). Swaps live in the address, so an unsaved list
 * survives a reload and a shared link; a swap that no longer fits is reported, not applied.
 */
export async function draftPlan(em: EntityManager, options: RecommendationOptions, swaps: readonly { from: number; to: number }[]): Promise<DraftPlan> {
  const { candidates, earlySpringMonths } = await planningGround(em, options.band);
  const recommendation = recommendPlanting({ ...options, earlySpringMonths }, candidates);
  const coverage = coverageOptionsOf(options, earlySpringMonths);
  let listed = recommendation.species.map((s) => s.taxon);
  const reasons = new Map(recommendation.species.map((s) => [s.taxon.id, s.reason]));
  const applied: { from: number; to: number }[] = [];
  const swapProblems: string[] = [];
  for (const swap of swaps) {
    try {
      const result = applySwap(coverage, listed, swap.from, swap.to, candidates);
      listed = result.listed;
      reasons.set(swap.to, result.alternative.reason);
      applied.push(swap);
    } catch (error) {
      if (!(error instanceof SwapRefused)) throw error;
      swapProblems.push(error.message);
    }
  }
  const entries = listed.map((taxon) => ({ taxon, reason: reasons.get(taxon.id) ?? "" }));
  const offers = await stockOffersFor(em, listed.map((t) => t.id));
  return {
    view: describePlan(settingsOf(options), earlySpringMonths, entries, candidates, offers),
    swaps: applied,
    swapProblems,
    items: entries.map((e) => ({ taxonId: e.taxon.id, reason: e.reason })),
  };
}

/** GET /api/planting/recommendation: the recommendation as JSON, in the documented shape. */
export async function recommendationApiBody(em: EntityManager, options: RecommendationOptions) {
  const { candidates, earlySpringMonths } = await planningGround(em, options.band);
  const result = recommendPlanting({ ...options, earlySpringMonths }, candidates);
  return {
    band: options.band,
    months: options.months,
    minPerMonth: options.minPerMonth,
    size: options.size ?? null,
    forms: options.forms,
    nativeOnly: options.nativeOnly,
    earlySpringMonths: result.earlySpringMonths,
    species: result.species.map(({ taxon, reason, monthsCovered }) => ({
      id: taxon.id,
      scientificName: taxon.scientificName,
      vernacularName: taxon.vernacularName,
      family: taxon.family,
      growthForm: taxon.growthForm,
      regionalStatus: taxon.regionalStatus,
      bloomStart: taxon.bloomStart,
      bloomEnd: taxon.bloomEnd,
      reason,
      monthsCovered,
      evidence: taxon.evidence,
    })),
    perMonth: result.perMonth,
    unmet: result.unmet,
  };
}
