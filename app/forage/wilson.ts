// Wilson score interval for a single binomial proportion (Wilson EB 1927, JASA 22:209–212),
// with or without continuity correction, as written by Newcombe RG (1998), "Two-sided confidence
// intervals for the single proportion: comparison of seven methods", Statistics in Medicine
// 17:857–872, methods 3 (score) and 4 (score with continuity correction). Chosen over the
// Wald interval because it stays inside [0, 1] and keeps near-nominal coverage for the small
// counts and zero counts that forage records produce. Pure module.

export interface WilsonOptions {
  /** Standard normal quantile; the default is z_{0.025}, for a two-sided 95 % interval. */
  z?: number;
  /** Newcombe 1998 method 4 (continuity corrected) instead of method 3. */
  continuityCorrection?: boolean;
}

export interface WilsonInterval {
  lower: number;
  upper: number;
  /** r/n; NaN when n = 0. */
  proportion: number;
}

function assertCount(name: string, value: number): void {
  if (!Number.isInteger(value) || value < 0) {
    throw new RangeError(`wilsonInterval: ${name} must be a non-negative integer, got ${value}`);
  }
}

const clamp01 = (x: number): number => Math.min(1, Math.max(0, x));

/**
 * Wilson score interval for `successes` out of `trials`.
 *
 * trials = 0: no information, so the whole unit interval { lower: 0, upper: 1 } with
 * proportion NaN (our choice; Newcombe's formulas divide by zero there).
 * Throws a RangeError for negative or non-integer counts, successes > trials, or a z that is
 * not a positive finite number.
 */
export function wilsonInterval(
  successes: number,
  trials: number,
  { z = 1.959964, continuityCorrection = false }: WilsonOptions = {},
): WilsonInterval {
  assertCount("successes", successes);
  assertCount("trials", trials);
  if (successes > trials) {
    throw new RangeError(`wilsonInterval: successes (${successes}) exceed trials (${trials})`);
  }
  if (!(z > 0 && Number.isFinite(z))) {
    throw new RangeError(`wilsonInterval: z must be a positive finite number, got ${z}`);
  }
  if (trials === 0) return { lower: 0, upper: 1, proportion: Number.NaN };

  const n = trials;
  const p = successes / n;
  const q = 1 - p;
  const z2 = z * z;
  const denominator = 2 * (n + z2);

  if (!continuityCorrection) {
    // Newcombe 1998, method 3: (2np + z² ∓ z√(z² + 4npq)) / (2(n + z²)).
    const root = z * Math.sqrt(z2 + 4 * n * p * q);
    return {
      lower: clamp01((2 * n * p + z2 - root) / denominator),
      upper: clamp01((2 * n * p + z2 + root) / denominator),
      proportion: p,
    };
  }

  // Newcombe 1998, method 4:
  //   L = (2np + z² − 1 − z√(z² − 2 − 1/n + 4p(nq + 1))) / (2(n + z²)),
  //   U = (2np + z² + 1 + z√(z² + 2 − 1/n + 4p(nq − 1))) / (2(n + z²)),
  // with L = 0 when p = 0 and U = 1 when p = 1, as Newcombe prescribes (the square roots can
  // fail or overshoot there).
  const lower =
    successes === 0
      ? 0
      : (2 * n * p + z2 - 1 - z * Math.sqrt(z2 - 2 - 1 / n + 4 * p * (n * q + 1))) / denominator;
  const upper =
    successes === n
      ? 1
      : (2 * n * p + z2 + 1 + z * Math.sqrt(z2 + 2 - 1 / n + 4 * p * (n * q - 1))) / denominator;
  return { lower: clamp01(lower), upper: clamp01(upper), proportion: p };
}
