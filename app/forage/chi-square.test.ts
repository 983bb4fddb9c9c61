import { describe, expect, it } from "vitest";
import jStat from "jstat";
import { chiSquareUpperTail, logGamma } from "./chi-square";
import { manlySelectionRatios } from "./selection";

describe("chi-square upper tail", () => {
  it("gives 5 % at the tabled critical values", () => {
    // Upper 5 % points of the chi-square distribution, as printed in standard tables
    // (e.g. NIST/SEMATECH e-Handbook of Statistical Methods, §1.3.6.7.4; values from memory).
    expect(chiSquareUpperTail(3.841, 1)).toBeCloseTo(0.05, 4);
    expect(chiSquareUpperTail(5.991, 2)).toBeCloseTo(0.05, 4);
    expect(chiSquareUpperTail(18.307, 10)).toBeCloseTo(0.05, 4);
    // Upper 1 % point for 4 degrees of freedom (same tables).
    expect(chiSquareUpperTail(13.277, 4)).toBeCloseTo(0.01, 4);
  });

  it("agrees with jstat's chi-square distribution across statistics and degrees of freedom", () => {
    // jstat (npm "jstat"), a general-purpose statistics library: 1 − cdf is the upper tail.
    for (const df of [1, 2, 3, 5, 9, 20, 60]) {
      for (const x of [0.01, 0.5, 1, 2.5, 4, 7.9, 15, 33.3, 80]) {
        expect(chiSquareUpperTail(x, df)).toBeCloseTo(1 - jStat.chisquare.cdf(x, df), 10);
      }
    }
  });

  it("is 1 at zero and for any non-positive statistic, and refuses nonsense", () => {
    expect(chiSquareUpperTail(0, 3)).toBe(1);
    expect(() => chiSquareUpperTail(1, 0)).toThrow(RangeError);
    expect(() => chiSquareUpperTail(Number.NaN, 2)).toThrow(RangeError);
  });

  it("rests on a log-gamma that matches known values", () => {
    // Γ(1) = Γ(2) = 1, Γ(5) = 24, Γ(1/2) = √π (mathematical identities).
    expect(logGamma(1)).toBeCloseTo(0, 12);
    expect(logGamma(2)).toBeCloseTo(0, 12);
    expect(logGamma(5)).toBeCloseTo(Math.log(24), 12);
    expect(logGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 12);
  });
});

describe("the test of no selection: visits against flowers on offer", () => {
  it("gives the same p-value as jstat for the Pearson statistic of a hand-computed survey", () => {
    // Hand computation: 60 visits to three plants offered in proportions 0.5, 0.3, 0.2; observed
    // 20, 25, 15; expected 30, 18, 12. X² = 100/30 + 49/18 + 9/12 = 3.3333 + 2.7222 + 0.75 = 6.8056.
    const result = manlySelectionRatios({ used: [20, 25, 15], available: [0.5, 0.3, 0.2] });
    expect(result.chiSquarePearson).toBeCloseTo(6.8056, 4);
    expect(result.degreesOfFreedom).toBe(2);
    const p = chiSquareUpperTail(result.chiSquarePearson, result.degreesOfFreedom);
    // jStat.chisquare.cdf is the reference; with 2 df the tail is also exp(−x/2) exactly.
    expect(p).toBeCloseTo(1 - jStat.chisquare.cdf(result.chiSquarePearson, 2), 12);
    expect(p).toBeCloseTo(Math.exp(-result.chiSquarePearson / 2), 12);
    expect(p).toBeLessThan(0.05);
    expect(chiSquareUpperTail(result.chiSquareLogLikelihood, 2)).toBeCloseTo(1 - jStat.chisquare.cdf(result.chiSquareLogLikelihood, 2), 12);
  });
});
