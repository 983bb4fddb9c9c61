// Swapping one species of a planting list for another: which species could take its place
// without costing bloom coverage. Pure module, shared by the planting page and the server.
//
// What "keeps coverage" means. Every season month keeps at least the count it had, up to the
// minimum: a month that met the minimum still meets it, and a month already short gets no
// shorter. A month above the minimum may lose a species (a 4 becomes a 3 when the minimum is
// 3), because that is the room a swap needs; asking for every count to stay as it was would
// allow only species with the same bloom months. Written out: after(m) ≥ min(before(m), k).
//
// Which alternatives come first: the recommendation's order of preference
// (app/planting/recommend.ts), so a planner who swaps sees the species the recommendation
// would have taken next:
// 1. one that fills a place left open in an early-spring month (queen emergence) once the
//    species swapped out is gone;
// 2. forage evidence: having any, then the Wilson lower limit of the early-spring visit share,
//    higher first, then the rank;
// 3. bloom length, longer first;
// 4. scientific name and id by code units, so the order never depends on locale or input order.
// The comparison is restated here rather than shared because recommend.ts keeps it private;
// swap.test.ts checks the two agree on the seeded checklist.

import { MONTH_NAMES, bloomMonths } from "~/taxa/bloom";
import { isAllowed, monthCounts, monthsInSeason, seasonMonthsOf, type CoverageOptions } from "./coverage";
import type { PlantingCandidate } from "./recommend";

export interface MonthChange {
  month: number;
  before: number;
  after: number;
}

export interface SwapAlternative<T extends PlantingCandidate = PlantingCandidate> {
  taxon: T;
  /** Season months it flowers in, ascending. */
  monthsCovered: number[];
  /** Season months whose count the swap changes. */
  changes: MonthChange[];
  /** Whether it fills a place left open in an early-spring month. */
  fillsEarlySpring: boolean;
  /** Why it would be on the list, in plain words, naming the species it replaces. */
  reason: string;
}

/** A swap that would cost coverage, or names a species not on the list or not allowed. */
export class SwapRefused extends Error {
  constructor(message: string) {
    super(message);
    this.name = "SwapRefused";
  }
}

const byCodeUnits = (a: string, b: string): number => (a < b ? -1 : a > b ? 1 : 0);
const compareIds = (a: number | string, b: number | string): number =>
  typeof a === "number" && typeof b === "number" ? a - b : byCodeUnits(String(a), String(b));

/** Preferences 2–4 of the header. */
export function compareStanding(a: PlantingCandidate, b: PlantingCandidate): number {
  const ea = a.evidence ?? null;
  const eb = b.evidence ?? null;
  if (ea && !eb) return -1;
  if (!ea && eb) return 1;
  if (ea && eb) {
    const byEvidence = eb.wilsonLow - ea.wilsonLow || ea.rank - eb.rank;
    if (byEvidence !== 0) return byEvidence;
  }
  return (
    bloomMonths(b.bloomStart, b.bloomEnd).size - bloomMonths(a.bloomStart, a.bloomEnd).size ||
    byCodeUnits(a.scientificName, b.scientificName) ||
    compareIds(a.id, b.id)
  );
}

const monthShort = (m: number) => MONTH_NAMES[m - 1]!.slice(0, 3);

/** "rank 3 in early-spring forage records (12 visits)", or that there are none yet. */
export function describeEvidence(evidence: PlantingCandidate["evidence"]): string {
  if (!evidence) return "no early-spring forage records yet";
  const visits = `${evidence.visits} ${evidence.visits === 1 ? "visit" : "visits"}`;
  return evidence.fewRecords
    ? `rank ${evidence.rank} in early-spring forage records, few records (${visits})`
    : `rank ${evidence.rank} in early-spring forage records (${visits})`;
}

