import { describe, expect, it } from "vitest";
import { DEFAULT_CHECKLIST_FILES } from "~/db/seed.server";
import { loadChecklists } from "~/taxa/checklist-import.server";
import { GROWTH_FORMS, type GrowthForm, type RegionalStatus } from "~/taxa/checklist-schema";
import { coverageOptionsOf, listCoverage, type CoverageOptions } from "./coverage";
import { recommendPlanting, recommendationInput, type PlantingCandidate } from "./recommend";
import { applySwap, compareStanding, SwapRefused, swapAlternatives } from "./swap";

/** A hand-made taxon; family does not matter to a swap. */
function plant(
  id: number,
  scientificName: string,
  bloomStart: number,
  bloomEnd: number,
  extra: { wilsonLow?: number; rank?: number; regionalStatus?: RegionalStatus; growthForm?: GrowthForm } = {},
): PlantingCandidate {
  return {
    id,
    scientificName,
    family: "Asteraceae",
    growthForm: extra.growthForm ?? "forb",
    regionalStatus: extra.regionalStatus ?? "native",
    bloomStart,
    bloomEnd,
    evidence:
      extra.wilsonLow === undefined
        ? null
        : { rank: extra.rank ?? 1, visits: 20, wilsonLow: extra.wilsonLow, wilsonHigh: Math.min(1, extra.wilsonLow + 0.2), fewRecords: false },
  };
}

/** April–June, 2 per month, early spring April–May, every form, natives only. */
const APRIL_TO_JUNE: CoverageOptions = { months: { start: 4, end: 6 }, minPerMonth: 2, forms: [...GROWTH_FORMS], nativeOnly: true, earlySpringMonths: [4, 5] };
const names = (items: readonly { taxon: PlantingCandidate }[]) => items.map((a) => a.taxon.scientificName);

