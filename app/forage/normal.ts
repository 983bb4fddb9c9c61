// The standard normal quantile (inverse of the cumulative distribution function), needed for
// the z of Wilson intervals and of Manly's Bonferroni intervals. Pure: shared by browser and server.
//
// Method: P. J. Acklam's rational approximation of the normal quantile (2003, published on his
// web page "An algorithm for computing the inverse normal cumulative distribution function"):
// a central rational function for 0.02425 ≤ p ≤ 0.97575 and a tail rational function in
// √(−2 ln p) outside it. Acklam gives a relative error below 1.15e-9 over (0, 1), far finer than
// the four to six decimals our statistics are shown with, so no refinement step is taken.

const A = [
  -3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2,
  -3.066479806614716e1, 2.506628277459239,
] as const;
const B = [
  -5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1,
  -1.328068155288572e1,
] as const;
const C = [
  -7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549732539343734,
  4.374664141464968, 2.938163982698783,
] as const;
const D = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416] as const;

/** Breakpoint between Acklam's central and tail regions. */
const P_LOW = 0.02425;

/** Tail branch for p < P_LOW (Acklam 2003). */
function lowerTail(p: number): number {
  const q = Math.sqrt(-2 * Math.log(p));
  return (
    (((((C[0] * q + C[1]) * q + C[2]) * q + C[3]) * q + C[4]) * q + C[5]) /
    ((((D[0] * q + D[1]) * q + D[2]) * q + D[3]) * q + 1)
  );
}

/**
 * The z with Φ(z) = p for the standard normal Φ (Acklam's approximation, relative error
 * < 1.15e-9). p = 0 gives −Infinity and p = 1 gives +Infinity; p outside [0, 1] or NaN throws
 * a RangeError, since a probability outside the unit interval is a programming error.
 */
export function normalQuantile(p: number): number {
  if (!(p >= 0 && p <= 1)) throw new RangeError(`normalQuantile: p must lie in [0, 1], got ${p}`);
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  if (p < P_LOW) return lowerTail(p);
  // Upper tail by symmetry, Φ⁻¹(p) = −Φ⁻¹(1 − p), so both tails use the same branch.
  if (p > 1 - P_LOW) return -lowerTail(1 - p);
  const q = p - 0.5;
  const r = q * q;
  return (
    ((((((A[0] * r + A[1]) * r + A[2]) * r + A[3]) * r + A[4]) * r + A[5]) * q) /
    (((((B[0] * r + B[1]) * r + B[2]) * r + B[3]) * r + B[4]) * r + 1)
  );
}
