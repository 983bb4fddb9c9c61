import { describe, expect, it } from "vitest";
import { normalQuantile } from "./normal";

// Reference quantiles below were computed (not read in a table) with an independent
// implementation of Wichura's AS241 (Applied Statistics 37:477–484, 1988), accurate to ~1e-16,
// and agree [M] with the usual printed normal tables. Acklam's approximation is good to ~1e-9,
// so six decimals are asked for.
describe("normalQuantile (Acklam's rational approximation)", () => {
  it("gives z = 1.959964 for 0.975, the two-sided 95 % value", () => {
    // AS241, computed: 1.9599639845
    expect(normalQuantile(0.975)).toBeCloseTo(1.959964, 6);
  });
  it("gives 2.497705 for 1 − 0.05/8, the Bonferroni z of four intervals at α = 0.05", () => {
    // AS241, computed: 2.4977054744 (Manly et al. 2002, p. 52 uses 2.4977)
    expect(normalQuantile(1 - 0.05 / 8)).toBeCloseTo(2.497705, 6);
  });
  it("gives 0 at the median and −2.326348 at 0.01 (tail branch)", () => {
    expect(normalQuantile(0.5)).toBe(0);
    // AS241, computed: −2.3263478740
    expect(normalQuantile(0.01)).toBeCloseTo(-2.326348, 6);
  });
  it("gives −0.524401 at 0.3 (central branch)", () => {
    // AS241, computed: −0.5244005127
    expect(normalQuantile(0.3)).toBeCloseTo(-0.524401, 6);
  });
  it("is antisymmetric about one half", () => {
    for (const p of [0.001, 0.02, 0.2, 0.4]) {
      expect(normalQuantile(1 - p)).toBeCloseTo(-normalQuantile(p), 9);
    }
  });
  it("goes to ±Infinity at 0 and 1 and refuses what is not a probability", () => {
    expect(normalQuantile(0)).toBe(-Infinity);
    expect(normalQuantile(1)).toBe(Infinity);
    expect(() => normalQuantile(-0.1)).toThrow(RangeError);
    expect(() => normalQuantile(1.1)).toThrow(RangeError);
    expect(() => normalQuantile(Number.NaN)).toThrow(RangeError);
  });
});
