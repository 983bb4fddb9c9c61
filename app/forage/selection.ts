// Use versus availability: electivity indices for one resource and Manly's selection ratios
// for a set of resources. Pure module, shared by browser and server.
//
// Formulas: Ivlev's E and Jacobs' D as given by Lechowicz MJ (1982), "The sampling
// characteristics of electivity indices", Oecologia 52:22–30 (D from Jacobs J 1974, Oecologia
// 14:413–417). Selection ratios, design I (availability known, use pooled over animals), from
// Manly BFJ, McDonald LL, Thomas DL, McDonald TL, Erickson WP (2002), Resource Selection by
// Animals, 2nd ed., Kluwer, chapter 4.

import { normalQuantile } from "./normal";

function assertShare(name: string, value: number): void {
  if (!(value >= 0 && value <= 1)) {
    throw new RangeError(`${name} must be a share in [0, 1], got ${value}`);
  }
}

/**
 * Ivlev's electivity E = (r − p)/(r + p) (Lechowicz 1982), r = share of use, p = share
 * available; −1 (avoided) … +1. Our choice for r = p (including 0/0 at r = p = 0): 0, "used as
 * available".
 */
export function ivlevE(r: number, p: number): number {
  assertShare("ivlevE: r", r);
  assertShare("ivlevE: p", p);
  if (r === p) return 0;
  return (r - p) / (r + p);
}

/**
 * Jacobs' selectivity D = (r − p)/(r + p − 2rp) (Jacobs 1974; Lechowicz 1982), −1 … +1.
 * p = 0 with r > 0 needs no special case: the formula gives r/r = 1 exactly, the limit of
 * D as p → 0. The denominator is zero only when r = p ∈ {0, 1}; there, as for any r = p, we
 * return 0 (our choice, consistent with "r = p → D = 0").
 */
export function jacobsD(r: number, p: number): number {
  assertShare("jacobsD: r", r);
  assertShare("jacobsD: p", p);
  if (r === p) return 0;
  return (r - p) / (r + p - 2 * r * p);
}

export interface ManlyInput {
  /** Counts of use per resource, u_i (non-negative integers, at least one positive). */
  used: number[];
  /** Proportions available per resource, π_i > 0, summing to 1. */
  available: number[];
  /** Family-wise error rate of the simultaneous (Bonferroni) intervals. */
  alpha?: number;
}

export interface ManlyResource {
  /** Proportion of use, o_i = u_i/u₊. */
  o: number;
  /** Selection ratio, w_i = o_i/π_i (1 = used in proportion to availability). */
  w: number;
  /** Standardised ratio B_i = w_i/Σw_j (Manly's B). */
  standardised: number;
  /** SE(w_i) = √(o_i(1 − o_i)/(u₊ π_i²)). */
  se: number;
  /** Bonferroni interval w_i ± z_{α/(2I)}·SE, the lower limit floored at 0. */
  lower: number;
  upper: number;
}

export interface ManlyResult {
  resources: ManlyResource[];
  /** z_{α/(2I)}, the Bonferroni-adjusted normal quantile used for every interval. */
  z: number;
  /** X²_L = 2 Σ u_i ln(u_i/(u₊π_i)), the log-likelihood test of no selection. */
  chiSquareLogLikelihood: number;
  /** Pearson X² = Σ (u_i − u₊π_i)²/(u₊π_i), the same hypothesis. */
  chiSquarePearson: number;
  /** I − 1. */
  degreesOfFreedom: number;
}

/** Tolerance on Σπ = 1: availability is usually typed or measured to three decimals. */
const SUM_TOLERANCE = 1e-6;

/**
 * Manly et al. 2002, design I selection ratios with Bonferroni intervals and the two
 * chi-square statistics for "no selection". Throws a RangeError on inputs the formulas cannot
 * take: arrays of different or < 2 length, negative or non-integer counts, no use at all,
 * π_i ≤ 0 (w_i would be infinite), Σπ ≠ 1, or α outside (0, 1).
 *
 * A resource with u_i = 0 contributes 0 to X²_L (the limit of u ln u as u → 0). The lower
 * interval limit is floored at 0 (our choice: a ratio cannot be negative; Manly's formula
 * alone can go below 0 for rare use).
 */
export function manlySelectionRatios({ used, available, alpha = 0.05 }: ManlyInput): ManlyResult {
  const count = used.length;
  if (count < 2 || available.length !== count) {
    throw new RangeError("manlySelectionRatios: need at least two resources and one π per count");
  }
  if (!(alpha > 0 && alpha < 1)) {
    throw new RangeError(`manlySelectionRatios: alpha must lie in (0, 1), got ${alpha}`);
  }
  for (const u of used) {
    if (!Number.isInteger(u) || u < 0) {
      throw new RangeError(`manlySelectionRatios: counts must be non-negative integers, got ${u}`);
    }
  }
  for (const pi of available) {
    if (!(pi > 0 && pi <= 1)) {
      throw new RangeError(`manlySelectionRatios: each π must lie in (0, 1], got ${pi}`);
    }
  }
  const piSum = available.reduce((sum, pi) => sum + pi, 0);
  if (Math.abs(piSum - 1) > SUM_TOLERANCE) {
    throw new RangeError(`manlySelectionRatios: available proportions sum to ${piSum}, not 1`);
  }
  const total = used.reduce((sum, u) => sum + u, 0);
  if (total === 0) throw new RangeError("manlySelectionRatios: no use recorded");

  // Two-sided simultaneous intervals for I ratios: α/I per ratio, α/(2I) in each tail.
  const z = normalQuantile(1 - alpha / (2 * count));

  const raw = used.map((u, i) => {
    const pi = available[i]!;
    const o = u / total;
    const w = o / pi;
    const se = Math.sqrt((o * (1 - o)) / (total * pi * pi));
    return { o, w, se };
  });
  const wSum = raw.reduce((sum, r) => sum + r.w, 0);

  let chiSquareLogLikelihood = 0;
  let chiSquarePearson = 0;
  used.forEach((u, i) => {
    const expected = total * available[i]!;
    if (u > 0) chiSquareLogLikelihood += 2 * u * Math.log(u / expected);
    chiSquarePearson += (u - expected) ** 2 / expected;
  });

  return {
    resources: raw.map(({ o, w, se }) => ({
      o,
      w,
      standardised: w / wSum,
      se,
      lower: Math.max(0, w - z * se),
      upper: w + z * se,
    })),
    z,
    chiSquareLogLikelihood,
    chiSquarePearson,
    degreesOfFreedom: count - 1,
  };
}
