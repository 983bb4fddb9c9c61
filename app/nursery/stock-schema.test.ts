import { parse } from "csv-parse/sync";
import { describe, expect, it } from "vitest";
import { STOCK_CSV_COLUMNS, stockCsvRow, stockEntryInput, stockFieldErrors, stockFormToInput, toStockCsv } from "./stock-schema";

const csvRow = (overrides: Record<string, string> = {}) => ({
  scientificName: "Zizia aurea",
  form: "plug",
  sourceRegion: "seed from our own hedgerows",
  availability: "now",
  availabilityNote: "",
  grownWithoutSystemicInsecticides: "yes",
  ...overrides,
});

describe("a stock entry from the page's form", () => {
  it("reads the form's strings, and a ticked checkbox as the declaration", () => {
    const form = new FormData();
    form.set("plantTaxonId", "42");
    form.set("form", "container");
    form.set("sourceRegion", "  cuttings from the nursery's stool beds ");
    form.set("availability", "season");
    form.set("availabilityNote", "from May");
    form.set("grownWithoutSystemicInsecticides", "on");
    expect(stockEntryInput.parse(stockFormToInput(form))).toEqual({
      plantTaxonId: 42,
      form: "container",
      sourceRegion: "cuttings from the nursery's stool beds",
      availability: "season",
      availabilityNote: "from May",
      grownWithoutSystemicInsecticides: true,
    });
  });

  it("reads a checkbox left unticked (absent from the post, HTML's rule for checkboxes) as no declaration", () => {
    const form = new FormData();
    form.set("plantTaxonId", "7");
    form.set("form", "seed");
    form.set("availability", "now");
    const parsed = stockEntryInput.parse(stockFormToInput(form));
    expect(parsed.grownWithoutSystemicInsecticides).toBe(false);
    expect(parsed.sourceRegion).toBe("");
  });

  it("names every field to fix when the form is sent empty (the route-access matrix's bare { intent: add })", () => {
    const result = stockEntryInput.safeParse(stockFormToInput(new FormData()));
    expect(result.success).toBe(false);
    expect(Object.keys(stockFieldErrors(result.error!)).sort()).toEqual(["availability", "form", "plantTaxonId"]);
    expect(stockFieldErrors(result.error!).plantTaxonId).toEqual(["Choose the plant from the checklist"]);
  });

  it("takes the JSON API's booleans and refuses anything else as the declaration", () => {
    const base = { plantTaxonId: 3, form: "plug", availability: "now" };
    expect(stockEntryInput.parse({ ...base, grownWithoutSystemicInsecticides: true }).grownWithoutSystemicInsecticides).toBe(true);
    expect(stockEntryInput.parse({ ...base, grownWithoutSystemicInsecticides: false }).grownWithoutSystemicInsecticides).toBe(false);
    expect(stockEntryInput.safeParse({ ...base, grownWithoutSystemicInsecticides: "maybe" }).success).toBe(false);
  });

  it("keeps to the table's widths: 200 characters for the source region and the note (stock_item's varchar(200))", () => {
    const base = { plantTaxonId: 3, form: "plug", availability: "now" };
    expect(stockEntryInput.safeParse({ ...base, sourceRegion: "x".repeat(200) }).success).toBe(true);
    const tooLong = stockEntryInput.safeParse({ ...base, sourceRegion: "x".repeat(201), availabilityNote: "y".repeat(201) });
    expect(stockFieldErrors(tooLong.error!)).toEqual({
      sourceRegion: ["Source region: use at most 200 characters"],
      availabilityNote: ["Availability note: use at most 200 characters"],
    });
  });
});

describe("a row of the stock CSV", () => {
  it("reads yes and no as the declaration, in any case, and a blank cell as no (a blank must never claim insecticide-free stock)", () => {
    expect(stockCsvRow.parse(csvRow()).grownWithoutSystemicInsecticides).toBe(true);
    expect(stockCsvRow.parse(csvRow({ grownWithoutSystemicInsecticides: "No" })).grownWithoutSystemicInsecticides).toBe(false);
    expect(stockCsvRow.parse(csvRow({ grownWithoutSystemicInsecticides: " YES " })).grownWithoutSystemicInsecticides).toBe(true);
    expect(stockCsvRow.parse(csvRow({ grownWithoutSystemicInsecticides: "" })).grownWithoutSystemicInsecticides).toBe(false);
    expect(stockCsvRow.safeParse(csvRow({ grownWithoutSystemicInsecticides: "neonic-free" })).success).toBe(false);
  });

  it("takes the words the page shows and plurals for form and availability, and nothing else", () => {
    expect(stockCsvRow.parse(csvRow({ form: "Plugs" })).form).toBe("plug");
    expect(stockCsvRow.parse(csvRow({ form: "Container plants" })).form).toBe("container");
    expect(stockCsvRow.parse(csvRow({ form: "SEED" })).form).toBe("seed");
    expect(stockCsvRow.parse(csvRow({ availability: "Later in the season" })).availability).toBe("season");
    const bareRoot = stockCsvRow.safeParse(csvRow({ form: "bare root" }));
    expect(stockFieldErrors(bareRoot.error!)).toEqual({ form: ["Choose how the plant is sold: plug, container, seed"] });
    expect(stockCsvRow.safeParse(csvRow({ availability: "soon" })).success).toBe(false);
  });

  it("needs a scientific name, and tidies its spacing", () => {
    expect(stockCsvRow.parse(csvRow({ scientificName: "  Zizia   aurea " })).scientificName).toBe("Zizia aurea");
    expect(stockFieldErrors(stockCsvRow.safeParse(csvRow({ scientificName: " " })).error!).scientificName).toEqual([
      "is empty: write the plant's scientific name, e.g. Zizia aurea",
    ]);
  });
});

describe("the stock CSV the export writes", () => {
  const records = [
    { scientificName: "Zizia aurea", form: "plug" as const, sourceRegion: 'ridge seed, "north" slope', availability: "now" as const, availabilityNote: "from May,\nwhile stocks last", grownWithoutSystemicInsecticides: true },
    { scientificName: "Geranium maculatum", form: "container" as const, sourceRegion: "", availability: "season" as const, availabilityNote: "", grownWithoutSystemicInsecticides: false },
  ];

  it("has the import's columns, quotes what RFC 4180 §2.6–2.7 says to quote, and ends every record in CRLF (§2.1)", () => {
    const csv = toStockCsv(records);
    expect(csv.split("\r\n")[0]).toBe(STOCK_CSV_COLUMNS.join(","));
    expect(csv.endsWith("\r\n")).toBe(true);
    expect(csv).toContain('"ridge seed, ""north"" slope"');
    expect(csv).toContain('"from May,\nwhile stocks last"');
    expect(csv).toContain("Geranium maculatum,container,,season,,no\r\n");
  });

  it("reads back through the import's row schema to the same entries (round trip; common practice, no source)", () => {
    const rows = parse(toStockCsv(records), { columns: true, bom: true }) as Record<string, string>[];
    expect(rows.map((row) => stockCsvRow.parse(row))).toEqual(records);
  });
});
