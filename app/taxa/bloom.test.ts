import { describe, expect, it } from "vitest";
import { bloomMonths, bloomsInEarlySpring, describeBloom } from "./bloom";

describe("bloom months", () => {
  it("run from the first month to the last, both included", () => {
    expect([...bloomMonths(4, 6)]).toEqual([4, 5, 6]);
  });
  it("wrap past December for a winter bloomer", () => {
    expect([...bloomMonths(11, 2)].sort((a, b) => a - b)).toEqual([1, 2, 11, 12]);
  });
  it("are described in words for screen readers", () => {
    expect(describeBloom(4, 6)).toBe("Blooms April to June");
    expect(describeBloom(8, 8)).toBe("Blooms in August");
  });
  it("count as early spring when they touch April or May", () => {
    expect(bloomsInEarlySpring(3, 4)).toBe(true);
    expect(bloomsInEarlySpring(6, 9)).toBe(false);
  });
});
