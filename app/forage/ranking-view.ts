// What the ranking page derives from the API's answer: the chart's rows, whether selection
// columns are worth showing, the shared axis, and the CSV. Pure module.

import { niceAxisMax } from "./chart-scale";
import { toCsv } from "./csv";
import type { RankingItem } from "./forage-api";

/** The chart shows this many plants; the table shows them all. */
export const CHART_TOP = 15;

/** True when at least one plant has flower counts behind a selection ratio. */
export function hasSelection(items: readonly RankingItem[]): boolean {
  return items.some((item) => item.selectionRatio !== null);
}

/**
 * One axis, 0 to a round share at or above every interval's upper end, so that bars in the
 * chart and in the table can be compared with each other by eye.
 */
export function shareAxisMax(items: readonly RankingItem[]): number {
  return niceAxisMax(items.map((item) => item.wilsonHigh), { cap: 1 });
}

/** The ranking as CSV: shares as proportions (0–1), empty fields where there is no ratio. */
export function rankingCsv(items: readonly RankingItem[]): string {
  return toCsv(
    [
      "rank",
      "scientificName",
      "family",
      "visits",
      "share",
      "shareLower95",
      "shareUpper95",
      "sites",
      "years",
      "recorders",
      "fewRecords",
      "selectionRatio",
      "selectionLower",
      "selectionUpper",
      "jacobsD",
    ],
    items.map((item) => [
      item.rank,
      item.plant.scientificName,
      item.plant.family,
      item.visits,
      round(item.share),
      round(item.wilsonLow),
      round(item.wilsonHigh),
      item.sites,
      item.years,
      item.recorders,
      item.fewRecords ? "yes" : "no",
      round(item.selectionRatio),
      round(item.selectionLow),
      round(item.selectionHigh),
      round(item.jacobsD),
    ]),
  );
}

// Four decimals: more would pretend to a precision a few hundred visits do not have.
const round = (value: number | null) => (value === null || !Number.isFinite(value) ? null : Number(value.toFixed(4)));
