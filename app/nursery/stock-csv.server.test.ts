import { describe, expect, it } from "vitest";
import { MAX_IMPORT_ROWS, readStockCsv } from "./stock-csv.server";

const HEADER = "scientificName,form,sourceRegion,availability,availabilityNote,grownWithoutSystemicInsecticides";

describe("reading a stock CSV", () => {
  it("reads each row with its line, whatever the column order, with CRLF or LF line ends and a byte-order mark", async () => {
    const text = "\uFEFFform,scientificName,availability,grownWithoutSystemicInsecticides,sourceRegion,availabilityNote\r\nplug,Zizia aurea,now,yes,,\nseed,Geranium maculatum,season,no,hill prairie seed,\"from June, by the gram\"\r\n";
    const read = await readStockCsv(text);
    expect(read.problems).toEqual([]);
    expect(read.rows).toEqual([
      { line: 2, row: { scientificName: "Zizia aurea", form: "plug", sourceRegion: "", availability: "now", availabilityNote: "", grownWithoutSystemicInsecticides: true } },
      { line: 3, row: { scientificName: "Geranium maculatum", form: "seed", sourceRegion: "hill prairie seed", availability: "season", availabilityNote: "from June, by the gram", grownWithoutSystemicInsecticides: false } },
    ]);
  });

  it("reads a file that arrives in pieces, a quoted cell split between them (a streamed upload; common practice, no source)", async () => {
    async function* pieces() {
      yield `${HEADER}\nZizia aurea,plug,"ridge `;
      yield new TextEncoder().encode(`seed",now,,yes\n`);
    }
    const read = await readStockCsv(pieces());
    expect(read.rows.map((r) => r.row.sourceRegion)).toEqual(["ridge seed"]);
  });

  it("collects every bad row's problem with its line and column, and shows the value found for a fixed list", async () => {
    const text = [HEADER, "Zizia aurea,bare root,,now,,yes", "Geranium maculatum,plug,,soon,,perhaps", ",plug,,now,,no", "Zizia aurea,plug,,now,,yes"].join("\n");
    const read = await readStockCsv(text);
    expect(read.problems).toEqual([
      { line: 2, column: "form", reason: "form: Choose how the plant is sold: plug, container, seed (the file says “bare root”)" },
      { line: 3, column: "availability", reason: "availability: Choose when it can be had: now, or season (later in the season) (the file says “soon”)" },
      { line: 3, column: "grownWithoutSystemicInsecticides", reason: "grownWithoutSystemicInsecticides: Write yes or no (the file says “perhaps”)" },
      { line: 4, column: "scientificName", reason: "scientificName: is empty: write the plant's scientific name, e.g. Zizia aurea" },
    ]);
    expect(read.rows.map((r) => r.line)).toEqual([5]);
  });

  it("blames a row with a cell too many on that row alone", async () => {
    const read = await readStockCsv([HEADER, "Zizia aurea, golden alexanders,plug,,now,,yes", "Geranium maculatum,plug,,now,,no"].join("\n"));
    expect(read.problems).toEqual([{ line: 2, reason: expect.stringContaining("This row has 7 cells where the header names 6") }]);
    expect(read.rows).toHaveLength(1);
  });

  it("skips rows of empty cells that spreadsheets leave below the data", async () => {
    const read = await readStockCsv([HEADER, "Zizia aurea,plug,,now,,yes", ",,,,,", ""].join("\r\n"));
    expect(read.problems).toEqual([]);
    expect(read.rows).toHaveLength(1);
  });

  it("refuses a header that lacks columns or names unknown ones, before reading any row (the route-access matrix's file)", async () => {
    expect((await readStockCsv("scientificName\n")).problems).toEqual([
      { line: 1, reason: "Missing columns: form, sourceRegion, availability, availabilityNote, grownWithoutSystemicInsecticides" },
    ]);
    const misspelt = await readStockCsv(HEADER.replace("availabilityNote", "note") + "\nZizia aurea,plug,,now,,yes\n");
    expect(misspelt.problems.map((p) => p.reason)).toEqual([
      "Missing column: availabilityNote",
      expect.stringMatching(/^Unknown column: “note”\. The columns are scientificName, form/),
    ]);
    expect(misspelt.rows).toEqual([]);
  });

  it("says an empty file is empty, and where a quote was never closed", async () => {
    expect((await readStockCsv("")).problems).toEqual([{ line: 0, reason: expect.stringContaining("The file is empty") }]);
    const unclosed = await readStockCsv(`${HEADER}\nZizia aurea,plug,"ridge seed,now,,yes\n`);
    expect(unclosed.problems).toEqual([{ line: expect.any(Number), reason: expect.stringContaining("could not be read as CSV") }]);
  });

  it(`stops at ${MAX_IMPORT_ROWS} rows and says to split the file`, async () => {
    const rows = Array.from({ length: MAX_IMPORT_ROWS + 1 }, () => "Zizia aurea,plug,,now,,yes");
    const read = await readStockCsv([HEADER, ...rows].join("\n"));
    expect(read.rows).toHaveLength(MAX_IMPORT_ROWS);
    expect(read.problems).toEqual([{ line: MAX_IMPORT_ROWS + 2, reason: expect.stringContaining("Split it") }]);
  });
});
