import { describe, expect, it } from "vitest";
import { axisTicks, formatNumber, formatPercent, formatPercentInterval, formatPercentTick, niceAxisMax } from "./chart-scale";

describe("niceAxisMax", () => {
  it("rounds the largest value up to a 1-2-5 number", () => {
    // 1-2-5 axis steps (common practice, no source)
    expect(niceAxisMax([0.03, 0.17])).toBe(0.2);
    expect(niceAxisMax([0.21])).toBe(0.5);
    expect(niceAxisMax([0.5])).toBe(0.5);
    expect(niceAxisMax([0.051])).toBe(0.1);
    expect(niceAxisMax([0.6], { cap: 1 })).toBe(1);
    expect(niceAxisMax([3.2])).toBe(5);
  });

  it("gives a whole axis when there is nothing to show", () => {
    expect(niceAxisMax([])).toBe(1);
    expect(niceAxisMax([0, Number.NaN])).toBe(1);
  });
});

describe("axisTicks", () => {
  it("divides the axis into four or five even steps from zero", () => {
    expect(axisTicks(0.2)).toEqual([0, 0.05, 0.1, 0.15, 0.2]);
    expect(axisTicks(0.5)).toEqual([0, 0.1, 0.2, 0.3, 0.4, 0.5]);
    expect(axisTicks(0.1)).toEqual([0, 0.02, 0.04, 0.06, 0.08, 0.1]);
  });
});

describe("formats", () => {
  it("writes shares as percentages with a no-break space", () => {
    expect(formatPercent(0.1234)).toBe("12\u00a0%");
    expect(formatPercent(0.0456)).toBe("4.6\u00a0%");
    expect(formatPercent(0)).toBe("0\u00a0%");
    expect(formatPercentInterval(0.021, 0.087)).toBe("2.1–8.7\u00a0%");
    expect([0, 0.05, 0.15, 0.025, 0.002].map(formatPercentTick)).toEqual(["0\u00a0%", "5\u00a0%", "15\u00a0%", "2.5\u00a0%", "0.2\u00a0%"]);
  });

  it("writes Jacobs' D with its sign and a true minus", () => {
    // Jacobs 1974: D runs from −1 to +1; the sign carries the meaning
    expect(formatNumber(0.4, { signed: true })).toBe("+0.40");
    expect(formatNumber(-0.25, { signed: true })).toBe("\u22120.25");
    expect(formatNumber(0.001, { signed: true })).toBe("0.00");
    expect(formatNumber(1.5)).toBe("1.50");
    expect(formatNumber(null)).toBe("—");
  });
});
