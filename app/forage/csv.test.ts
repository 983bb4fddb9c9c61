import { describe, expect, it } from "vitest";
import { csvField, csvFileName, toCsv } from "./csv";

describe("csvField", () => {
  it("leaves plain text and numbers alone", () => {
    // RFC 4180 §2.5: fields may or may not be enclosed in double quotes
    expect(csvField("Salix discolor")).toBe("Salix discolor");
    expect(csvField(12)).toBe("12");
    expect(csvField(0.125)).toBe("0.125");
  });

  it("quotes fields holding a comma, a line break or a double quote, and doubles the quote", () => {
    // RFC 4180 §2.6 (CRLF, double quote, comma need quoting) and §2.7 (quote escaped by a preceding quote)
    expect(csvField("Asteraceae, tribe Astereae")).toBe('"Asteraceae, tribe Astereae"');
    expect(csvField('the "willow" group')).toBe('"the ""willow"" group"');
    expect(csvField("two\r\nlines")).toBe('"two\r\nlines"');
    expect(csvField("line\nfeed")).toBe('"line\nfeed"');
    expect(csvField('"')).toBe('""""');
  });

  it("writes nothing for missing values and for non-finite numbers", () => {
    // An empty field for a missing value (common practice, no source)
    expect(csvField(null)).toBe("");
    expect(csvField(undefined)).toBe("");
    expect(csvField(Number.NaN)).toBe("");
    expect(csvField(Number.POSITIVE_INFINITY)).toBe("");
  });
});

describe("toCsv", () => {
  it("puts a header row first and ends every record with CRLF", () => {
    // RFC 4180 §2.1 (CRLF line breaks) and §2.3 (optional header line in the same format)
    const text = toCsv(["plant", "Bombus impatiens", "total"], [["Monarda fistulosa", 3, 3], ["Rosa, wild", 0, 0]]);
    expect(text).toBe('plant,Bombus impatiens,total\r\nMonarda fistulosa,3,3\r\n"Rosa, wild",0,0\r\n');
  });

  it("keeps the same number of fields on every line", () => {
    // RFC 4180 §2.4: each line should contain the same number of fields
    const text = toCsv(["a", "b"], [["x", null], [1, "y,z"]]);
    expect(text.split("\r\n").filter(Boolean).map((line) => line.replace(/"[^"]*"/g, "q").split(",").length)).toEqual([2, 2, 2]);
  });
});

describe("csvFileName", () => {
  it("builds a safe file name from the view's words", () => {
    // Portable file names: letters, digits, hyphen (common practice, no source)
    expect(csvFileName("forage", "bee-plant", "Bombus sp.", 2024, undefined, "")).toBe("forage-bee-plant-bombus-sp-2024.csv");
    expect(csvFileName()).toBe("data.csv");
  });
});
