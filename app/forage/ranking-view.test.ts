import { describe, expect, it } from "vitest";
import type { RankingItem } from "./forage-api";
import { hasSelection, rankingCsv, shareAxisMax } from "./ranking-view";

const item = (overrides: Partial<RankingItem>): RankingItem => ({
  rank: 1,
  plant: { id: 7, scientificName: "Salix discolor", family: "Salicaceae" },
  visits: 12,
  share: 0.3,
  wilsonLow: 0.181,
  wilsonHigh: 0.4523456,
  sites: 4,
  years: 3,
  recorders: 2,
  fewRecords: false,
  selectionRatio: null,
  selectionLow: null,
  selectionHigh: null,
  jacobsD: null,
  ...overrides,
});

describe("the ranking's derived figures", () => {
  it("shows selection columns only when some plant has flower counts", () => {
    // The API contract: selection figures are null where no flowers were counted
    expect(hasSelection([item({})])).toBe(false);
    expect(hasSelection([item({}), item({ selectionRatio: 1.4, selectionLow: 0.9, selectionHigh: 2.1, jacobsD: 0.3 })])).toBe(true);
  });

  it("puts every interval on one axis ending on a round share", () => {
    // 1-2-5 axis ends (common practice, no source)
    expect(shareAxisMax([item({}), item({ wilsonHigh: 0.12 })])).toBe(0.5);
    expect(shareAxisMax([item({ wilsonHigh: 0.97 })])).toBe(1);
    expect(shareAxisMax([])).toBe(1);
  });

  it("writes a CSV with one row per plant and empty fields for missing ratios", () => {
    // RFC 4180 (header line, CRLF, quoting) via ./csv
    const lines = rankingCsv([item({}), item({ rank: 2, plant: { id: 9, scientificName: "Rosa blanda", family: "Rosaceae, s.l." }, fewRecords: true, selectionRatio: 1.25, selectionLow: 0.5, selectionHigh: 2, jacobsD: -0.1 })]).split("\r\n");
    expect(lines[0]).toBe("rank,scientificName,family,visits,share,shareLower95,shareUpper95,sites,years,recorders,fewRecords,selectionRatio,selectionLower,selectionUpper,jacobsD");
    expect(lines[1]).toBe("1,Salix discolor,Salicaceae,12,0.3,0.181,0.4523,4,3,2,no,,,,");
    expect(lines[2]).toBe('2,Rosa blanda,"Rosaceae, s.l.",12,0.3,0.181,0.4523,4,3,2,yes,1.25,0.5,2,-0.1');
    expect(lines[3]).toBe("");
  });
});
