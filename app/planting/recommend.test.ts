import { describe, expect, it } from "vitest";
import { DEFAULT_CHECKLIST_FILES } from "~/db/seed.server";
import { rankForage } from "~/forage/ranking";
import { bloomMonths } from "~/taxa/bloom";
import { loadChecklists } from "~/taxa/checklist-import.server";
import { GROWTH_FORMS, type GrowthForm, type RegionalStatus } from "~/taxa/checklist-schema";
import {
  earlySpringMonthsOf,
  recommendPlanting,
  recommendationInput,
  type ForageEvidence,
  type PlantingCandidate,
  type PlantingRecommendation,
  type RecommendationRequest,
} from "./recommend";

// The seeded regional checklist, as the seeder reads it; ids stand in for database ids.
const checklist: PlantingCandidate[] = loadChecklists(DEFAULT_CHECKLIST_FILES).plants.map((row, i) => ({
  id: i + 1,
  scientificName: row.scientificName,
  family: row.family,
  growthForm: row.growthForm,
  regionalStatus: row.regionalStatus,
  bloomStart: row.bloomStart,
  bloomEnd: row.bloomEnd,
}));

/** mulberry32 (as scripts/demo/visits.ts seededRandom): the same seed gives the same cases. */
function mulberry32(seed: number) {
  let state = seed >>> 0;
  const next = () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const int = (min: number, max: number) => min + Math.floor(next() * (max - min + 1));
  const shuffle = <T>(items: readonly T[]): T[] => {
    const copy = [...items];
    for (let i = copy.length - 1; i > 0; i--) {
      const j = int(0, i);
      [copy[i], copy[j]] = [copy[j]!, copy[i]!];
    }
    return copy;
  };
  return { next, int, shuffle };
}

/** Evidence for a random share of the candidates, ranked as the forage page ranks it. */
function withSyntheticEvidence(candidates: readonly PlantingCandidate[], random: ReturnType<typeof mulberry32>, share: number) {
  const recorded = candidates.filter(() => random.next() < share);
  const ranked = rankForage(
    recorded.map((c) => ({ taxonId: c.id, scientificName: c.scientificName, visits: random.int(0, 60), sites: random.int(1, 6), years: 1, recorders: 1 })),
  );
  const byId = new Map<number | string, ForageEvidence>(
    ranked.map((r) => [r.taxonId, { rank: r.rank, visits: r.visits, wilsonLow: r.lower, wilsonHigh: r.upper, fewRecords: r.fewRecords }]),
  );
  return candidates.map((c) => ({ ...c, evidence: byId.get(c.id) ?? null }));
}

const parse = (request: RecommendationRequest) => recommendationInput.parse(request);
const range = (start: number, end: number) => Array.from({ length: end - start + 1 }, (_, i) => start + i);
const inBloom = (c: PlantingCandidate, m: number) => bloomMonths(c.bloomStart, c.bloomEnd).has(m);
const names = (result: PlantingRecommendation) => result.species.map((s) => s.taxon.scientificName);

/** A hand-made taxon for the small cases; family and form do not matter to the choice. */
function plant(
  id: number,
  scientificName: string,
  bloomStart: number,
  bloomEnd: number,
  extra: { wilsonLow?: number; regionalStatus?: RegionalStatus; growthForm?: GrowthForm } = {},
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
        : { rank: 1, visits: 20, wilsonLow: extra.wilsonLow, wilsonHigh: Math.min(1, extra.wilsonLow + 0.2), fewRecords: false },
  };
}

