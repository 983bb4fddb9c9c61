import { describe, expect, it } from "vitest";
import { rankForage, type ForageRow } from "./ranking";
import { wilsonInterval } from "./wilson";

const row = (taxonId: number, scientificName: string, visits: number, sites = 3): ForageRow => ({
  taxonId,
  scientificName,
  visits,
  sites,
  years: 1,
  recorders: 1,
});

describe("rankForage", () => {
  it("prefers a well-supported share to a higher share from few records", () => {
    // Wilson 1927 via Newcombe 1998, method 3 — computed with wilsonInterval:
    // 30/100: share 0.300, 95 % interval 0.2189–0.3958
    // 2/3:    share 0.667, 95 % interval 0.2077–0.9385
    const many = wilsonInterval(30, 100);
    const few = wilsonInterval(2, 3);
    expect(many.proportion).toBeLessThan(few.proportion);
    expect(many.lower).toBeCloseTo(0.2189, 4);
    expect(few.lower).toBeCloseTo(0.2077, 4);
    expect(many.lower).toBeGreaterThan(few.lower);
  });

  it("orders rows by the Wilson lower limit of their share of all visits, ranks 1..n", () => {
    // Within one ranking all rows share N, so the lower limit rises with visits.
    const ranked = rankForage([row(1, "Zizia aurea", 2), row(2, "Monarda fistulosa", 30), row(3, "Salix discolor", 8)]);
    expect(ranked.map((r) => [r.rank, r.scientificName])).toEqual([
      [1, "Monarda fistulosa"],
      [2, "Salix discolor"],
      [3, "Zizia aurea"],
    ]);
    const monarda = ranked[0]!;
    const expected = wilsonInterval(30, 40); // N = 2 + 30 + 8
    expect(monarda.share).toBe(0.75);
    expect(monarda.lower).toBe(expected.lower);
    expect(monarda.upper).toBe(expected.upper);
    expect(ranked.map((r) => r.lower)).toEqual([...ranked.map((r) => r.lower)].sort((a, b) => b - a));
  });

  it("breaks ties of lower limit and visits by scientific name, then keeps extra fields", () => {
    const ranked = rankForage([
      { ...row(1, "Solidago speciosa", 4), note: "b" },
      { ...row(2, "Agastache foeniculum", 4), note: "a" },
      { ...row(3, "Lupinus perennis", 9), note: "c" },
    ]);
    expect(ranked.map((r) => r.scientificName)).toEqual([
      "Lupinus perennis",
      "Agastache foeniculum",
      "Solidago speciosa",
    ]);
    expect(ranked[1]!.lower).toBe(ranked[2]!.lower);
    expect(ranked.map((r) => r.note)).toEqual(["c", "a", "b"]);
  });

  it("flags fewer than 5 visits or fewer than 2 sites (common practice, no source)", () => {
    const ranked = rankForage([
      row(1, "Zizia aurea", 4, 3),
      row(2, "Monarda fistulosa", 5, 1),
      row(3, "Salix discolor", 5, 2),
    ]);
    const flag = Object.fromEntries(ranked.map((r) => [r.scientificName, r.fewRecords]));
    expect(flag).toEqual({ "Zizia aurea": true, "Monarda fistulosa": true, "Salix discolor": false });
    const relaxed = rankForage([row(1, "Zizia aurea", 4, 1)], { fewVisits: 4, fewSites: 1 });
    expect(relaxed[0]!.fewRecords).toBe(false);
  });

  it("returns [] for no rows, and share 0 with the whole [0, 1] when no visits at all", () => {
    expect(rankForage([])).toEqual([]);
    const [only] = rankForage([row(1, "Zizia aurea", 0)]);
    expect(only).toMatchObject({ rank: 1, share: 0, lower: 0, upper: 1, fewRecords: true });
  });
});
