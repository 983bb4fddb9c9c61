import { describe, expect, it } from "vitest";
import { wilsonInterval } from "./wilson";

// Cases from Newcombe 1998, Table I; the limits are recomputed from Newcombe's method 3 and 4
// formulas with z = 1.95996 [C] and agree [M] with the printed table.
describe("wilsonInterval", () => {
  const rows: Array<[r: number, n: number, plain: [number, number], corrected?: [number, number]]> = [
    [81, 263, [0.2553, 0.3662], [0.2535, 0.3682]],
    [15, 148, [0.0624, 0.1605], [0.0598, 0.1644]],
    [0, 20, [0, 0.1611], [0, 0.2005]],
    [1, 29, [0.0061, 0.1718], [0.0018, 0.1963]],
    [29, 29, [0.883, 1]], // no continuity-corrected check value given
  ];

  for (const [r, n, plain, corrected] of rows) {
    it(`gives ${plain[0]}–${plain[1]} for ${r}/${n}`, () => {
      // Newcombe 1998, Table I — recomputed (method 3)
      const interval = wilsonInterval(r, n);
      expect(interval.lower).toBeCloseTo(plain[0], 4);
      expect(interval.upper).toBeCloseTo(plain[1], 4);
      expect(interval.proportion).toBe(r / n);
    });
    if (corrected) {
      it(`gives ${corrected[0]}–${corrected[1]} for ${r}/${n} with continuity correction`, () => {
        // Newcombe 1998, Table I — recomputed (method 4)
        const interval = wilsonInterval(r, n, { continuityCorrection: true });
        expect(interval.lower).toBeCloseTo(corrected[0], 4);
        expect(interval.upper).toBeCloseTo(corrected[1], 4);
      });
    }
  }

  it("is symmetric: lower(r, n) = 1 − upper(n − r, n), with and without correction", () => {
    for (const [r, n] of [[81, 263], [15, 148], [0, 20], [1, 29], [29, 29], [2, 3]] as const) {
      for (const continuityCorrection of [false, true]) {
        const a = wilsonInterval(r, n, { continuityCorrection });
        const b = wilsonInterval(n - r, n, { continuityCorrection });
        expect(a.lower).toBeCloseTo(1 - b.upper, 12);
        expect(a.upper).toBeCloseTo(1 - b.lower, 12);
      }
    }
  });

  it("stays inside [0, 1] and widens with z", () => {
    const narrow = wilsonInterval(1, 2, { z: 1 });
    const wide = wilsonInterval(1, 2, { z: 3 });
    expect(wide.lower).toBeLessThan(narrow.lower);
    expect(wide.upper).toBeGreaterThan(narrow.upper);
    expect(wide.lower).toBeGreaterThanOrEqual(0);
    expect(wide.upper).toBeLessThanOrEqual(1);
  });

  it("returns the whole unit interval and a NaN proportion for zero trials (our choice)", () => {
    const interval = wilsonInterval(0, 0);
    expect(interval).toEqual({ lower: 0, upper: 1, proportion: Number.NaN });
  });

  it("refuses negative or fractional counts, successes above trials, and a bad z", () => {
    expect(() => wilsonInterval(-1, 10)).toThrow(RangeError);
    expect(() => wilsonInterval(1.5, 10)).toThrow(RangeError);
    expect(() => wilsonInterval(1, 10.5)).toThrow(RangeError);
    expect(() => wilsonInterval(11, 10)).toThrow(RangeError);
    expect(() => wilsonInterval(1, 10, { z: 0 })).toThrow(RangeError);
    expect(() => wilsonInterval(1, 10, { z: Number.NaN })).toThrow(RangeError);
  });
});