describe("recommendationInput", () => {
  it("fills the defaults: April–September, 3 per month, no size limit, every form, natives only", () => {
    // 3 per month: USDA NRCS CP42 job sheet (Indiana 2012), 3 species per bloom period, applied per month.
    // April–September: common practice, no source.
    expect(parse({ band: "north" })).toEqual({
      band: "north",
      months: { start: 4, end: 9 },
      minPerMonth: 3,
      size: undefined,
      forms: [...GROWTH_FORMS],
      nativeOnly: true,
    });
  });

  it("reads query-string values, empty ones as the default", () => {
    expect(
      parse({ band: "south", months: "5-7", minPerMonth: "2", size: "", forms: "vine, forb", nativeOnly: "false" }),
    ).toMatchObject({ band: "south", months: { start: 5, end: 7 }, minPerMonth: 2, size: undefined, forms: ["forb", "vine"], nativeOnly: false });
    expect(parse({ band: "north", months: "", size: "12", forms: ["shrub", "tree", "shrub"] })).toMatchObject({
      months: { start: 4, end: 9 },
      size: 12,
      forms: ["tree", "shrub"],
    });
    expect(parse({ band: "north", months: "6" }).months).toEqual({ start: 6, end: 6 });
  });

  it("refuses a season over New Year, months outside 1–12, and out-of-range numbers", () => {
    const refused = (request: Record<string, unknown>) => recommendationInput.safeParse(request).success;
    expect(refused({ band: "north", months: "11-2" })).toBe(false);
    expect(refused({ band: "north", months: "0-5" })).toBe(false);
    expect(refused({ band: "north", months: "4-13" })).toBe(false);
    expect(refused({ band: "north", months: "April" })).toBe(false);
    expect(refused({ band: "north", minPerMonth: "0" })).toBe(false);
    expect(refused({ band: "north", minPerMonth: "11" })).toBe(false);
    expect(refused({ band: "north", minPerMonth: "2.5" })).toBe(false);
    expect(refused({ band: "north", size: "61" })).toBe(false);
    expect(refused({ band: "north", size: "0" })).toBe(false);
    expect(refused({ band: "north", forms: "cactus" })).toBe(false);
    expect(refused({ band: "north", nativeOnly: "maybe" })).toBe(false);
    expect(refused({ band: "east" })).toBe(false);
    expect(refused({})).toBe(false);
    const season = recommendationInput.safeParse({ band: "north", months: "11-2" });
    expect(season.error?.issues[0]?.path).toEqual(["months"]);
    expect(season.error?.issues[0]?.message).toMatch(/first month cannot come after the last/);
  });
});

describe("earlySpringMonthsOf", () => {
  it("takes the band's early-spring window from the default season windows", () => {
    // app/forage/seasons.ts: south 04-01 to 05-31, north 04-20 to 05-31 (common practice, no source).
    expect(earlySpringMonthsOf("south")).toEqual([4, 5]);
    expect(earlySpringMonthsOf("north")).toEqual([4, 5]);
    expect(
      earlySpringMonthsOf("north", [{ band: "north", name: "early-spring", start: "03-15", end: "04-30" }]),
    ).toEqual([3, 4]);
  });
});

