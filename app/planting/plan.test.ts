import { describe, expect, it } from "vitest";
import { GROWTH_FORMS } from "~/taxa/checklist-schema";
import { ALTERNATIVES_SHOWN, describePlan, parseSwaps, planningValues, planSearch, type PlanSettings, type PlanTaxon } from "./plan";
import { describeChanges, describeSettings } from "./plan-words";
import { recommendationInput } from "./recommend";

const taxon = (id: number, scientificName: string, bloomStart: number, bloomEnd: number): PlanTaxon => ({
  id,
  scientificName,
  vernacularName: null,
  family: "Asteraceae",
  growthForm: "forb",
  regionalStatus: "native",
  bloomStart,
  bloomEnd,
  evidence: null,
});

const SETTINGS: PlanSettings = { band: "north", months: { start: 4, end: 6 }, minPerMonth: 1, size: null, forms: [...GROWTH_FORMS], nativeOnly: true };

describe("the planting page's address", () => {
  it("round-trips settings and swaps through the query string and the recommendation schema", () => {
    // Common practice, no source: what the page links must read back as the same settings.
    const settings: PlanSettings = { band: "south", months: { start: 5, end: 8 }, minPerMonth: 2, size: 12, forms: ["shrub", "vine"], nativeOnly: false };
    const search = new URLSearchParams(planSearch(settings, [{ from: 3, to: 17 }]));
    expect(search.getAll("swap")).toEqual(["3-17"]);
    expect(recommendationInput.parse(planningValues(search))).toEqual({ band: "south", months: { start: 5, end: 8 }, minPerMonth: 2, size: 12, forms: ["shrub", "vine"], nativeOnly: false });
    // Every form is the default, so none is written.
    expect(new URLSearchParams(planSearch(SETTINGS)).has("forms")).toBe(false);
    expect(planSearch({ ...SETTINGS, months: { start: 6, end: 6 } })).toContain("months=6&");
  });

  it("reads swaps as from-to pairs of ids and drops anything else", () => {
    expect(parseSwaps(["12-34", " 5-6 ", "x-1", "1-", "-1-2", "1-2-3", "1234567890-1"])).toEqual([
      { from: 12, to: 34 },
      { from: 5, to: 6 },
    ]);
    expect(parseSwaps(Array.from({ length: 300 }, () => "1-2"))).toHaveLength(200);
  });
});

describe("describePlan", () => {
  it("shows the first few alternatives and counts the rest; none on read-only views", () => {
    // One species per month needed; A covers April–June alone, so anything covering April–June replaces it.
    const listed = [taxon(1, "Aster A", 4, 6)];
    const candidates = [...listed, ...Array.from({ length: ALTERNATIVES_SHOWN + 3 }, (_, i) => taxon(10 + i, `Zizia ${String.fromCharCode(97 + i)}`, 4, 6))];
    const plan = describePlan(SETTINGS, [4, 5], listed.map((t) => ({ taxon: t, reason: "chosen" })), candidates, new Map());
    expect(plan.species[0]!.alternatives).toHaveLength(ALTERNATIVES_SHOWN);
    expect(plan.species[0]!.moreAlternatives).toBe(3);
    expect(plan.species[0]!.monthsCovered).toEqual([4, 5, 6]);
    expect(plan.perMonth.map((m) => m.count)).toEqual([1, 1, 1]);
    const readOnly = describePlan(SETTINGS, [4, 5], listed.map((t) => ({ taxon: t, reason: "" })), candidates, new Map(), { alternatives: false });
    expect(readOnly.species[0]!.alternatives).toEqual([]);
    expect(readOnly.species[0]!.moreAlternatives).toBe(0);
  });

  it("flags a listed species the settings no longer allow, such as one since marked invasive", () => {
    // Invasive taxa are never to be planted (app/planting/recommend.ts header); a saved list can predate the marking.
    const listed = [taxon(1, "Aster A", 4, 6), { ...taxon(2, "Alliaria petiolata", 4, 6), regionalStatus: "invasive" as const }];
    const plan = describePlan(SETTINGS, [4, 5], listed.map((t) => ({ taxon: t, reason: "" })), listed, new Map());
    expect(plan.species.map((s) => s.allowed)).toEqual([true, false]);
  });
});

describe("plan words", () => {
  it("says the settings and a swap's changes plainly", () => {
    expect(describeSettings(SETTINGS)).toBe("North band · April to June · at least 1 in flower each month · every growth form · native species only · no size limit");
    expect(describeChanges([{ month: 6, before: 3, after: 4 }, { month: 5, before: 4, after: 3 }])).toBe("Jun 3 → 4; May 4 → 3");
    expect(describeChanges([])).toBe("no month’s count changes");
  });
});
