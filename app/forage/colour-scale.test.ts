import { describe, expect, it } from "vitest";
import { classOf, contrastRatio, countClasses, EMPTY_CELL_COLOUR, rampColour, readableOn, relativeLuminance } from "./colour-scale";

describe("relativeLuminance", () => {
  it("gives 0 for black and 1 for white, and the WCAG example ratio 21:1 between them", () => {
    // WCAG 2.1, definition of relative luminance and contrast ratio (black/white = 21:1)
    expect(relativeLuminance("#000000")).toBe(0);
    expect(relativeLuminance("#ffffff")).toBeCloseTo(1, 12);
    expect(contrastRatio("#000000", "#ffffff")).toBeCloseTo(21, 10);
  });

  it("weights green most and blue least", () => {
    // WCAG 2.1 relative luminance: 0.2126 R + 0.7152 G + 0.0722 B for pure primaries
    expect(relativeLuminance("#ff0000")).toBeCloseTo(0.2126, 4);
    expect(relativeLuminance("#00ff00")).toBeCloseTo(0.7152, 4);
    expect(relativeLuminance("#0000ff")).toBeCloseTo(0.0722, 4);
  });

  it("gives 4.5:1 or more for mid-grey #767676 on white", () => {
    // #767676 on white is the lightest grey meeting WCAG 2.1 SC 1.4.3 (4.54:1) — common practice, no source
    expect(contrastRatio("#767676", "#ffffff")).toBeGreaterThanOrEqual(4.5);
    expect(contrastRatio("#777777", "#ffffff")).toBeLessThan(4.5);
  });
});

describe("rampColour", () => {
  it("gets strictly darker as the count rises, so the map reads in greyscale", () => {
    // WCAG 2.1 relative luminance, sampled at 51 points along the ramp (finer steps can round to the same 8-bit colour)
    const luminances = Array.from({ length: 51 }, (_, i) => relativeLuminance(rampColour(i / 50)));
    for (let i = 1; i < luminances.length; i++) expect(luminances[i]!).toBeLessThan(luminances[i - 1]!);
  });

  it("keeps one hue: green stays the largest channel from end to end", () => {
    // A single-hue sequential scale (common practice, no source): every step is a green, none drifts to another hue
    for (let i = 0; i <= 20; i++) {
      const hex = rampColour(i / 20);
      const [r, g, b] = [1, 3, 5].map((at) => parseInt(hex.slice(at, at + 2), 16));
      expect(g).toBeGreaterThan(r!);
      expect(g).toBeGreaterThan(b!);
    }
  });

  it("spans light to dark: the darkest step contrasts at least 3:1 with the lightest", () => {
    // WCAG 2.1 SC 1.4.11 non-text contrast 3:1 as a floor for telling the ends apart
    expect(contrastRatio(rampColour(0), rampColour(1))).toBeGreaterThanOrEqual(3);
  });
});

describe("countClasses", () => {
  it("gives every count its own class when there are few", () => {
    const classes = countClasses(4);
    expect(classes.map((c) => c.label)).toEqual(["1", "2", "3", "4"]);
  });

  it("keeps small maps finely graded: whole-number bounds below ten", () => {
    // Geometric classes, bounds below ten rounded to whole numbers (common practice, no source)
    expect(countClasses(11).map((c) => c.label)).toEqual(["1", "2", "3–4", "5–6", "7–11"]);
    expect(countClasses(7).map((c) => c.label)).toEqual(["1", "2", "3", "4", "5–7"]);
  });

  it("groups a long tail into at most six classes with 1-2-5 bounds, covering 1..max without gaps", () => {
    // Geometric classes for skewed counts, rounded to 1-2-5 numbers (common practice, no source)
    const classes = countClasses(112);
    expect(classes.length).toBeLessThanOrEqual(6);
    expect(classes.map((c) => c.label)).toEqual(["1", "2–4", "5–9", "10–19", "20–49", "50–112"]);
    for (let i = 1; i < classes.length; i++) expect(classes[i]!.min).toBe(classes[i - 1]!.max + 1);
    for (let count = 1; count <= 112; count++) expect(classOf(classes, count)).not.toBeNull();
  });

  it("draws each class darker than the one below, and lighter than nothing only for zero", () => {
    // WCAG 2.1 relative luminance, strictly falling from class to class
    for (const max of [1, 3, 6, 7, 40, 112, 5000]) {
      const classes = countClasses(max);
      for (let i = 1; i < classes.length; i++) {
        expect(relativeLuminance(classes[i]!.colour)).toBeLessThan(relativeLuminance(classes[i - 1]!.colour));
      }
      expect(relativeLuminance(classes[0]!.colour)).toBeLessThan(relativeLuminance(EMPTY_CELL_COLOUR));
    }
    expect(classOf(countClasses(10), 0)).toBeNull();
    expect(countClasses(0)).toEqual([]);
  });

  it("writes numbers on cells in a colour with at least 4.5:1 contrast", () => {
    // WCAG 2.1 SC 1.4.3 contrast (minimum) for text
    for (const c of countClasses(200, 6)) expect(contrastRatio(c.colour, c.textColour)).toBeGreaterThanOrEqual(4.5);
    expect(readableOn("#ffffff")).toBe("#24231f");
    expect(readableOn("#000000")).toBe("#ffffff");
  });
});