describe("recommendPlanting: hand-computed lists", () => {
  it("chooses early spring first, then evidence, then bloom length (worked by hand)", () => {
    // Season April–June, 2 per month, early spring April–May. Worked by hand from the rules in
    // the module header (no outside source). Standing: E (0.5), A (0.3), C (0.2), then without
    // evidence D (3 months) before B (2 months).
    // 1. E opens no early-spring place; A (April) does and stands next → A. April 1.
    // 2. C opens May → C. April 1, May 1, June 1.
    // 3. E still opens only June; D opens April and May → D. Every month has 2: done.
    // F (invasive, best evidence) and G (introduced) are never considered: natives only.
    const candidates = [
      plant(1, "Aquilegia canadensis", 4, 4, { wilsonLow: 0.3 }),
      plant(2, "Baptisia alba", 4, 5),
      plant(3, "Caltha palustris", 5, 6, { wilsonLow: 0.2 }),
      plant(4, "Dalea purpurea", 4, 6),
      plant(5, "Echinacea pallida", 6, 6, { wilsonLow: 0.5 }),
      plant(6, "Alliaria petiolata", 4, 6, { wilsonLow: 0.9, regionalStatus: "invasive" }),
      plant(7, "Taraxacum officinale", 4, 6, { wilsonLow: 0.8, regionalStatus: "introduced" }),
    ];
    const result = recommendPlanting(parse({ band: "south", months: "4-6", minPerMonth: 2 }), candidates);
    expect(names(result)).toEqual(["Aquilegia canadensis", "Caltha palustris", "Dalea purpurea"]);
    expect(result.species.map((s) => s.monthsCovered)).toEqual([[4], [5, 6], [4, 5, 6]]);
    expect(result.perMonth).toEqual([
      { month: 4, count: 2, met: true },
      { month: 5, count: 2, met: true },
      { month: 6, count: 2, met: true },
    ]);
    expect(result.unmet).toEqual([]);
    expect(result.earlySpringMonths).toEqual([4, 5]);
    expect(result.species[0]!.reason).toBe("Rank 1 in early-spring forage records (20 visits); blooms in April, when queens emerge");
    expect(result.species[2]!.reason).toBe("No early-spring forage records yet; blooms Apr–Jun, when queens emerge");
  });

  it("drops a species that later picks made unnecessary (worked by hand)", () => {
    // Season April–September, 1 per month, early spring April–May (no outside source):
    // 1. May–August fills 4 open places and flowers in May → chosen first.
    // 2. April is still open; April–June is the only plant for it → chosen.
    // 3. September is open; July–September → chosen.
    // Now May–August's months all have 2, so it is dropped: two species cover the season.
    const candidates = [plant(1, "Monarda fistulosa", 5, 8, { wilsonLow: 0.4 }), plant(2, "Zizia aurea", 4, 6), plant(3, "Solidago speciosa", 7, 9)];
    const result = recommendPlanting(parse({ band: "north", months: "4-9", minPerMonth: 1 }), candidates);
    expect(names(result)).toEqual(["Zizia aurea", "Solidago speciosa"]);
    expect(result.perMonth.every((m) => m.count === 1 && m.met)).toBe(true);
  });

  it("among equals, prefers the higher Wilson lower limit, then records over none, then the longer bloom", () => {
    // Project rules, no outside source: evidence by its Wilson lower limit (Wilson 1927, as the
    // forage ranking uses it), then bloom length counted over the whole year, not the season.
    const candidates = [
      plant(1, "Amelanchier laevis", 4, 4, { wilsonLow: 0.2 }),
      plant(2, "Baptisia alba", 4, 4, { wilsonLow: 0.5 }),
      plant(3, "Caltha palustris", 4, 4),
      plant(4, "Dirca palustris", 3, 5),
    ];
    const result = recommendPlanting(parse({ band: "south", months: "4-4", minPerMonth: 4 }), candidates);
    expect(names(result)).toEqual(["Baptisia alba", "Amelanchier laevis", "Dirca palustris", "Caltha palustris"]);
  });

  it("puts a plant that opens early spring before a longer, better-evidenced summer plant", () => {
    // Queens found colonies on spring flowers (Mola et al. 2021, BioScience 71:1234–1248, as
    // cited in REFERENCES.md; not read here); the priority itself is the project's rule.
    const candidates = [plant(1, "Monarda fistulosa", 6, 9, { wilsonLow: 0.9 }), plant(2, "Claytonia virginica", 4, 4)];
    const result = recommendPlanting(parse({ band: "south", months: "4-9", minPerMonth: 1 }), candidates);
    expect(names(result)).toEqual(["Claytonia virginica", "Monarda fistulosa"]);
  });
});

describe("recommendPlanting: the size limit", () => {
  it("fills the early-spring months first when the limit binds, and says which months it left short", () => {
    // Project rule (queen emergence first; no outside source for the ordering). Summer plants
    // here fill more places and have better evidence, yet the two places go to spring plants.
    const candidates = [
      plant(1, "Agastache foeniculum", 6, 9, { wilsonLow: 0.6 }),
      plant(2, "Monarda fistulosa", 6, 9, { wilsonLow: 0.5 }),
      plant(3, "Pycnanthemum virginianum", 6, 9, { wilsonLow: 0.4 }),
      plant(4, "Mertensia virginica", 4, 5),
      plant(5, "Geranium maculatum", 4, 5),
      plant(6, "Sanguinaria canadensis", 4, 4),
    ];
    const result = recommendPlanting(parse({ band: "south", months: "4-9", minPerMonth: 2, size: 2 }), candidates);
    expect(names(result)).toEqual(["Geranium maculatum", "Mertensia virginica"]);
    expect(result.perMonth.filter((m) => m.met).map((m) => m.month)).toEqual([4, 5]);
    expect(result.unmet.map((m) => m.month)).toEqual([6, 7, 8, 9]);
    expect(result.unmet[0]).toEqual({
      month: 6,
      count: 0,
      needed: 2,
      why: "The list size limit of 2 was reached before June had 2 species (it has 0)",
    });
  });

  it("never lists more species than the limit", () => {
    const result = recommendPlanting(parse({ band: "north", months: "4-9", size: 5 }), checklist);
    expect(result.species).toHaveLength(5);
    // 3 in April and 3 in September from 5 species needs one flowering April through September;
    // data/plants.csv has no such native species.
    expect(result.unmet.length).toBeGreaterThan(0);
    expect(result.unmet.every((m) => m.why.startsWith("The list size limit of 5 was reached before "))).toBe(true);
  });
});

