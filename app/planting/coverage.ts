// Bloom coverage of a planting list as it stands — a recommendation, the same after swaps, or a
// saved list — with the same rules as the recommendation (app/planting/recommend.ts): a season
// month is met when at least `minPerMonth` listed species flower in it. Pure module, shared by
// the pages and the server.

import { bloomMonths, MONTH_NAMES } from "~/taxa/bloom";
import { GROWTH_FORMS, type GrowthForm } from "~/taxa/checklist-schema";
import type { MonthCoverage, PlantingCandidate, RecommendationOptions, UnmetMonth } from "./recommend";

/** What coverage and swaps need to know of a list's settings. */
export interface CoverageOptions {
  months: { start: number; end: number };
  minPerMonth: number;
  forms: readonly GrowthForm[];
  nativeOnly: boolean;
  /** The band's early-spring months (queen emergence), preferred in every choice. */
  earlySpringMonths: readonly number[];
  /** The size limit the list was made with, if any (only used to explain a short month). */
  size?: number;
}

export function coverageOptionsOf(options: RecommendationOptions, earlySpringMonths: readonly number[]): CoverageOptions {
  return {
    months: options.months,
    minPerMonth: options.minPerMonth,
    forms: options.forms,
    nativeOnly: options.nativeOnly,
    earlySpringMonths: [...earlySpringMonths],
    size: options.size,
  };
}

export function seasonMonthsOf(months: { start: number; end: number }): number[] {
  const list: number[] = [];
  for (let m = months.start; m <= months.end; m++) list.push(m);
  return list;
}

/** The season months a taxon flowers in, ascending. */
export function monthsInSeason(taxon: Pick<PlantingCandidate, "bloomStart" | "bloomEnd">, months: { start: number; end: number }): number[] {
  const bloom = bloomMonths(taxon.bloomStart, taxon.bloomEnd);
  return seasonMonthsOf(months).filter((m) => bloom.has(m));
}

/**
 * Whether the list's filters let this taxon on it: never an invasive taxon (planting spreads
 * it), introduced ones only when the list is not native-only, and one of the chosen forms.
 * The same rule as recommendPlanting's pool.
 */
export function isAllowed(taxon: Pick<PlantingCandidate, "regionalStatus" | "growthForm">, options: Pick<CoverageOptions, "forms" | "nativeOnly">): boolean {
  if (taxon.regionalStatus === "invasive") return false;
  if (options.nativeOnly && taxon.regionalStatus !== "native") return false;
  return options.forms.length === 0 || options.forms.includes(taxon.growthForm);
}

/** Listed species in flower in each season month. */
export function monthCounts(listed: readonly Pick<PlantingCandidate, "bloomStart" | "bloomEnd">[], months: { start: number; end: number }): Map<number, number> {
  const counts = new Map(seasonMonthsOf(months).map((m) => [m, 0]));
  for (const taxon of listed) for (const m of monthsInSeason(taxon, months)) counts.set(m, counts.get(m)! + 1);
  return counts;
}

function allowedWords(options: Pick<CoverageOptions, "forms" | "nativeOnly">): string {
  const status = options.nativeOnly ? "native" : "native or introduced";
  const everyForm = options.forms.length === 0 || GROWTH_FORMS.every((form) => options.forms.includes(form));
  return everyForm ? `${status} species` : `${status} ${options.forms.join(" or ")} species`;
}

export interface ListCoverage {
  perMonth: MonthCoverage[];
  unmet: UnmetMonth[];
}

/**
 * Per-month counts of a list and, for each month below the minimum, why: the checklist has too
 * few allowed species in flower then, or the list (its size limit, or later swaps and checklist
 * edits) holds fewer than the checklist could give.
 */
export function listCoverage(options: CoverageOptions, listed: readonly PlantingCandidate[], candidates: readonly PlantingCandidate[]): ListCoverage {
  const counts = monthCounts(listed, options.months);
  const needed = options.minPerMonth;
  const allowed = candidates.filter((c) => isAllowed(c, options));
  const perMonth = [...counts].map(([month, count]) => ({ month, count, met: count >= needed }));
  const unmet = perMonth
    .filter((entry) => !entry.met)
    .map(({ month, count }) => {
      const name = MONTH_NAMES[month - 1]!;
      const available = allowed.filter((c) => bloomMonths(c.bloomStart, c.bloomEnd).has(month)).length;
      let why: string;
      if (available === 0) why = `The checklist has no ${allowedWords(options)} in flower in ${name}; ${needed} needed`;
      else if (available < needed) why = `The checklist has only ${available} ${allowedWords(options)} in flower in ${name}; ${needed} needed`;
      else if (options.size !== undefined && listed.length >= options.size)
        why = `The list is at its size limit of ${options.size} with ${count} in flower in ${name}; ${needed} needed (the checklist has ${available})`;
      else why = `${count} of the list's species flower in ${name}; ${needed} needed, though the checklist has ${available} ${allowedWords(options)} in flower then`;
      return { month, count, needed, why };
    });
  return { perMonth, unmet };
}
