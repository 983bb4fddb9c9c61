// The forage matrix as a grid of plants (rows) by bees or months (columns), built from the
// API's list of non-zero cells; the heat map, the table and the CSV all draw from one grid so
// they always show the same numbers. Pure module.

import { toCsv } from "./csv";
import type { MatrixView } from "./view-params";
import { MONTH_NAMES } from "~/taxa/bloom";

/** GET /api/forage/matrix */
export interface MatrixResponse {
  months: number[];
  bees: string[];
  plants: string[];
  cells: { bee: string; plant: string; month: number; visits: number }[];
}

export interface GridColumn {
  key: string;
  /** What a header shows: a bee's scientific name or a month's name. */
  label: string;
  /** A short label for tight axes ("Apr"); the same as label for bees. */
  shortLabel: string;
  /** Scientific names are set in italics. */
  scientificName: boolean;
}

export interface GridRow {
  plant: string;
  /** One count per column, in column order. */
  values: number[];
  total: number;
}

export interface MatrixGrid {
  view: MatrixView;
  columns: GridColumn[];
  rows: GridRow[];
  columnTotals: number[];
  total: number;
  /** The largest single cell. */
  max: number;
}

const byName = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);

/**
 * Sums the cells into the view's grid. Bees × plants: months summed, bees as columns, most
 * visited first, bees without a visit left out. Plants × months: bees summed, every month
 * chosen (or, with none chosen, of the response) as a column in calendar order, empty ones
 * too, so the year reads left to right. Rows are plants with at least one visit, most visited first, then by name.
 */
export function buildGrid(response: MatrixResponse, view: MatrixView, { months: chosenMonths = [] }: { months?: readonly number[] } = {}): MatrixGrid {
  const columnKey = (cell: MatrixResponse["cells"][number]) => (view === "bee-plant" ? cell.bee : String(cell.month));

  const sums = new Map<string, Map<string, number>>();
  const columnSums = new Map<string, number>();
  for (const cell of response.cells) {
    if (!(cell.visits > 0)) continue;
    const key = columnKey(cell);
    const row = sums.get(cell.plant) ?? new Map<string, number>();
    row.set(key, (row.get(key) ?? 0) + cell.visits);
    sums.set(cell.plant, row);
    columnSums.set(key, (columnSums.get(key) ?? 0) + cell.visits);
  }

  let columns: GridColumn[];
  if (view === "bee-plant") {
    const bees = [...new Set([...response.bees, ...columnSums.keys()])].filter((bee) => (columnSums.get(bee) ?? 0) > 0);
    bees.sort((a, b) => (columnSums.get(b) ?? 0) - (columnSums.get(a) ?? 0) || byName(a, b));
    columns = bees.map((bee) => ({ key: bee, label: bee, shortLabel: bee, scientificName: true }));
  } else {
    // The months asked for, else the response's (which may be the whole year even when filtered).
    const scope = chosenMonths.length ? chosenMonths : response.months.length ? response.months : [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12];
    const months = [...new Set(scope)].sort((a, b) => a - b);
    columns = months.map((month) => ({
      key: String(month),
      label: MONTH_NAMES[month - 1] ?? String(month),
      shortLabel: (MONTH_NAMES[month - 1] ?? String(month)).slice(0, 3),
      scientificName: false,
    }));
  }

  const rows: GridRow[] = [...sums.entries()].map(([plant, counts]) => {
    const values = columns.map((column) => counts.get(column.key) ?? 0);
    return { plant, values, total: values.reduce((sum, v) => sum + v, 0) };
  });
  const shown = rows.filter((row) => row.total > 0);
  shown.sort((a, b) => b.total - a.total || byName(a.plant, b.plant));

  const columnTotals = columns.map((column) => columnSums.get(column.key) ?? 0);
  return {
    view,
    columns,
    rows: shown,
    columnTotals,
    total: columnTotals.reduce((sum, v) => sum + v, 0),
    max: Math.max(0, ...shown.flatMap((row) => row.values)),
  };
}

/** The grid as CSV: a header row, one line per plant, the row total last. */
export function gridCsv(grid: MatrixGrid): string {
  return toCsv(
    ["plant", ...grid.columns.map((c) => c.label), "total visits"],
    grid.rows.map((row) => [row.plant, ...row.values, row.total]),
  );
}
