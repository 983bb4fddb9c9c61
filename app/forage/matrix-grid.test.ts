import { describe, expect, it } from "vitest";
import { buildGrid, gridCsv, type MatrixResponse } from "./matrix-grid";

// Sums checked by hand from the cells below (no outside source: this is our own layout).
const response: MatrixResponse = {
  months: [4, 5, 6],
  bees: ["Bombus bimaculatus", "Bombus impatiens", "Bombus vagans"],
  plants: ["Salix discolor", "Monarda fistulosa", "Zizia aurea"],
  cells: [
    { bee: "Bombus impatiens", plant: "Salix discolor", month: 4, visits: 5 },
    { bee: "Bombus impatiens", plant: "Salix discolor", month: 5, visits: 2 },
    { bee: "Bombus bimaculatus", plant: "Salix discolor", month: 4, visits: 1 },
    { bee: "Bombus bimaculatus", plant: "Monarda fistulosa", month: 6, visits: 4 },
    { bee: "Bombus impatiens", plant: "Zizia aurea", month: 5, visits: 4 },
  ],
};

describe("buildGrid", () => {
  it("bees × plants: sums the months, most visited bee and plant first, bees without visits left out", () => {
    const grid = buildGrid(response, "bee-plant");
    expect(grid.columns.map((c) => c.key)).toEqual(["Bombus impatiens", "Bombus bimaculatus"]);
    expect(grid.rows).toEqual([
      { plant: "Salix discolor", values: [7, 1], total: 8 },
      // Equal totals: alphabetical.
      { plant: "Monarda fistulosa", values: [0, 4], total: 4 },
      { plant: "Zizia aurea", values: [4, 0], total: 4 },
    ]);
    expect(grid.columnTotals).toEqual([11, 5]);
    expect(grid.total).toBe(16);
    expect(grid.max).toBe(7);
  });

  it("plants × months: sums the bees, keeps every month in scope in calendar order, empty ones too", () => {
    const grid = buildGrid({ ...response, months: [6, 4, 5, 7] }, "plant-month");
    expect(grid.columns.map((c) => c.label)).toEqual(["April", "May", "June", "July"]);
    expect(grid.columns.map((c) => c.shortLabel)).toEqual(["Apr", "May", "Jun", "Jul"]);
    expect(grid.rows[0]).toEqual({ plant: "Salix discolor", values: [6, 2, 0, 0], total: 8 });
    expect(grid.columnTotals).toEqual([6, 6, 4, 0]);
  });

  it("plants × months: shows only the months asked for, even when the response spans the year", () => {
    const grid = buildGrid({ ...response, months: [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12] }, "plant-month", { months: [5, 4] });
    expect(grid.columns.map((c) => c.key)).toEqual(["4", "5"]);
    expect(grid.rows.map((r) => [r.plant, r.total])).toEqual([["Salix discolor", 8], ["Zizia aurea", 4]]);
  });

  it("gives an empty grid for no cells", () => {
    const grid = buildGrid({ months: [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12], bees: [], plants: [], cells: [] }, "bee-plant");
    expect(grid).toMatchObject({ columns: [], rows: [], total: 0, max: 0 });
  });
});

describe("gridCsv", () => {
  it("writes the grid with a header row and row totals", () => {
    // RFC 4180 layout (header line, CRLF) as in ./csv
    const csv = gridCsv(buildGrid(response, "bee-plant"));
    expect(csv.split("\r\n")).toEqual([
      "plant,Bombus impatiens,Bombus bimaculatus,total visits",
      "Salix discolor,7,1,8",
      "Monarda fistulosa,0,4,4",
      "Zizia aurea,4,0,4",
      "",
    ]);
  });
});