describe("swapAlternatives: hand-worked cases", () => {
  // The list A (Apr–May), B (Apr–Jun), C (May–Jun), D (Jun): counts April 2, May 3, June 3.
  // Worked by hand from the rule after(m) ≥ min(before(m), 2) in swap.ts (no outside source).
  const listed = [plant(1, "Aquilegia canadensis", 4, 5), plant(2, "Baptisia alba", 4, 6), plant(3, "Caltha palustris", 5, 6), plant(4, "Dalea purpurea", 6, 6)];

  it("replacing A needs April; May may drop from 3 to 2", () => {
    // Without A: April 1, May 2, June 3. April must get back to 2, so only April bloomers qualify:
    // E (Apr) → 2,2,3 ✓; F (Apr–Jun) → 2,3,4 ✓; G (May–Jun) leaves April at 1 ✗; H (Jul) blooms
    // outside the season ✗; I (Apr) is invasive ✗; J (Apr) is introduced on a natives-only list ✗.
    const candidates = [
      ...listed,
      plant(5, "Erigeron pulchellus", 4, 4),
      plant(6, "Fragaria virginiana", 4, 6),
      plant(7, "Geranium maculatum", 5, 6, { wilsonLow: 0.9 }),
      plant(8, "Helenium autumnale", 7, 7),
      plant(9, "Alliaria petiolata", 4, 4, { wilsonLow: 0.9, regionalStatus: "invasive" }),
      plant(10, "Taraxacum officinale", 4, 4, { wilsonLow: 0.9, regionalStatus: "introduced" }),
    ];
    const alternatives = swapAlternatives(APRIL_TO_JUNE, listed, 1, candidates);
    // Both fill the open April place (preference 1); neither has evidence; F blooms longer (preference 3).
    expect(names(alternatives)).toEqual(["Fragaria virginiana", "Erigeron pulchellus"]);
    expect(alternatives[0]!.changes).toEqual([{ month: 6, before: 3, after: 4 }]);
    expect(alternatives[1]!.changes).toEqual([{ month: 5, before: 3, after: 2 }]);
    expect(alternatives[1]!.monthsCovered).toEqual([4]);
    expect(alternatives.every((a) => a.fillsEarlySpring)).toBe(true);
    expect(alternatives[1]!.reason).toBe("Swapped in for Aquilegia canadensis; no early-spring forage records yet; blooms in April, when queens emerge");
  });

  it("lets an introduced species in when the list is not natives only, never an invasive one", () => {
    const candidates = [...listed, plant(9, "Alliaria petiolata", 4, 4, { regionalStatus: "invasive" }), plant(10, "Taraxacum officinale", 4, 4, { regionalStatus: "introduced" })];
    const alternatives = swapAlternatives({ ...APRIL_TO_JUNE, nativeOnly: false }, listed, 1, candidates);
    expect(names(alternatives)).toEqual(["Taraxacum officinale"]);
    expect(alternatives[0]!.reason).toMatch(/introduced, not native$/);
  });

  it("keeps to the list's growth forms", () => {
    const candidates = [...listed, plant(5, "Erigeron pulchellus", 4, 4), plant(11, "Amelanchier laevis", 4, 5, { growthForm: "shrub" })];
    expect(names(swapAlternatives({ ...APRIL_TO_JUNE, forms: ["shrub"] }, listed, 1, candidates))).toEqual(["Amelanchier laevis"]);
  });

  it("orders by early-spring place first, then the Wilson lower limit, then rank, bloom length, name", () => {
    // Replacing D (June only): without D, April 2, May 3, June 2 — nothing is open, so any
    // season bloomer keeps coverage and no alternative fills an early-spring place. Order by
    // standing: K (0.40) before L (0.30 rank 2) before M (0.30 rank 5); then no evidence: N (3
    // months) before O and P (1 month each), O before P by name.
    const candidates = [
      ...listed,
      plant(21, "Penstemon digitalis", 6, 6),
      plant(22, "Oenothera biennis", 6, 6),
      plant(23, "Monarda fistulosa", 6, 6, { wilsonLow: 0.3, rank: 5 }),
      plant(24, "Lobelia siphilitica", 6, 6, { wilsonLow: 0.3, rank: 2 }),
      plant(25, "Krigia biflora", 5, 5, { wilsonLow: 0.4 }),
      plant(26, "Nuttallanthus canadensis", 4, 6),
    ];
    expect(names(swapAlternatives(APRIL_TO_JUNE, listed, 4, candidates))).toEqual([
      "Krigia biflora",
      "Lobelia siphilitica",
      "Monarda fistulosa",
      "Nuttallanthus canadensis",
      "Oenothera biennis",
      "Penstemon digitalis",
    ]);
  });

  it("puts a species that fills an open early-spring place before better evidence", () => {
    // 3 per month, replacing D (June): before April 2 (already short), May 3, June 3; without D
    // April 2, May 3, June 2. Every alternative must flower in June. Q (Apr–Jun, no evidence)
    // also fills an open April place; R (Jun, 0.9) does not, so Q comes first despite R's evidence.
    const candidates = [...listed, plant(31, "Quercus alba", 4, 6, { growthForm: "tree" }), plant(32, "Rudbeckia hirta", 6, 6, { wilsonLow: 0.9 }), plant(33, "Sanguinaria canadensis", 4, 4, { wilsonLow: 0.1 })];
    const alternatives = swapAlternatives({ ...APRIL_TO_JUNE, minPerMonth: 3 }, listed, 4, candidates);
    expect(names(alternatives)).toEqual(["Quercus alba", "Rudbeckia hirta"]);
    expect(alternatives.map((a) => a.fillsEarlySpring)).toEqual([true, false]);
  });

  it("lets a month already short get no shorter", () => {
    // 3 per month, replacing A (Apr–May): before April 2 (short), May 3, June 3; without A April
    // 1, May 2. April must get back to 2 and May to 3: T (Apr–May) does; U (Apr) leaves May at 2.
    const candidates = [...listed, plant(41, "Trillium grandiflorum", 4, 5), plant(42, "Uvularia grandiflora", 4, 4)];
    const alternatives = swapAlternatives({ ...APRIL_TO_JUNE, minPerMonth: 3 }, listed, 1, candidates);
    expect(names(alternatives)).toEqual(["Trillium grandiflorum"]);
    expect(alternatives[0]!.changes).toEqual([]);
  });

  it("is deterministic whatever order the candidates come in", () => {
    const candidates = [...listed, plant(5, "Erigeron pulchellus", 4, 4), plant(6, "Fragaria virginiana", 4, 6), plant(12, "Viola sororia", 4, 6), plant(13, "Anemone canadensis", 4, 6)];
    const once = names(swapAlternatives(APRIL_TO_JUNE, listed, 1, candidates));
    expect(names(swapAlternatives(APRIL_TO_JUNE, listed, 1, [...candidates].reverse()))).toEqual(once);
    expect(once).toEqual(["Anemone canadensis", "Fragaria virginiana", "Viola sororia", "Erigeron pulchellus"]);
  });

  it("throws a RangeError for a species not on the list", () => {
    expect(() => swapAlternatives(APRIL_TO_JUNE, listed, 99, listed)).toThrow(RangeError);
  });
});

describe("applySwap", () => {
  const listed = [plant(1, "Aquilegia canadensis", 4, 5), plant(2, "Baptisia alba", 4, 6), plant(3, "Caltha palustris", 5, 6), plant(4, "Dalea purpurea", 6, 6)];
  const candidates = [...listed, plant(5, "Erigeron pulchellus", 4, 4), plant(7, "Geranium maculatum", 5, 6), plant(9, "Alliaria petiolata", 4, 6, { regionalStatus: "invasive" })];

  it("puts the new species in the old one's place", () => {
    const { listed: next } = applySwap(APRIL_TO_JUNE, listed, 1, 5, candidates);
    expect(next.map((t) => t.id)).toEqual([5, 2, 3, 4]);
    expect(listed.map((t) => t.id)).toEqual([1, 2, 3, 4]);
  });

  it("refuses, with a reason, a swap that costs coverage, an invasive species, a listed one, or an unknown one", () => {
    const refusal = (replace: number, by: number) => {
      try {
        applySwap(APRIL_TO_JUNE, listed, replace, by, candidates);
        return "accepted";
      } catch (error) {
        expect(error).toBeInstanceOf(SwapRefused);
        return (error as Error).message;
      }
    };
    expect(refusal(1, 7)).toMatch(/some month would fall below 2/);
    expect(refusal(1, 9)).toMatch(/invasive/);
    expect(refusal(1, 2)).toMatch(/already on the list/);
    expect(refusal(1, 404)).toMatch(/No plant on the checklist/);
    expect(refusal(404, 5)).toMatch(/not on the list/);
  });
});

