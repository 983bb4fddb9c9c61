import { describe, expect, it } from "vitest";
import { ivlevE, jacobsD, manlySelectionRatios } from "./selection";

describe("electivity indices", () => {
  it("reproduce the worked row r = 0.738, p = 0.464: E = 0.228, D = 0.530", () => {
    // Lechowicz 1982, Table 3 (read, and recomputed from the formulas)
    expect(ivlevE(0.738, 0.464)).toBeCloseTo(0.228, 3);
    expect(jacobsD(0.738, 0.464)).toBeCloseTo(0.53, 3);
  });

  it("give D = 0 and E = 0 when use equals availability", () => {
    // Lechowicz 1982: r = p → D = 0
    expect(jacobsD(0.3, 0.3)).toBe(0);
    expect(ivlevE(0.3, 0.3)).toBe(0);
    // 0/0 at r = p = 0 and at r = p = 1: 0 by our choice
    expect(jacobsD(0, 0)).toBe(0);
    expect(jacobsD(1, 1)).toBe(0);
    expect(ivlevE(0, 0)).toBe(0);
  });

  it("give D = −1 for an available resource never used", () => {
    // Lechowicz 1982: r = 0 → D = −1
    expect(jacobsD(0, 0.2)).toBe(-1);
    expect(ivlevE(0, 0.2)).toBe(-1);
  });

  it("approach D = +1 as availability goes to 0 with use, and return exactly 1 at p = 0", () => {
    // Lechowicz 1982: p → 0 with r > 0 → D → +1; at p = 0 the formula itself gives r/r = 1
    expect(jacobsD(0.2, 1e-9)).toBeCloseTo(1, 6);
    expect(jacobsD(0.2, 0)).toBe(1);
    expect(ivlevE(0.2, 0)).toBe(1);
  });

  it("refuse shares outside [0, 1]", () => {
    expect(() => jacobsD(1.2, 0.5)).toThrow(RangeError);
    expect(() => ivlevE(0.5, -0.1)).toThrow(RangeError);
  });
});

describe("manlySelectionRatios (design I)", () => {
  // Manly et al. 2002, p. 52 (data of Neu et al. 1974): moose use of four burn classes.
  // Inputs read in the source; every expected value is computed from Manly's formulas [C].
  const moose = manlySelectionRatios({
    used: [25, 22, 30, 40],
    available: [0.34, 0.101, 0.104, 0.455],
  });
  const round = (x: number, digits: number) => Number(x.toFixed(digits));

  it("gives the selection ratios w = 0.628, 1.862, 2.465, 0.751", () => {
    // Manly et al. 2002, p. 52 — computed
    expect(moose.resources.map((r) => round(r.w, 3))).toEqual([0.628, 1.862, 2.465, 0.751]);
    expect(moose.resources.map((r) => round(r.o, 4))).toEqual([
      round(25 / 117, 4), round(22 / 117, 4), round(30 / 117, 4), round(40 / 117, 4),
    ]);
  });

  it("gives the standardised ratios B = 0.110, 0.326, 0.432, 0.132, summing to 1", () => {
    // Manly et al. 2002, p. 52 — computed
    expect(moose.resources.map((r) => round(r.standardised, 3))).toEqual([0.11, 0.326, 0.432, 0.132]);
    expect(moose.resources.reduce((s, r) => s + r.standardised, 0)).toBeCloseTo(1, 12);
  });

  it("uses the Bonferroni z = 2.4977 for α = 0.05 and I = 4", () => {
    // Manly et al. 2002, p. 52 — computed, z_{0.05/8}
    expect(moose.z).toBeCloseTo(2.4977, 4);
  });

  it("gives the intervals 0.350–0.907, 0.968–2.755, 1.496–3.435, 0.511–0.992", () => {
    // Manly et al. 2002, p. 52 — computed
    expect(moose.resources.map((r) => [round(r.lower, 3), round(r.upper, 3)])).toEqual([
      [0.35, 0.907],
      [0.968, 2.755],
      [1.496, 3.435],
      [0.511, 0.992],
    ]);
  });

  it("gives X²_L = 35.40 and Pearson X² = 43.69 on 3 degrees of freedom", () => {
    // Manly et al. 2002, p. 52 — computed. The p-value is not cross-checked: no statistics
    // library is installed and this module computes no p-value.
    expect(moose.chiSquareLogLikelihood).toBeCloseTo(35.4, 2);
    expect(moose.chiSquarePearson).toBeCloseTo(43.69, 2);
    expect(moose.degreesOfFreedom).toBe(3);
  });

  it("treats an unused resource as contributing 0 to X²_L and floors a negative lower limit at 0", () => {
    const result = manlySelectionRatios({ used: [0, 10, 1], available: [0.2, 0.3, 0.5] });
    const expected = 2 * (10 * Math.log(10 / 3.3) + 1 * Math.log(1 / 5.5));
    expect(result.chiSquareLogLikelihood).toBeCloseTo(expected, 10);
    expect(result.resources[0]).toMatchObject({ o: 0, w: 0, se: 0, lower: 0, upper: 0 });
    expect(result.resources[2]!.lower).toBe(0);
  });

  it("refuses inputs the formulas cannot take", () => {
    const ok = { used: [1, 2], available: [0.5, 0.5] };
    expect(() => manlySelectionRatios({ ...ok, used: [1], available: [1] })).toThrow(RangeError);
    expect(() => manlySelectionRatios({ ...ok, available: [0.5, 0.5, 0] })).toThrow(RangeError);
    expect(() => manlySelectionRatios({ ...ok, available: [0.6, 0.5] })).toThrow(RangeError);
    expect(() => manlySelectionRatios({ ...ok, available: [1, 0] })).toThrow(RangeError);
    expect(() => manlySelectionRatios({ ...ok, used: [-1, 2] })).toThrow(RangeError);
    expect(() => manlySelectionRatios({ ...ok, used: [1.5, 2] })).toThrow(RangeError);
    expect(() => manlySelectionRatios({ ...ok, used: [0, 0] })).toThrow(RangeError);
    expect(() => manlySelectionRatios({ ...ok, alpha: 0 })).toThrow(RangeError);
  });
});
