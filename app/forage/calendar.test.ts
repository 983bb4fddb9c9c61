import { describe, expect, it } from "vitest";
import { describeDateRange, describeMonths, formatMonthDay, windowSegments, yearPosition } from "./calendar";

describe("yearPosition", () => {
  it("puts a month's first day at its column's left edge and its last day at the right edge", () => {
    // Twelve equal month columns: our own drawing rule, checked by arithmetic
    expect(yearPosition("01-01", "start")).toBe(0);
    expect(yearPosition("12-31", "end")).toBe(1);
    expect(yearPosition("04-01", "start")).toBeCloseTo(3 / 12, 12);
    expect(yearPosition("05-31", "end")).toBeCloseTo(5 / 12, 12);
    expect(yearPosition("04-20", "start")).toBeCloseTo((3 + 19 / 30) / 12, 12);
  });

  it("refuses what is not a day of the year", () => {
    expect(() => yearPosition("13-01", "start")).toThrow(RangeError);
  });
});

describe("windowSegments", () => {
  it("draws a window inside the year as one segment", () => {
    expect(windowSegments("08-01", "09-30")).toEqual([{ from: 7 / 12, to: 9 / 12 }]);
  });

  it("splits a window over New Year into its end-of-year and start-of-year parts", () => {
    // Overwintering runs October to March (app/forage/seasons.ts defaults)
    const [late, early] = windowSegments("10-01", "03-31");
    expect(late!.from).toBeCloseTo(9 / 12, 12);
    expect(late!.to).toBe(1);
    expect(early!.from).toBe(0);
    expect(early!.to).toBeCloseTo(3 / 12, 12);
  });

  it("draws a window of one day as a sliver, not as the whole year", () => {
    const [one] = windowSegments("06-15", "06-15");
    expect(one!.to - one!.from).toBeCloseTo(1 / 30 / 12, 12);
  });
});

describe("words", () => {
  it("says dates and month lists in plain English", () => {
    expect(formatMonthDay("04-20")).toBe("20 April");
    expect(describeDateRange("10-01", "03-31")).toBe("1 October to 31 March");
    expect(describeMonths([4])).toBe("April");
    expect(describeMonths([4, 5])).toBe("April and May");
    expect(describeMonths([10, 11, 12])).toBe("October, November and December");
  });
});