describe("recommendPlanting: requests the checklist cannot meet", () => {
  it("names the months without enough vines, and why", () => {
    const result = recommendPlanting(parse({ band: "north", forms: ["vine"] }), checklist);
    const nativeVines = (m: number) => checklist.filter((c) => c.growthForm === "vine" && c.regionalStatus === "native" && inBloom(c, m)).length;
    const short = range(4, 9).filter((m) => nativeVines(m) < 3);
    // data/plants.csv: no native vine flowers in April, one in each of August and September.
    expect(short).toEqual([4, 8, 9]);
    expect(result.unmet.map((m) => [m.month, m.count])).toEqual(short.map((m) => [m, nativeVines(m)]));
    expect(result.unmet[0]!.why).toBe("No native vines bloom in April in the checklist; 3 needed");
    expect(result.unmet[1]!.why).toBe("Only 1 native vine blooms in August in the checklist; 3 needed");
    expect(result.species.every((s) => s.taxon.growthForm === "vine" && s.taxon.regionalStatus === "native")).toBe(true);
    // The months that can be met still are.
    expect(result.perMonth.filter((m) => m.met).map((m) => m.month)).toEqual([5, 6, 7]);
  });

  it("names March when 10 native trees are asked for and the checklist has fewer", () => {
    const result = recommendPlanting(parse({ band: "south", months: "3-5", minPerMonth: 10, forms: ["tree"] }), checklist);
    const trees = (m: number) => checklist.filter((c) => c.growthForm === "tree" && c.regionalStatus === "native" && inBloom(c, m)).length;
    const march = result.unmet.find((m) => m.month === 3);
    expect(march).toBeDefined();
    expect(march!.count).toBe(trees(3));
    expect(march!.why).toBe(`Only ${trees(3)} native trees bloom in March in the checklist; 10 needed`);
    // Every native tree in flower in March is on the list, since each one helps.
    expect(result.species.filter((s) => inBloom(s.taxon, 3))).toHaveLength(trees(3));
  });
});

describe("recommendPlanting: determinism", () => {
  it("gives the same list for the same request, whatever the order of the candidates", () => {
    const random = mulberry32(7);
    const candidates = withSyntheticEvidence(checklist, random, 0.3);
    for (const request of [
      { band: "north", minPerMonth: 3 },
      { band: "south", months: "3-10", minPerMonth: 5, size: 20, nativeOnly: false },
      { band: "north", months: "5-8", minPerMonth: 2, forms: ["shrub", "tree"] },
    ] as RecommendationRequest[]) {
      const first = recommendPlanting(parse(request), candidates);
      expect(recommendPlanting(parse(request), candidates)).toEqual(first);
      for (let i = 0; i < 5; i++) expect(recommendPlanting(parse(request), random.shuffle(candidates))).toEqual(first);
    }
  });

  it("breaks every tie by scientific name in code-unit order, then id", () => {
    // "Zizia" < "aster" by code units (capitals first); a locale comparison would reverse them.
    const candidates = [plant(2, "aster tie", 4, 4), plant(1, "Zizia tie", 4, 4), plant(3, "Zizia tie", 4, 4)];
    const result = recommendPlanting(parse({ band: "south", months: "4-4", minPerMonth: 3 }), candidates);
    expect(result.species.map((s) => s.taxon.id)).toEqual([1, 3, 2]);
  });

  it("refuses two candidates with one id", () => {
    expect(() => recommendPlanting(parse({ band: "north" }), [plant(1, "Zizia aurea", 4, 6), plant(1, "Zizia aptera", 5, 6)])).toThrow(RangeError);
  });
});

