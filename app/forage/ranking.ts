// Forage ranking: which plants carry the most bumble-bee visits, ordered so that a plant seen
// a handful of times does not outrank one with a large, well-supported share. Pure module.
//
// Each plant's share of all visits is given a Wilson 95 % score interval (Wilson 1927, as in
// Newcombe 1998, method 3; see ./wilson) and plants are ordered by its lower limit, the share
// we can be fairly sure of. Note: all rows share one denominator N, and the Wilson lower limit
// rises with the count for a fixed N, so this order coincides with ordering by visits; the
// interval's worth here is the uncertainty it shows beside each share.

import { wilsonInterval } from "./wilson";

export interface ForageRow {
  taxonId: number | string;
  scientificName: string;
  /** Visits recorded to this plant (non-negative integer). */
  visits: number;
  /** Distinct sites with a visit to it. */
  sites: number;
  years: number;
  recorders: number;
}

export interface RankOptions {
  /** Fewer visits than this flags the row. */
  fewVisits?: number;
  /** Fewer sites than this flags the row. */
  fewSites?: number;
}

export type RankedForage<T extends ForageRow = ForageRow> = T & {
  /** 1..n in the sorted order (ties broken, so every rank is distinct). */
  rank: number;
  /** visits/N, N the sum of visits over all rows; 0 when N = 0. */
  share: number;
  /** Wilson 95 % interval of the share. */
  lower: number;
  upper: number;
  /** Too few visits or sites to lean on. */
  fewRecords: boolean;
};

/** z_{0.025}: a two-sided 95 % interval. */
const Z95 = 1.959964;

const byCodeUnits = (a: string, b: string): number => (a < b ? -1 : a > b ? 1 : 0);

/**
 * Ranks plants by the Wilson 95 % lower limit of their share of visits (descending), then
 * visits (descending), then scientific name (ascending, by code units so the order is the same
 * in every locale), then taxonId. `fewRecords` marks visits < fewVisits or sites < fewSites:
 * thresholds of 5 visits and 2 sites are common practice, no published source.
 * Empty input gives []. Invalid visit counts throw the RangeError of wilsonInterval.
 */
export function rankForage<T extends ForageRow>(
  rows: readonly T[],
  { fewVisits = 5, fewSites = 2 }: RankOptions = {},
): RankedForage<T>[] {
  const total = rows.reduce((sum, row) => sum + row.visits, 0);
  const scored = rows.map((row) => {
    const { lower, upper, proportion } = wilsonInterval(row.visits, total, { z: Z95 });
    return {
      ...row,
      // N = 0 (every row without visits): Wilson gives the whole [0, 1]; the share shown is 0.
      share: total === 0 ? 0 : proportion,
      lower,
      upper,
      fewRecords: row.visits < fewVisits || row.sites < fewSites,
    };
  });
  scored.sort(
    (a, b) =>
      b.lower - a.lower ||
      b.visits - a.visits ||
      byCodeUnits(a.scientificName, b.scientificName) ||
      byCodeUnits(String(a.taxonId), String(b.taxonId)),
  );
  return scored.map((row, index) => ({ ...row, rank: index + 1 }));
}