function swapReason(taxon: PlantingCandidate, replaced: PlantingCandidate, earlySpring: ReadonlySet<number>): string {
  const bloom = bloomMonths(taxon.bloomStart, taxon.bloomEnd);
  const when = taxon.bloomStart === taxon.bloomEnd ? `in ${MONTH_NAMES[taxon.bloomStart - 1]}` : `${monthShort(taxon.bloomStart)}–${monthShort(taxon.bloomEnd)}`;
  const forQueens = [...bloom].some((m) => earlySpring.has(m)) ? ", when queens emerge" : "";
  const status = taxon.regionalStatus === "introduced" ? "; introduced, not native" : "";
  return `Swapped in for ${replaced.scientificName}; ${describeEvidence(taxon.evidence)}; blooms ${when}${forQueens}${status}`;
}

/**
 * The species that could replace `replaceId` on `listed` and keep coverage (see the header),
 * best first. Only species the list's filters allow, not already listed, and in flower in at
 * least one season month. A RangeError when `replaceId` is not on the list.
 */
export function swapAlternatives<T extends PlantingCandidate>(
  options: CoverageOptions,
  listed: readonly T[],
  replaceId: T["id"],
  candidates: readonly T[],
): SwapAlternative<T>[] {
  const replaced = listed.find((taxon) => taxon.id === replaceId);
  if (!replaced) throw new RangeError(`swapAlternatives: ${replaceId} is not on the list`);
  const needed = options.minPerMonth;
  const before = monthCounts(listed, options.months);
  const without = new Map(before);
  for (const m of monthsInSeason(replaced, options.months)) without.set(m, without.get(m)! - 1);
  const earlySpring = new Set(options.earlySpringMonths);
  const onList = new Set(listed.map((taxon) => taxon.id));
  const season = seasonMonthsOf(options.months);

  const alternatives: SwapAlternative<T>[] = [];
  for (const taxon of candidates) {
    if (onList.has(taxon.id) || !isAllowed(taxon, options)) continue;
    const covered = monthsInSeason(taxon, options.months);
    if (covered.length === 0) continue;
    const adds = new Set(covered);
    const keeps = season.every((m) => without.get(m)! + (adds.has(m) ? 1 : 0) >= Math.min(before.get(m)!, needed));
    if (!keeps) continue;
    const changes = season
      .map((m) => ({ month: m, before: before.get(m)!, after: without.get(m)! + (adds.has(m) ? 1 : 0) }))
      .filter((change) => change.after !== change.before);
    alternatives.push({
      taxon,
      monthsCovered: covered,
      changes,
      fillsEarlySpring: covered.some((m) => earlySpring.has(m) && without.get(m)! < needed),
      reason: swapReason(taxon, replaced, earlySpring),
    });
  }
  return alternatives.sort((a, b) => Number(b.fillsEarlySpring) - Number(a.fillsEarlySpring) || compareStanding(a.taxon, b.taxon));
}

/**
 * The list with `replaceId` replaced by `withId` in the same place, when that swap keeps
 * coverage; SwapRefused otherwise, saying why.
 */
export function applySwap<T extends PlantingCandidate>(
  options: CoverageOptions,
  listed: readonly T[],
  replaceId: T["id"],
  withId: T["id"],
  candidates: readonly T[],
): { listed: T[]; alternative: SwapAlternative<T> } {
  const index = listed.findIndex((taxon) => taxon.id === replaceId);
  if (index < 0) throw new SwapRefused("That species is not on the list any more.");
  const incoming = candidates.find((taxon) => taxon.id === withId);
  if (!incoming) throw new SwapRefused("No plant on the checklist has that number.");
  if (listed.some((taxon) => taxon.id === withId)) throw new SwapRefused(`${incoming.scientificName} is already on the list.`);
  if (!isAllowed(incoming, options)) {
    throw new SwapRefused(
      incoming.regionalStatus === "invasive"
        ? `${incoming.scientificName} is invasive here and is never recommended.`
        : `${incoming.scientificName} is not allowed by this list's filters (native only, growth forms).`,
    );
  }
  const alternative = swapAlternatives(options, listed, replaceId, candidates).find((a) => a.taxon.id === withId);
  if (!alternative) {
    throw new SwapRefused(`${incoming.scientificName} cannot replace ${listed[index]!.scientificName}: some month would fall below ${options.minPerMonth} species in flower.`);
  }
  const next = [...listed];
  next[index] = incoming;
  return { listed: next, alternative };
}