describe("listCoverage", () => {
  it("counts each season month and says why a month is short", () => {
    // Worked by hand (no outside source): the list has A (Apr–May) and D (Jun); 2 per month.
    // April 1: the checklist has only E and A in April, natives → 2 available, so the list could
    // do better. May 1: only A blooms in May → the checklist is short. June 1 with D, F, G available.
    const listed = [plant(1, "Aquilegia canadensis", 4, 5), plant(4, "Dalea purpurea", 6, 6)];
    const candidates = [...listed, plant(5, "Erigeron pulchellus", 4, 4), plant(6, "Fragaria virginiana", 6, 6), plant(8, "Alliaria petiolata", 5, 5, { regionalStatus: "invasive" })];
    const { perMonth, unmet } = listCoverage(APRIL_TO_JUNE, listed, candidates);
    expect(perMonth).toEqual([
      { month: 4, count: 1, met: false },
      { month: 5, count: 1, met: false },
      { month: 6, count: 1, met: false },
    ]);
    expect(unmet.map((u) => u.why)).toEqual([
      "1 of the list's species flower in April; 2 needed, though the checklist has 2 native species in flower then",
      "The checklist has only 1 native species in flower in May; 2 needed",
      "1 of the list's species flower in June; 2 needed, though the checklist has 2 native species in flower then",
    ]);
    expect(listCoverage({ ...APRIL_TO_JUNE, size: 2 }, listed, candidates).unmet[0]!.why).toMatch(/size limit of 2/);
  });
});

describe("swaps on the seeded checklist", () => {
  // The seeded regional checklist, as the seeder reads it; ids stand in for database ids.
  const checklist: PlantingCandidate[] = loadChecklists(DEFAULT_CHECKLIST_FILES).plants.map((row, i) => ({
    id: i + 1,
    scientificName: row.scientificName,
    family: row.family,
    growthForm: row.growthForm,
    regionalStatus: row.regionalStatus,
    bloomStart: row.bloomStart,
    bloomEnd: row.bloomEnd,
    evidence: null,
  }));
  const options = recommendationInput.parse({ band: "north" });
  const result = recommendPlanting(options, checklist);
  const coverage = coverageOptionsOf(options, result.earlySpringMonths);
  const listed = result.species.map((s) => s.taxon);

  it("offers, for every listed species, only alternatives that leave every month met", () => {
    // The invariant of the header rule, checked by applying each swap (common practice, no source).
    expect(result.unmet).toEqual([]);
    for (const taxon of listed) {
      const alternatives = swapAlternatives(coverage, listed, taxon.id, checklist);
      expect(alternatives.length).toBeGreaterThan(0);
      for (const alternative of alternatives) {
        const { listed: swapped } = applySwap(coverage, listed, taxon.id, alternative.taxon.id, checklist);
        expect(listCoverage(coverage, swapped, checklist).unmet).toEqual([]);
        expect(alternative.taxon.regionalStatus).toBe("native");
      }
    }
  });

  it("orders alternatives as the recommendation orders its pool", () => {
    // swap.ts restates recommend.ts's private comparison. A one-month, size-1 recommendation
    // takes the best of its pool by that comparison; taking it out and asking again gives the
    // recommendation's whole order, which must be compareStanding's. Evidence is made up on a
    // fixed pattern, with ties in the Wilson lower limit so rank and bloom length decide too.
    const pool = checklist
      .filter((t) => t.regionalStatus === "native" && t.bloomStart <= 7 && t.bloomEnd >= 7)
      .map((t, i) => ({ ...t, evidence: i % 3 === 0 ? { rank: 40 - i, visits: 5, wilsonLow: (i % 4) / 10, wilsonHigh: 0.5, fewRecords: false } : null }));
    const sorted = [...pool].sort(compareStanding).map((t) => t.id);
    const byRecommendation: (number | string)[] = [];
    let remaining = pool;
    while (remaining.length > 0 && byRecommendation.length < 25) {
      const picked = recommendPlanting(recommendationInput.parse({ band: "north", months: "7", minPerMonth: 1, size: 1 }), remaining).species[0]!.taxon.id;
      byRecommendation.push(picked);
      remaining = remaining.filter((t) => t.id !== picked);
    }
    expect(byRecommendation).toEqual(sorted.slice(0, byRecommendation.length));
  });
});