describe("recommendPlanting: 300 random requests over the seeded checklist", () => {
  it("meets every month or says why, and never lists what the request excludes", () => {
    const random = mulberry32(20260420);
    for (let run = 0; run < 300; run++) {
      // Most seasons fall in March–October, where the checklist has species, so that the size
      // limit binds often; the rest cover the whole year, empty winter months included.
      const wholeYear = random.next() < 0.25;
      const start = wholeYear ? random.int(1, 12) : random.int(3, 8);
      const end = wholeYear ? random.int(start, 12) : random.int(start, 10);
      const forms = random.next() < 0.4 ? GROWTH_FORMS.filter(() => random.next() < 0.5) : undefined;
      const request: RecommendationRequest = {
        band: random.next() < 0.5 ? "north" : "south",
        months: `${start}-${end}`,
        minPerMonth: random.int(1, 10),
        size: random.next() < 0.5 ? random.int(1, 60) : undefined,
        forms,
        nativeOnly: random.next() < 0.6,
      };
      const options = parse(request);
      const candidates = random.shuffle(withSyntheticEvidence(checklist, random, random.next()));
      const result = recommendPlanting(options, candidates);
      const label = `run ${run}: ${JSON.stringify(request)}`;
      const season = range(options.months.start, options.months.end);
      const early = season.filter((m) => options.earlySpringMonths?.includes(m) ?? earlySpringMonthsOf(options.band).includes(m));
      const allowed = candidates.filter(
        (c) => c.regionalStatus !== "invasive" && (!options.nativeOnly || c.regionalStatus === "native") && options.forms.includes(c.growthForm),
      );
      const available = (m: number) => allowed.filter((c) => inBloom(c, m)).length;
      const listed = result.species.map((s) => s.taxon);
      const countIn = (m: number) => listed.filter((c) => inBloom(c, m)).length;

      // Invasives never; introduced only when asked; only the chosen forms (project rules; the
      // native default is stricter than the CP42 job sheet's 7 of 9 natives).
      expect(listed.some((c) => c.regionalStatus === "invasive"), label).toBe(false);
      if (options.nativeOnly) expect(listed.every((c) => c.regionalStatus === "native"), label).toBe(true);
      expect(listed.every((c) => options.forms.includes(c.growthForm)), label).toBe(true);
      if (options.size !== undefined) expect(listed.length, label).toBeLessThanOrEqual(options.size);
      expect(new Set(listed.map((c) => c.id)).size, label).toBe(listed.length);

      // Every season month meets the minimum or is named in `unmet` (the tool's promise).
      expect(result.perMonth.map((m) => m.month), label).toEqual(season);
      for (const { month, count, met } of result.perMonth) {
        expect(count, `${label}, month ${month}`).toBe(countIn(month));
        expect(met, `${label}, month ${month}`).toBe(count >= options.minPerMonth);
        const named = result.unmet.find((u) => u.month === month);
        expect(met || named !== undefined, `${label}, month ${month}`).toBe(true);
        if (named) expect(named, `${label}, month ${month}`).toMatchObject({ count, needed: options.minPerMonth });
      }
      expect(result.unmet.map((u) => u.month), label).toEqual(result.perMonth.filter((m) => !m.met).map((m) => m.month));

      for (const { month, count, why } of result.unmet) {
        if (available(month) < options.minPerMonth) {
          expect(why, `${label}, month ${month}`).toMatch(/^(No|Only \d+) .* bloom/);
        } else {
          // Enough species exist, so only the size limit can have stopped the list.
          expect(options.size, `${label}, month ${month}`).toBeDefined();
          expect(listed.length, `${label}, month ${month}`).toBe(options.size);
          expect(why, `${label}, month ${month}`).toContain(`size limit of ${options.size}`);
        }
        // Without a limit, a short month gets every allowed species that flowers in it.
        if (options.size === undefined) expect(count, `${label}, month ${month}`).toBe(available(month));
      }

      // An early-spring month left short though species exist means the whole list went to
      // early spring (project rule: queens first).
      if (result.unmet.some((u) => early.includes(u.month) && available(u.month) >= options.minPerMonth)) {
        expect(listed.every((c) => early.some((m) => inBloom(c, m))), label).toBe(true);
      }

      // No more than needed: each listed species flowers in a season month that would fall
      // below the minimum without it.
      for (const species of result.species) {
        expect(species.monthsCovered, label).toEqual(season.filter((m) => inBloom(species.taxon, m)));
        expect(species.monthsCovered.some((m) => countIn(m) <= options.minPerMonth), `${label}, ${species.taxon.scientificName}`).toBe(true);
        expect(species.reason.length, label).toBeGreaterThan(0);
      }
    }
  });
});
