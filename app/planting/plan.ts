// The shape every planting page shows — an unsaved recommendation (after any swaps), a saved
// list, its print view and its shared copy — built from the same parts, so the pages cannot
// disagree about coverage or alternatives. Pure module: the server gathers the taxa and the
// nursery offers, this puts them together.

import type { Band } from "~/forage/seasons";
import { GROWTH_FORMS, type GrowthForm, type RegionalStatus } from "~/taxa/checklist-schema";
import { isAllowed, listCoverage, monthsInSeason, type CoverageOptions } from "./coverage";
import type { ForageEvidence, MonthCoverage, PlantingCandidate, UnmetMonth } from "./recommend";
import { swapAlternatives, type MonthChange } from "./swap";
import type { StockAvailability, StockForm } from "./vocabulary";

/** A checklist taxon as the planting pages need it. */
export interface PlanTaxon extends PlantingCandidate {
  id: number;
  vernacularName: string | null;
  evidence: ForageEvidence | null;
}

/** What a nursery offers of a taxon, as the planner sees it (the nursery's own declaration). */
export interface PlanStockOffer {
  nurseryId: number;
  nurseryName: string;
  form: StockForm;
  availability: StockAvailability;
  availabilityNote: string;
  sourceRegion: string;
  grownWithoutSystemicInsecticides: boolean;
}

export interface PlanAlternative {
  id: number;
  scientificName: string;
  vernacularName: string | null;
  growthForm: GrowthForm;
  bloomStart: number;
  bloomEnd: number;
  evidence: ForageEvidence | null;
  changes: MonthChange[];
  fillsEarlySpring: boolean;
}

export interface PlanSpecies {
  id: number;
  scientificName: string;
  vernacularName: string | null;
  family: string;
  growthForm: GrowthForm;
  regionalStatus: RegionalStatus;
  bloomStart: number;
  bloomEnd: number;
  reason: string;
  monthsCovered: number[];
  evidence: ForageEvidence | null;
  offers: PlanStockOffer[];
  /**
   * Whether the list's settings still allow it: a saved list keeps a species the checklist has
   * since marked invasive (or introduced, on a native-only list) until someone swaps it out.
   */
  allowed: boolean;
  /** The best few species that could take its place and keep coverage; empty on read-only views. */
  alternatives: PlanAlternative[];
  /** How many more keep coverage beyond those shown. */
  moreAlternatives: number;
}

export interface PlanSettings {
  band: Band;
  months: { start: number; end: number };
  minPerMonth: number;
  size: number | null;
  forms: GrowthForm[];
  nativeOnly: boolean;
}

export interface PlanView {
  settings: PlanSettings;
  earlySpringMonths: number[];
  species: PlanSpecies[];
  perMonth: MonthCoverage[];
  unmet: UnmetMonth[];
}

/** Enough to choose from on a phone; the rest are counted, not listed. */
export const ALTERNATIVES_SHOWN = 5;

export function describePlan(
  settings: PlanSettings,
  earlySpringMonths: readonly number[],
  listed: readonly { taxon: PlanTaxon; reason: string }[],
  candidates: readonly PlanTaxon[],
  offers: ReadonlyMap<number, readonly PlanStockOffer[]>,
  { alternatives = true }: { alternatives?: boolean } = {},
): PlanView {
  const options: CoverageOptions = {
    months: settings.months,
    minPerMonth: settings.minPerMonth,
    forms: settings.forms,
    nativeOnly: settings.nativeOnly,
    earlySpringMonths,
    size: settings.size ?? undefined,
  };
  const taxa = listed.map((entry) => entry.taxon);
  const { perMonth, unmet } = listCoverage(options, taxa, candidates);
  const species = listed.map(({ taxon, reason }): PlanSpecies => {
    const all = alternatives ? swapAlternatives(options, taxa, taxon.id, candidates) : [];
    return {
      id: taxon.id,
      scientificName: taxon.scientificName,
      vernacularName: taxon.vernacularName,
      family: taxon.family,
      growthForm: taxon.growthForm,
      regionalStatus: taxon.regionalStatus,
      bloomStart: taxon.bloomStart,
      bloomEnd: taxon.bloomEnd,
      reason,
      monthsCovered: monthsInSeason(taxon, settings.months),
      evidence: taxon.evidence,
      offers: [...(offers.get(taxon.id) ?? [])],
      allowed: isAllowed(taxon, options),
      alternatives: all.slice(0, ALTERNATIVES_SHOWN).map((a) => ({
        id: a.taxon.id,
        scientificName: a.taxon.scientificName,
        vernacularName: a.taxon.vernacularName,
        growthForm: a.taxon.growthForm,
        bloomStart: a.taxon.bloomStart,
        bloomEnd: a.taxon.bloomEnd,
        evidence: a.taxon.evidence,
        changes: a.changes,
        fillsEarlySpring: a.fillsEarlySpring,
      })),
      moreAlternatives: Math.max(0, all.length - ALTERNATIVES_SHOWN),
    };
  });
  return { settings, earlySpringMonths: [...earlySpringMonths], species, perMonth, unmet };
}

/** The query string of the planting form for these settings (and swaps), as the page links it. */
export function planSearch(settings: PlanSettings, swaps: readonly { from: number; to: number }[] = []): string {
  const params = new URLSearchParams();
  params.set("band", settings.band);
  params.set("months", settings.months.start === settings.months.end ? String(settings.months.start) : `${settings.months.start}-${settings.months.end}`);
  params.set("minPerMonth", String(settings.minPerMonth));
  if (settings.size !== null) params.set("size", String(settings.size));
  // Every form is the default; leaving them out keeps the address short.
  if (!GROWTH_FORMS.every((form) => settings.forms.includes(form))) for (const form of settings.forms) params.append("forms", form);
  params.set("nativeOnly", String(settings.nativeOnly));
  for (const swap of swaps) params.append("swap", `${swap.from}-${swap.to}`);
  return params.toString();
}

/** "12-34" → a swap of taxon 12 for taxon 34; anything else is dropped. */
export function parseSwaps(values: readonly string[]): { from: number; to: number }[] {
  const swaps: { from: number; to: number }[] = [];
  for (const value of values) {
    const match = /^(\d{1,9})-(\d{1,9})$/.exec(value.trim());
    if (match) swaps.push({ from: Number(match[1]), to: Number(match[2]) });
  }
  // A list shows at most 60 species; more swaps than a few hundred is not a planner at work.
  return swaps.slice(0, 200);
}

/**
 * The planting form's fields as the recommendation schema reads them, from the address (GET)
 * or a posted form: absent fields stay absent so the schema's defaults apply.
 */
export function planningValues(source: URLSearchParams | FormData): Record<string, unknown> {
  const text = (name: string) => {
    const value = source.get(name);
    return typeof value === "string" ? value : undefined;
  };
  return {
    band: text("band"),
    months: text("months"),
    minPerMonth: text("minPerMonth"),
    size: text("size"),
    forms: source.getAll("forms").filter((v): v is string => typeof v === "string"),
    nativeOnly: text("nativeOnly"),
  };
}
