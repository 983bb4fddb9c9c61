import { describe, expect, it } from "vitest";
import {
  matrixApiSearch,
  matrixSearch,
  parseMatrixParams,
  parseMonths,
  parseRankingParams,
  parseSeasonParams,
  parseYear,
  rankingApiSearch,
  rankingSearch,
  seasonApiSearch,
  seasonSearch,
  withQuery,
  describeMatrixFilters,
  describeRankingFilters,
  describeSeasonFilters,
} from "./view-params";

// The parameter names and defaults are our API contract for /api/forage/* (DEVELOPERS.md,
// issue 6); the checks below hold the pages to it. No outside source.

describe("parseMonths", () => {
  it("reads a comma list into months 1–12 in calendar order, each once", () => {
    expect(parseMonths("5,4")).toEqual([4, 5]);
    expect(parseMonths("4, 5,5,12")).toEqual([4, 5, 12]);
  });

  it("drops what is not a month", () => {
    expect(parseMonths("0,13,x,4.5,-1,,7")).toEqual([7]);
    expect(parseMonths(undefined)).toEqual([]);
    expect(parseMonths("")).toEqual([]);
  });
});

describe("parseYear", () => {
  it("accepts four digits only", () => {
    expect(parseYear("2024")).toBe(2024);
    expect(parseYear("24")).toBeUndefined();
    expect(parseYear("2024a")).toBeUndefined();
    expect(parseYear(undefined)).toBeUndefined();
  });
});

describe("the matrix page's address", () => {
  it("has plain defaults: bees × plants, heat map, both bands, confirmed evidence", () => {
    const params = parseMatrixParams(new URLSearchParams(""));
    expect(params).toEqual({ view: "bee-plant", display: "heatmap", band: "all", determination: "confirmed", months: [], bee: undefined, caste: undefined, from: undefined, to: undefined });
    expect(matrixSearch(params).toString()).toBe("");
  });

  it("round-trips every filter, and accepts months as repeated parameters from a form", () => {
    const search = new URLSearchParams("view=plant-month&display=table&bee=Bombus+sp.&caste=queen&band=north&months=4&months=5&from=2023&to=2025&determination=any");
    const params = parseMatrixParams(search);
    expect(params).toMatchObject({ view: "plant-month", display: "table", bee: "Bombus sp.", caste: "queen", band: "north", months: [4, 5], from: 2023, to: 2025, determination: "any" });
    expect(parseMatrixParams(matrixSearch(params))).toEqual(params);
    expect(matrixSearch(params).get("months")).toBe("4,5");
  });

  it("falls back to defaults for values it does not know", () => {
    const params = parseMatrixParams(new URLSearchParams("view=pie&caste=drone&band=east&determination=maybe&from=soon"));
    expect(params).toMatchObject({ view: "bee-plant", caste: undefined, band: "all", determination: "confirmed", from: undefined });
  });

  it("sends the API the filters only, with band and evidence spelt out", () => {
    const params = parseMatrixParams(new URLSearchParams("view=plant-month&display=table&months=5,4"));
    expect(matrixApiSearch(params).toString()).toBe("band=all&determination=confirmed&months=4%2C5");
  });
});

describe("the ranking page's address", () => {
  it("defaults to queens in the north band's early spring, on confirmed evidence", () => {
    const params = parseRankingParams(new URLSearchParams(""));
    expect(params).toMatchObject({ caste: "queen", band: "north", window: "early-spring", determination: "confirmed", months: [] });
    expect(rankingSearch(params).toString()).toBe("");
    expect(rankingApiSearch(params).toString()).toBe("caste=queen&band=north&window=early-spring&determination=confirmed");
  });

  it("lets months replace the window, in the page's address and in the API's query", () => {
    const params = parseRankingParams(new URLSearchParams("window=second-wave&months=4,5&band=south"));
    expect(rankingSearch(params).toString()).toBe("band=south&months=4%2C5");
    expect(rankingApiSearch(params).get("window")).toBeNull();
    expect(rankingApiSearch(params).get("months")).toBe("4,5");
  });

  it("ranks one caste at a time: an unknown caste falls back to queens", () => {
    expect(parseRankingParams(new URLSearchParams("caste=all")).caste).toBe("queen");
    const params = parseRankingParams(new URLSearchParams("caste=worker&window=overwinter"));
    expect(rankingSearch(params).toString()).toBe("caste=worker&window=overwinter");
    expect(rankingApiSearch(params).get("caste")).toBe("worker");
  });
});

describe("the season page's address", () => {
  it("keeps years, evidence and the all-castes switch", () => {
    const params = parseSeasonParams(new URLSearchParams("from=2022&to=2025&determination=any&castes=all"));
    expect(params).toEqual({ from: 2022, to: 2025, determination: "any", allCastes: true });
    expect(seasonSearch(params).toString()).toBe("from=2022&to=2025&determination=any&castes=all");
    expect(seasonApiSearch(params).toString()).toBe("from=2022&to=2025&determination=any");
    expect(seasonSearch(parseSeasonParams(new URLSearchParams())).toString()).toBe("");
  });
});

describe("withQuery", () => {
  it("adds a query only when there is one", () => {
    expect(withQuery("/forage", new URLSearchParams())).toBe("/forage");
    expect(withQuery("/forage", new URLSearchParams("a=1"))).toBe("/forage?a=1");
  });
});

describe("the one-line summaries", () => {
  it("say in words what each page shows", () => {
    // Plain-language labels from DESIGN.md's glossary (caste, band, determination)
    expect(describeMatrixFilters(parseMatrixParams(new URLSearchParams("")))).toBe("all bumble bees · every caste · both bands · whole year · all years · confirmed determinations");
    expect(describeMatrixFilters(parseMatrixParams(new URLSearchParams("bee=Bombus+sp.&caste=male&band=south&months=8,9&from=2024&to=2024&determination=any")))).toBe(
      "Bombus sp. · males · south band · Aug, Sep · 2024 · all records",
    );
    expect(describeRankingFilters(parseRankingParams(new URLSearchParams("from=2023")), "early spring")).toBe("all bumble bees · queens · north band · early spring · 2023 onwards · confirmed determinations");
    expect(describeSeasonFilters(parseSeasonParams(new URLSearchParams("to=2025&determination=any")))).toBe("up to 2025 · all records");
  });
});
