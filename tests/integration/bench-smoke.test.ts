import { describe, expect, it } from "vitest";
import { reportPickerBench, runPickerBench } from "../../scripts/bench/picker.ts";
import { reportForageBench, runForageBench } from "../../scripts/bench-forage.ts";

// The benchmarks' small runs: they prove the bench code still runs and reports, not that
// anything is fast (the suite shares the machine with the database and the browser tests).
describe("benchmark smoke runs", () => {
  it("the taxon picker search reports latencies and hit rates", () => {
    const result = runPickerBench("smoke");
    expect(result.taxa).toBe(1_000);
    expect(result.queries).toBe(30);
    expect(result.misspellings).toBeGreaterThan(0);
    for (const figures of [result.ours, result.plainFuse]) {
      for (const value of [figures.p50, figures.p95, figures.max]) {
        expect(Number.isFinite(value)).toBe(true);
        expect(value).toBeGreaterThanOrEqual(0);
      }
      // Common practice, no source: a percentile never exceeds the maximum.
      expect(figures.p50).toBeLessThanOrEqual(figures.p95);
      expect(figures.p95).toBeLessThanOrEqual(figures.max);
      expect(figures.top3HitRate).toBeGreaterThanOrEqual(0);
      expect(figures.top3HitRate).toBeLessThanOrEqual(1);
    }
    expect(Number.isInteger(result.misspellingsLost)).toBe(true);
    expect(Number.isInteger(result.queriesDifferingFromWholeList)).toBe(true);
    expect(result.topThreesDifferingFromWholeList).toBeLessThanOrEqual(result.queriesDifferingFromWholeList);
    // The smoke size checks no budget: timings here say nothing about the machine's speed.
    const report = reportPickerBench(result, false);
    expect(report.failures).toEqual([]);
    expect(report.lines.join("\n")).toMatch(/p95/);
  });

  it("the forage endpoints and their naive queries report times on a small synthetic load", async () => {
    const result = await runForageBench("smoke", { migrate: false });
    expect(result.visits).toBe(20_000);
    expect(result.rollupRows).toBeGreaterThan(0);
    // Common practice, no source: a rollup never has more rows than the visits it counts.
    expect(result.rollupRows).toBeLessThanOrEqual(result.visits);
    expect(result.cases.map((c) => c.name)).toEqual(expect.arrayContaining([expect.stringMatching(/^ranking/), expect.stringMatching(/^matrix/)]));
    for (const c of result.cases) {
      expect(c.oursMs).toBeGreaterThan(0);
      expect(c.naiveMs).toBeGreaterThan(0);
      expect(c.ratio).toBeCloseTo(c.oursMs / c.naiveMs, 10);
    }
    const report = reportForageBench(result, false);
    expect(report.failures).toEqual([]);
    expect(report.lines.join("\n")).toMatch(/ratio/);
  }, 120_000);
});
